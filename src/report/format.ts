/**
 * Numbers for people: SI prefixes, digit grouping and uncertainty-led rounding.
 *
 * - Prefixes in steps of 10³ (SI Brochure, 9th ed., §3) for units that take them; four-digit values
 *   stay unprefixed ("2 093.0 Hz", not "2.0930 kHz"), which reads better for audio frequencies (ours).
 * - The integer part is grouped in threes by a space (SI Brochure §5.4.4 allows a thin space; a plain
 *   space keeps terminal columns aligned).
 * - With an uncertainty, the uncertainty is rounded up to two significant digits when its first digit
 *   is 1 or 2 and to one otherwise, and the value to the same decimal place (JCGM 100:2008 §7.2.6 asks
 *   for at most two; the 1-or-2 rule is common practice, no source). Without one, six significant digits.
 * The result never shows NaN: a non-finite number is a caller bug and throws.
 */

const PREFIXES: Readonly<Record<number, string>> = { [-12]: 'p', [-9]: 'n', [-6]: 'µ', [-3]: 'm', 0: '', 3: 'k', 6: 'M', 9: 'G' };
const PREFIXABLE = /^(Hz|s|V|A|W|F|Ω)(\/s)?$/;
const MAX_DECIMALS = 12;
/** More digits than this say nothing a bench instrument can back. */
const MAX_SIGNIFICANT = 10;

export interface QuantityParts {
  /** Grouped number in the prefixed unit, e.g. '1 250.003'. */
  readonly value: string;
  /** Prefixed unit, e.g. 'kHz'; '' for a dimensionless ratio. */
  readonly unit: string;
  /** Rounded uncertainty in the same unit, e.g. '0.004', or '<0.00000001' below the shown digits; null when none. */
  readonly uncertainty: string | null;
}

/** '1 250.003 Hz ± 0.004', '3.822 ms', '1.0834 ± 0.0011'. */
export function formatQuantity(value: number, unit: string, uncertainty: number | null = null): string {
  const p = quantityParts(value, unit, uncertainty);
  const head = p.unit ? `${p.value} ${p.unit}` : p.value;
  return p.uncertainty === null ? head : `${head} ± ${p.uncertainty}`;
}

export function quantityParts(value: number, unit: string, uncertainty: number | null = null): QuantityParts {
  if (!Number.isFinite(value)) throw new RangeError(`formatQuantity: value ${value} is not finite`);
  const u = uncertainty !== null && Number.isFinite(uncertainty) && uncertainty > 0 ? uncertainty : null;
  const exp = PREFIXABLE.test(unit) ? prefixExponent(Math.max(Math.abs(value), u ?? 0)) : 0;
  const scale = 10 ** exp;
  const v = value / scale;
  const shownUnit = `${PREFIXES[exp]}${unit}`;
  if (u === null) return { value: group(significant(v, 6)), unit: shownUnit, uncertainty: null };
  const us = u / scale;
  const lead = us / 10 ** Math.floor(Math.log10(us));
  const digits = lead < 3 ? 2 : 1;
  const wanted = Math.max(0, digits - 1 - Math.floor(Math.log10(us)));
  const room = Math.max(0, MAX_SIGNIFICANT - Math.max(1, Math.floor(Math.log10(Math.abs(v) || 1)) + 1));
  const decimals = Math.min(wanted, room);
  // Rounded up, never down, so the shown interval is not narrower than the stated one (GUM §7.2.6 note).
  const steps = Math.ceil(us * 10 ** decimals * (1 - 1e-12));
  const shownU = steps === 0 || us < 10 ** -decimals * 1e-6 ? `<${(10 ** -decimals).toFixed(decimals)}` : (steps / 10 ** decimals).toFixed(decimals);
  return { value: group(fixed(v, decimals)), unit: shownUnit, uncertainty: shownU };
}

/** Exponent (multiple of 3) that brings |x| to 1…999, or 1…9 999 for plain thousands. */
export function prefixExponent(x: number): number {
  const a = Math.abs(x);
  if (!(a > 0) || !Number.isFinite(a)) return 0;
  let e = Math.floor(Math.log10(a) / 3) * 3;
  if (a / 10 ** e >= 999.9999999) e += 3;
  if (e === 3 && a < 10_000) e = 0;
  return Math.min(9, Math.max(-12, e));
}

/** Group the integer part of a plain decimal string in threes: '-12345.678' → '-12 345.678'. */
export function group(s: string): string {
  const m = /^(-?)(\d+)(\.\d+)?$/.exec(s);
  if (!m) return s;
  const [, sign, int, frac = ''] = m;
  const grouped = int.length >= 4 ? int.replace(/\B(?=(\d{3})+(?!\d))/g, ' ') : int;
  return `${sign}${grouped}${frac}`;
}

function fixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** n significant digits without exponent notation or trailing zeros. */
function significant(x: number, n: number): string {
  if (x === 0) return '0';
  const decimals = Math.min(MAX_DECIMALS, Math.max(0, n - 1 - Math.floor(Math.log10(Math.abs(x)))));
  const s = fixed(x, decimals);
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
}
