/**
 * Pitch error in cents and range in octaves. cents = 1200·log2(f/f_ref) = 3986.3137·log10(f/f_ref):
 * one octave is 1200 cents, an equal-tempered semitone 100 (A. J. Ellis's unit; Howard & Angus,
 * *Acoustics and Psychoacoustics*, App. 3; REFERENCES.md §9). The standard uncertainty of a cents
 * figure follows from the frequency's by first-order propagation (JCGM 100:2008 §5.1.2):
 * ∂cents/∂f = 1200/(f·ln 2); the reference frequency is a spec value and counts as exact.
 */

/** 1200/ln 2: cents per unit of natural-log ratio. */
const CENTS_PER_NEPER = 1200 / Math.LN2;

function positive(name: string, x: number): void {
  if (!(x > 0) || !Number.isFinite(x)) throw new RangeError(`${name} ${x} must be a positive finite frequency`);
}

/** Error of `frequency` against `reference` in cents (positive = sharp). */
export function cents(frequency: number, reference: number): number {
  positive('cents: frequency', frequency);
  positive('cents: reference', reference);
  return 1200 * Math.log2(frequency / reference);
}

/** Standard uncertainty in cents of a frequency known to ± `uncertainty` Hz (k = 1). */
export function centsUncertainty(frequency: number, uncertainty: number): number {
  positive('centsUncertainty: frequency', frequency);
  if (!(uncertainty >= 0)) throw new RangeError(`centsUncertainty: uncertainty ${uncertainty} must be ≥ 0`);
  return (CENTS_PER_NEPER * uncertainty) / frequency;
}

/** The frequency `c` cents above `reference` (the inverse of `cents`). */
export function shiftByCents(reference: number, c: number): number {
  positive('shiftByCents: reference', reference);
  return reference * 2 ** (c / 1200);
}

/** Octaves between two frequencies, log2(high/low): a 256:1 span is 8 octaves. */
export function spanOctaves(low: number, high: number): number {
  positive('spanOctaves: low', low);
  positive('spanOctaves: high', high);
  return Math.log2(high / low);
}
