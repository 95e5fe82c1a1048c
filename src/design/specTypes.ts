/** The design spec after validation: plain readonly data, every value in SI units. */
import type { DecisionRule, MeasurementId, ReadingSettings, Shape } from '../types/index.js';
import type { CalibrationSection } from './calibrationTypes.js';
import type { HarmonicSet } from '../analysis/index.js';

/** Tolerance limits of one check; null means unbounded on that side. */
export interface Limit {
  readonly lower: number | null;
  readonly upper: number | null;
  readonly nominal: number | null;
}

export interface SpecCheck {
  readonly output: string;
  readonly measurement: MeasurementId;
  /** SI unit of the measurement (MEASUREMENT_UNITS). */
  readonly unit: string;
  readonly limit: Limit;
  /** The user's own words about causes, shown with a failure. */
  readonly hint?: string;
}

export interface SpecOutput {
  readonly name: string;
  /** Capture channel: its name as written in the CSV header, or a 1-based number. */
  readonly channel: string | number;
  readonly shape?: Shape;
  /** How the output is named in capture file names (the `{output}` token); defaults to the output name. */
  readonly fileTag: string;
  readonly description?: string;
}

export interface SpecCondition {
  readonly name: string;
  /** The control setting in the user's words ("control voltage 2 V"). */
  readonly setting?: string;
  /** Every check that applies at this condition, with limits merged from the output and the condition. */
  readonly checks: readonly SpecCheck[];
}

/** A design value with its tolerance, used by the diagnosis to reason about the circuit. */
export interface DesignValue {
  readonly nominal: number;
  readonly unit: string;
  readonly lower: number;
  readonly upper: number;
  /** Condition at which the nominal holds (a charge current depends on the control setting). */
  readonly at?: string;
}

export const DESIGN_KEYS = {
  timingCapacitance: 'F',
  chargeCurrent: 'A',
  dischargeCurrent: 'A',
  swing: 'V',
  upperThreshold: 'V',
  lowerThreshold: 'V',
  positiveRail: 'V',
  negativeRail: 'V',
  logicHigh: 'V',
  logicLow: 'V',
} as const;

export type DesignKey = keyof typeof DESIGN_KEYS;
export type DesignSection = Partial<Record<DesignKey, DesignValue>>;

export interface Spec {
  readonly format: 1;
  /** The spec file as given on the command line. */
  readonly file: string;
  /** SHA-256 of the spec text, so a record says exactly which spec decided it. */
  readonly sha256: string;
  readonly name: string;
  readonly revision: string;
  readonly description?: string;
  /** File-name pattern with `{unit}`, `{condition}` and optionally `{output}`. */
  readonly pattern: string;
  readonly decision: DecisionRule;
  readonly outputs: readonly SpecOutput[];
  readonly conditions: readonly SpecCondition[];
  readonly design?: DesignSection;
  /** How to calibrate a unit: the control law, its steps and limits (calibrationSection.ts). */
  readonly calibration?: CalibrationSection;
  /** How to read this design's captures (`captures.reading`), under any flags or profile given. */
  readonly reading?: ReadingSettings;
  /** The harmonics THD, SINAD and the other sums take, where the design states them (`harmonics:`). */
  readonly harmonicSet?: HarmonicSet;
}

/** Name of the single condition of a spec that lists none. */
export const DEFAULT_CONDITION = 'default';
export const DEFAULT_PATTERN = '{unit}_{condition}.csv';
