/**
 * One calibration iteration decided against the spec: the frequency the law expects at each step,
 * the error in cents (1200·log2(f/f_expected), REFERENCES.md §9) with its uncertainty, a statement per
 * step against the error limit and one for the linearity, by the spec's decision rule (decideCheck:
 * ILAC-G8:09/2019 §4.2 with the guard band equal to U = 2u). Trim guidance is added by src/diagnose.
 */
import { cents, centsUncertainty } from '../analysis/index.js';
import type { CalibrationIteration, CalibrationLaw, DecisionRule, Statement } from '../types/index.js';
import { calibrationOf } from './calibrationPlan.js';
import type { StepReading } from './calibrationReading.js';
import { trackingFigures } from './calibrationTracking.js';
import type { StepFigures } from './calibrationTracking.js';
import type { CalibrationStep } from './calibrationTypes.js';
import { decideCheck, worstStatement } from './decideCheck.js';
import type { Spec } from './specTypes.js';

export type CalibrationDecision = Omit<CalibrationIteration, 'guidance'>;

export interface CalibrationDecisionOptions {
  /** The technician's label for the iteration. */
  readonly label?: string;
}

/** Frequency the law expects at a step; null where it says nothing (the middle of a range). */
export function expectedFrequency(law: CalibrationLaw, step: CalibrationStep, stepCount: number): number | null {
  if (law.kind === 'range') {
    if (step.index === 0) return law.lowFrequency ?? null;
    return step.index === stepCount - 1 ? (law.highFrequency ?? null) : null;
  }
  if (step.control === null || law.scale === undefined || law.referenceFrequency === undefined) return null;
  const dx = step.control - (law.referenceControl ?? 0);
  const f = law.kind === 'exponential' ? law.referenceFrequency * 2 ** (law.scale * dx) : law.referenceFrequency + law.scale * dx;
  return f > 0 ? f : null;
}

export function decideCalibration(spec: Spec, unit: string, readings: readonly StepReading[], options: CalibrationDecisionOptions = {}): CalibrationDecision {
  const section = calibrationOf(spec);
  const { law, limits } = section;
  const figures = readings.map((r) => stepFigures(law, r, section.steps.length));
  const { figures: tracking, deviations } = trackingFigures(law, figures);
  const band = (l: number): { lower: number; upper: number } => ({ lower: -l, upper: l });
  const steps = figures.map((s, i) => {
    const statement = s.expected === null ? null : s.cents === null ? 'not-measured' : decide(s.cents, s.centsUncertainty, band(limits.errorCents), spec.decision);
    return { ...s, deviation: deviations[i], statement };
  });
  const linearityStatement =
    limits.linearityCents === undefined ? null : tracking.linearity ? decide(tracking.linearity.value, tracking.linearity.uncertainty, band(limits.linearityCents), spec.decision) : 'not-measured';
  const statement = worstStatement([...steps.map((s) => s.statement), linearityStatement].filter((s): s is Statement => s !== null));
  return {
    schemaVersion: 1,
    unit,
    spec: { name: spec.name, revision: spec.revision, sha256: spec.sha256 },
    output: section.output,
    law,
    limits,
    decisionRule: spec.decision,
    ...(options.label ? { label: options.label } : {}),
    steps,
    tracking: { ...tracking, linearityStatement },
    notes: notesFor(steps),
    statement,
    meetsLimits: statement === 'pass' || statement === 'conditional-pass',
  };
}

function decide(value: number, u: number | null, limit: { lower: number; upper: number }, rule: DecisionRule): Statement {
  return decideCheck(value, 2 * (u ?? 0), limit, rule).statement;
}

function stepFigures(law: CalibrationLaw, r: StepReading, stepCount: number): StepFigures {
  const f = r.frequency?.value ?? null;
  const uf = r.frequency?.uncertainty ?? null;
  const expected = expectedFrequency(law, r.step, stepCount);
  const note = f === null ? `frequency not measured: ${r.frequency?.note ?? 'no frequency in the capture'}` : uf === null ? 'frequency has no uncertainty estimate; decided without a guard band' : undefined;
  return {
    index: r.step.index,
    label: r.step.label,
    control: r.step.control,
    capture: r.capture,
    frequency: f,
    frequencyUncertainty: uf,
    expected,
    cents: f !== null && expected !== null ? cents(f, expected) : null,
    centsUncertainty: f !== null && uf !== null ? centsUncertainty(f, uf) : null,
    symmetry: r.symmetry?.value ?? null,
    peakToPeak: r.peakToPeak?.value ?? null,
    ...(note ? { note } : {}),
  };
}

function notesFor(steps: readonly { label: string; frequency: number | null }[]): string[] {
  const missing = steps.filter((s) => s.frequency === null).map((s) => s.label);
  return missing.length ? [`step${missing.length > 1 ? 's' : ''} ${missing.join(', ')} not measured: left out of the fit; the run cannot meet its limits until measured`] : [];
}
