/**
 * Values a quantity can physically take, so a spec that asks for the impossible (a duty cycle of
 * 500 %, a negative frequency, a capacitance of 0) is a spec problem with its line, not a unit that
 * fails for ever. Frequencies, periods and the timing capacitance are positive; amplitudes, RMS
 * values, times, jitter, distortion and error figures cannot be negative; a duty cycle or a rise
 * share (symmetry) lies between 0 and 100 %. Definitions: IEEE Std 181-2011 §3 (duty cycle,
 * transition durations, aberrations), IEEE Std 1241-2010 §4 (THD, ENOB); the rest from the
 * quantities' definitions (common practice, no source).
 */
export interface PhysicalRange {
  readonly min: number;
  /** Whether `min` itself is possible (a zero amplitude is; a zero frequency is not a signal's). */
  readonly minIncluded: boolean;
  readonly max: number;
}

const POSITIVE: PhysicalRange = { min: 0, minIncluded: false, max: Infinity };
const NOT_NEGATIVE: PhysicalRange = { min: 0, minIncluded: true, max: Infinity };
const SHARE: PhysicalRange = { min: 0, minIncluded: true, max: 100 };

/** Keyed by measurement id or design key; a quantity not listed may take any sign. */
export const PHYSICAL_RANGES: Readonly<Record<string, PhysicalRange>> = {
  frequency: POSITIVE,
  period: POSITIVE,
  humFrequency: POSITIVE,
  peakToPeak: NOT_NEGATIVE,
  amplitude: NOT_NEGATIVE,
  rms: NOT_NEGATIVE,
  acRms: NOT_NEGATIVE,
  slopeRatio: NOT_NEGATIVE,
  linearity: NOT_NEGATIVE,
  riseTime: NOT_NEGATIVE,
  fallTime: NOT_NEGATIVE,
  jitter: NOT_NEGATIVE,
  cycleToCycleJitter: NOT_NEGATIVE,
  overshoot: NOT_NEGATIVE,
  undershoot: NOT_NEGATIVE,
  thd: NOT_NEGATIVE,
  enob: NOT_NEGATIVE,
  shapeError: NOT_NEGATIVE,
  dutyCycle: SHARE,
  symmetry: SHARE,
  timingCapacitance: POSITIVE,
  swing: POSITIVE,
};

const possible = (r: PhysicalRange, v: number): boolean => (r.minIncluded ? v >= r.min : v > r.min) && v <= r.max;

/** Why a limit is impossible for `what`, or null when it is possible. */
export function impossibleLimit(what: string, lower: number | null, upper: number | null, nominal: number | null): string | null {
  const r = PHYSICAL_RANGES[what];
  if (!r) return null;
  const span = `${r.minIncluded ? 'at least' : 'more than'} ${r.min}${Number.isFinite(r.max) ? ` and at most ${r.max}` : ''}`;
  if (nominal !== null && !possible(r, nominal)) return `a nominal of ${nominal} is impossible for ${what}, which is always ${span}`;
  if (upper !== null && (r.minIncluded ? upper < r.min : upper <= r.min)) return `a maximum of ${upper} can never be met: ${what} is always ${span}`;
  if (lower !== null && lower > r.max) return `a minimum of ${lower} can never be met: ${what} is always ${span}`;
  return null;
}
