/** The spec's calibration section after validation: plain readonly data, frequencies in Hz. */
import type { CalibrationLaw, CalibrationLimits, TrimAdjustment } from '../types/index.js';

export interface CalibrationStep {
  /** Position in the spec's list, from 0. */
  readonly index: number;
  /** The `{step}` text in capture file names: the label given, or the control value as written without its unit. */
  readonly label: string;
  /** Control value in the law's control unit; null for a labelled position without one. */
  readonly control: number | null;
}

export interface CalibrationSection {
  /** The spec output whose frequency is tracked, and its channel. */
  readonly output: string;
  readonly channel: string | number;
  /** File-name pattern with `{step}` and optionally `{unit}`. */
  readonly pattern: string;
  readonly law: CalibrationLaw;
  readonly steps: readonly CalibrationStep[];
  readonly limits: CalibrationLimits;
  /** The adjustments the unit has, in the order a technician trims them. */
  readonly trims: readonly TrimAdjustment[];
}

export const DEFAULT_CALIBRATION_PATTERN = '{unit}_{step}.csv';
