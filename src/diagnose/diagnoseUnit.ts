/**
 * Likely causes for one unit, ranked: every rule reads the whole pattern of results (all conditions,
 * all outputs, the design values) and either stays silent or returns a cause with the numbers that
 * triggered it and the next measurement that would confirm it. Ranking is by score, then by rule order.
 */
import type { Cause, Diagnosis, UnitVerdict } from '../types/index.js';
import type { Spec } from '../spec/index.js';
import { lowEndLeakage, switchingDelay, timingScale } from './frequencyRules.js';
import { currentMismatch, offsetBias, saturation, thresholdLevels } from './shapeRules.js';
import { edgeRinging, mainsHum, periodJitter, weakLogicHigh } from './edgeRules.js';
import type { CauseRule } from './rule.js';
import { unitFacts } from './unitFacts.js';

/** Every rule, in the order used to break score ties. */
export const CAUSE_RULES: readonly CauseRule[] = [
  saturation,
  currentMismatch,
  timingScale,
  switchingDelay,
  lowEndLeakage,
  thresholdLevels,
  offsetBias,
  weakLogicHigh,
  edgeRinging,
  mainsHum,
  periodJitter,
];

export function diagnoseUnit(spec: Spec, verdict: UnitVerdict): Diagnosis {
  const facts = unitFacts(spec, verdict);
  const causes = CAUSE_RULES.map((rule, order) => ({ cause: rule(facts), order }))
    .filter((x): x is { cause: Cause; order: number } => x.cause !== null)
    .sort((a, b) => b.cause.score - a.cause.score || a.order - b.order)
    .map((x) => x.cause);
  return { causes };
}
