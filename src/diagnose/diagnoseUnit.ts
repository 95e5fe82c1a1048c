/**
 * Likely causes for one unit, ranked: every rule reads the whole pattern of results (all conditions,
 * all outputs, the design values) and either stays silent or returns a cause with the numbers that
 * triggered it and the next measurement that would confirm it. Ranking is by score, then by rule order.
 * With a design section, the circuit view back-computes the core's currents, capacitance, thresholds
 * and levels at each condition, and the part attribution (circuitCauses.ts) names the part that
 * explains what is seen, taking over the pattern rules it refines.
 */
import type { Cause, Diagnosis, UnitVerdict } from '../types/index.js';
import type { Spec } from '../design/index.js';
import { lowEndLeakage, switchingDelay, timingScale } from './frequencyRules.js';
import { currentMismatch, offsetBias, saturation, scopeClipping, thresholdLevels } from './shapeRules.js';
import { edgeRinging, mainsHum, periodJitter, weakLogicHigh } from './edgeRules.js';
import type { CauseRule } from './rule.js';
import { unitFacts } from './unitFacts.js';
import { coreReadings } from './coreReadings.js';
import { circuitView } from './circuitView.js';
import { circuitCauses, mergeCauses } from './circuitCauses.js';

/** Every rule, in the order used to break score ties. */
export const CAUSE_RULES: readonly CauseRule[] = [
  saturation,
  scopeClipping,
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
  if (Object.keys(facts.design).length === 0) return { causes };
  const readings = coreReadings(facts);
  const circuit = circuitView(readings, facts.design);
  return { causes: mergeCauses(causes, circuitCauses(facts, readings)), ...(circuit.length ? { circuit } : {}) };
}
