/**
 * Calibration runs: how a unit's frequency tracks its control across a range, the trims suggested
 * after each capture set, and the stored history of iterations (before and after each trim). Plain
 * readonly data that survives a JSON round trip; `calibrate --json` prints a CalibrationIteration and
 * the unit record carries StoredCalibrationRun[]. Fields may be added, never renamed.
 */
import type { NewCapture, RunSpec, StoredCapture } from './record.js';
import type { DecisionRule, Statement } from './verdict.js';

export type CalibrationLawKind = 'exponential' | 'linear' | 'range';

/** The expected control law, as the spec states it (frequencies in Hz, controls in `controlUnit`). */
export interface CalibrationLaw {
  readonly kind: CalibrationLawKind;
  /** Unit of the control values ('V', or a word such as 'turns'); '' when steps are only labels. */
  readonly controlUnit: string;
  /** exponential: octaves per control unit (1 for 1 V/octave); linear: Hz per control unit. */
  readonly scale?: number;
  /** exponential and linear: the control at which `referenceFrequency` holds. */
  readonly referenceControl?: number;
  readonly referenceFrequency?: number;
  /** range: the frequencies expected at the first and the last step. */
  readonly lowFrequency?: number;
  readonly highFrequency?: number;
}

export interface CalibrationLimits {
  /** Largest error from the law at any step, cents (either side). */
  readonly errorCents: number;
  /** Largest deviation from the fitted law (linearity), cents; absent when not checked. */
  readonly linearityCents?: number;
}

/** One step of one iteration: what was measured, what the law expects, and the error. */
export interface CalibrationStepResult {
  readonly index: number;
  readonly label: string;
  readonly control: number | null;
  readonly capture: string;
  readonly frequency: number | null;
  /** Standard uncertainty (k = 1), Hz. */
  readonly frequencyUncertainty: number | null;
  /** Frequency the law expects here, Hz; null when the law says nothing about this step. */
  readonly expected: number | null;
  /** 1200·log2(f/f_expected). */
  readonly cents: number | null;
  /** Standard uncertainty (k = 1) of `cents`. */
  readonly centsUncertainty: number | null;
  /** Deviation from the fitted law, cents. */
  readonly deviation: number | null;
  /** Triangle symmetry (rising share of the period), %, and peak-to-peak amplitude, V, when measured. */
  readonly symmetry: number | null;
  readonly peakToPeak: number | null;
  /** Decision against the error limit; null when the law expects nothing at this step (a range's middle). */
  readonly statement: Statement | null;
  readonly note?: string;
}

/** A fitted or derived figure with its standard uncertainty (k = 1). */
export interface CalibrationFigure {
  readonly value: number;
  readonly uncertainty: number | null;
  readonly unit: string;
}

/** How one figure changes across the range (lowest to highest step). */
export interface CalibrationDrift {
  readonly first: number;
  readonly last: number;
  readonly min: number;
  readonly max: number;
  readonly unit: string;
}

export interface TrackingFigures {
  /** How the figures were obtained, in words. */
  readonly method: string;
  /** Fitted scale: octave per control unit (exponential) or Hz per control unit (linear). */
  readonly scale: CalibrationFigure | null;
  /** The scale's error: cents per octave (exponential) or % (linear and range). */
  readonly scaleError: CalibrationFigure | null;
  /** Fitted error at the law's reference control, cents. */
  readonly offset: CalibrationFigure | null;
  /** Worst deviation from the fitted law (signed, cents) and the step where it lies. */
  readonly linearity: (CalibrationFigure & { readonly step: string }) | null;
  /** Decision of the linearity against its limit; null when the spec sets none. */
  readonly linearityStatement: Statement | null;
  /** Octaves from the first to the last step, as measured and as the law expects. */
  readonly span: CalibrationFigure | null;
  readonly expectedSpan: number | null;
  readonly symmetry: CalibrationDrift | null;
  readonly amplitude: CalibrationDrift | null;
}

export type TrimAdjustment = 'scale' | 'offset' | 'high-frequency';

/**
 * One trim suggestion: which adjustment, which way, by how much, and what it reads (`basis`, data).
 * `text` says it in words, written by src/report from the rest (src/diagnose leaves it empty); advice
 * stored before `basis` existed has only its text.
 */
export interface TrimAdvice {
  readonly adjustment: TrimAdjustment;
  readonly action: 'raise' | 'lower' | 'leave';
  /** Size of the change (always ≥ 0) in `unit`; null with 'leave'. */
  readonly amount: number | null;
  readonly unit: '%' | 'cents' | 'Hz';
  readonly text: string;
  readonly basis?: TrimBasis;
}

/** What a trim suggestion reads, as data. */
export interface TrimBasis {
  /** The figures it reads: 'fitted-scale' (octave or Hz per control unit), 'scale-error' (cents per octave or %), 'span' and 'expected-span' (octaves), 'offset' (cents or Hz), 'top-step-deviation' (cents). */
  readonly figures: readonly { readonly name: 'fitted-scale' | 'scale-error' | 'span' | 'expected-span' | 'offset' | 'top-step-deviation'; readonly value: number; readonly unit: string }[];
  /** Where an offset holds: at this control value, or at the low end of a range. */
  readonly at?: { readonly control: number; readonly controlUnit: string } | 'low-end';
  /** Scale and offset read from the steps below this one (its label), which is left to the high-frequency compensation. */
  readonly below?: string;
  /** The top step (its label), for the high-frequency compensation. */
  readonly topStep?: string;
  /** To be set after the scale trim. */
  readonly afterScale?: boolean;
  /** Why it cannot be told: too few steps to separate it from the scale. */
  readonly undecided?: 'too-few-steps';
}

/** Remarks on an iteration as data (report words them into `notes`). */
export type TrimRemark =
  | { readonly code: 'too-few-steps' }
  | { readonly code: 'range-ends-missing' }
  | { readonly code: 'pivot-at-zero' }
  | { readonly code: 'amplitude-drift'; readonly first: number; readonly last: number; readonly unit: string }
  | { readonly code: 'symmetry-drift'; readonly first: number; readonly last: number; readonly spread: number };

/** The outcome of one capture set: decided against the spec's calibration limits, with trim guidance. */
export interface CalibrationIteration {
  readonly schemaVersion: 1;
  readonly unit: string;
  readonly spec: RunSpec;
  /** The spec output whose frequency is tracked. */
  readonly output: string;
  readonly law: CalibrationLaw;
  readonly limits: CalibrationLimits;
  readonly decisionRule: DecisionRule;
  /** The technician's label for this iteration (`--iteration`), e.g. "after scale trim". */
  readonly label?: string;
  /** What was done before this iteration (`--note`), e.g. "R12 replaced, scale trimmer turned". */
  readonly note?: string;
  readonly steps: readonly CalibrationStepResult[];
  readonly tracking: TrackingFigures;
  readonly guidance: readonly TrimAdvice[];
  /** Further remarks in words (steps left out of a fit; and, written by report, the `remarks`). */
  readonly notes: readonly string[];
  /** Remarks of the trim guidance as data: drift of symmetry or amplitude, too few steps, the scale's pivot. */
  readonly remarks?: readonly TrimRemark[];
  readonly statement: Statement;
  /** True when the statement accepts the unit (pass, or conditional pass). */
  readonly meetsLimits: boolean;
}

/** Everything one `calibrate` invocation stores: `store.saveCalibration(iteration)`. */
export interface NewCalibrationIteration {
  readonly unit: string;
  readonly startedAt: string;
  readonly operator: string;
  readonly station: string;
  readonly spec: RunSpec & { readonly text?: string | Uint8Array };
  readonly toolVersion: string;
  readonly result: CalibrationIteration;
  /** One per step, `condition` holding the step label. */
  readonly captures: readonly NewCapture[];
  /** Start a new calibration run even when the unit's latest one is still open. */
  readonly newRun?: boolean;
}

export interface StoredCalibrationIteration {
  /** Iteration number in the data folder, counting from 1. */
  readonly id: number;
  /** Position in its calibration run, counting from 1. */
  readonly number: number;
  readonly startedAt: string;
  readonly storedAt: string;
  readonly operator: string;
  readonly station: string;
  readonly toolVersion: string;
  readonly result: CalibrationIteration;
  readonly captures: readonly StoredCapture[];
  readonly digest: string;
  readonly intact: boolean;
}

/**
 * A calibration run: the iterations of one unit from the first capture set until one meets the
 * limits. The next invocation after that, a changed spec, or `--new-run` starts a new run.
 */
export interface StoredCalibrationRun {
  readonly id: number;
  readonly unit: string;
  readonly spec: RunSpec;
  readonly startedAt: string;
  /** True once an iteration met the limits: the run is complete. */
  readonly complete: boolean;
  readonly iterations: readonly StoredCalibrationIteration[];
}
