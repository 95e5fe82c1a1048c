/**
 * The one way benchproof writes a quantity, shared by every stage that makes text (spec drafts,
 * reports, the bench page), so a number reads the same wherever it appears.
 *
 * - One SI-prefix table (SI Brochure, 9th ed., 2019, Table 7), steps of 10³ for the units that take
 *   prefixes. Four-digit values stay unprefixed ("1 968.27 Hz", not "1.96827 kHz"): audio frequencies
 *   read better so (ours).
 * - One thousands rule: the integer part is grouped in threes by a space once it has four digits
 *   (SI Brochure §5.4.4: groups of three, never dots or commas); decimals are not grouped.
 * - One minus sign, U+2212 (SI Brochure §5.4.4 and ISO 80000-1 write the minus sign, not a hyphen).
 * - With an uncertainty: the uncertainty rounded UP to two significant digits and the value to the
 *   same decimal place (JCGM 100:2008 (GUM) §7.2.6: at most two digits; rounding up so the shown
 *   interval is never narrower than the stated one). Every ± names what it is: U (k = 2), the
 *   expanded uncertainty, or u (k = 1), the standard one (GUM §7.2.2, §7.2.4).
 * - Limits and margins are written in the prefix of the value they bound, so they line up.
 *
 * `plain: true` writes the same number for a file a program reads back (a drafted spec): ASCII
 * hyphen-minus and no digit groups.
 */

export const MINUS = '\u2212';

/** Prefix symbol by decimal exponent, the one table (SI Brochure Table 7, the steps we use). */
export const SI_PREFIXES: readonly (readonly [symbol: string, exponent: number])[] = [
  ['G', 9],
  ['M', 6],
  ['k', 3],
  ['', 0],
  ['m', -3],
  ['µ', -6],
  ['n', -9],
  ['p', -12],
];

/** Prefix symbols as people type them: µ written as µ (micro sign), μ (Greek mu) or u. */
export const PREFIX_EXPONENTS: Readonly<Record<string, number>> = {
  ...Object.fromEntries(SI_PREFIXES.map(([s, e]) => [s, e])),
  u: -6,
  μ: -6,
};

/** SI units that take a prefix; %, dB, dBc, bits and ratios never do. */
export const PREFIXABLE_UNITS: ReadonlySet<string> = new Set(['Hz', 's', 'V', 'A', 'W', 'F', 'Ω', 'V/s']);

/** Coverage factor of a shown uncertainty: 2 for an expanded U, 1 for a standard u. */
export type Coverage = 1 | 2;

export interface TextOptions {
  /** Machine-readable: ASCII minus, no digit groups. */
  readonly plain?: boolean;
}

export function prefixSymbol(exponent: number): string {
  const hit = SI_PREFIXES.find(([, e]) => e === exponent);
  if (!hit) throw new RangeError(`prefixSymbol: no SI prefix for 10^${exponent}`);
  return hit[0];
}

/** Exponent (multiple of 3, −12…9) that brings |x| to 1…999 in `unit`, or 1…9 999 for plain thousands; 0 for units without prefixes. */
export function prefixExponent(x: number, unit = 'Hz'): number {
  const a = Math.abs(x);
  if (!PREFIXABLE_UNITS.has(unit) || !(a > 0) || !Number.isFinite(a)) return 0;
  let e = Math.floor(Math.log10(a) / 3) * 3;
  if (a / 10 ** e >= 999.9999999) e += 3;
  if (e === 3 && a < 9999.5) e = 0;
  return Math.min(9, Math.max(-12, e));
}

/** The unit with its prefix: ('k', 'Hz') → 'kHz'. */
export function prefixedUnit(exponent: number, unit: string): string {
  return exponent === 0 ? unit : `${prefixSymbol(exponent)}${unit}`;
}

/** Number text with the house minus sign and digit groups: '-12345.678' → '−12 345.678'. */
export function group(s: string, { plain = false }: TextOptions = {}): string {
  const m = /^([-−]?)(\d+)(\.\d+)?$/.exec(s);
  if (!m) return s;
  const [, sign, int, frac = ''] = m;
  const grouped = plain || int.length < 4 ? int : int.replace(/\B(?=(\d{3})+(?!\d))/g, ' ');
  return `${sign ? (plain ? '-' : MINUS) : ''}${grouped}${frac}`;
}

/** x with `decimals` decimals, never '-0'. */
function fixed(x: number, decimals: number): string {
  const s = x.toFixed(decimals);
  return /^-0(\.0*)?$/.test(s) ? s.slice(1) : s;
}

/** `n` significant digits, trailing zeros dropped, never exponent notation. */
function significant(x: number, n: number): string {
  if (x === 0) return '0';
  const decimals = Math.max(0, n - 1 - Math.floor(Math.log10(Math.abs(x))));
  // Beyond 20 decimals (a bare number far below 1, which has no prefix) only exponent notation stays exact.
  if (decimals > 20) return String(Number(x.toPrecision(n)));
  const s = fixed(Number(x.toPrecision(n)), decimals);
  return s.includes('.') ? s.replace(/\.?0+$/, '') : s;
}

/** x·10^−e, multiplying for negative e so 4.7e-9 F reads exactly 4.7 nF. */
const unscale = (x: number, e: number): number => (e < 0 ? x * 10 ** -e : x / 10 ** e);

const join = (num: string, unit: string): string => (unit === '' ? num : `${num} ${unit}`);

/** 'value unit' with `digits` significant digits and trailing zeros dropped: '261.63 Hz', '14.8 mV', '1968.3 Hz', '−3 V'. */
export function formatSignificant(value: number, unit: string, digits = 5, options: TextOptions = {}): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatSignificant: value ${value} is not finite`);
  const e = prefixExponent(Number(value.toPrecision(digits)), unit);
  return join(group(significant(unscale(value, e), digits), options), prefixedUnit(e, unit));
}

/** A value written in a given prefix (a limit beside its measured value): `digits` significant digits (default 6), trailing zeros dropped. */
export function formatInPrefix(value: number, unit: string, exponent: number, digits = 6, options: TextOptions = {}): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatInPrefix: value ${value} is not finite`);
  const e = PREFIXABLE_UNITS.has(unit) ? exponent : 0;
  return join(group(significant(unscale(value, e), digits), options), prefixedUnit(e, unit));
}

export interface QuantityParts {
  /** Grouped number in the prefixed unit, e.g. '1 250.003'. */
  readonly value: string;
  /** Prefixed unit, e.g. 'kHz'; '' for a dimensionless ratio. */
  readonly unit: string;
  /** Rounded uncertainty in the same prefixed unit, e.g. '0.0040', or '<0.00000001' below the shown digits; null when none. */
  readonly uncertainty: string | null;
  /** The prefix's decimal exponent, for writing limits and margins beside the value. */
  readonly exponent: number;
}

const MAX_SIGNIFICANT = 10;

/**
 * A measured value with its uncertainty, split into cells: the uncertainty rounded up to two
 * significant digits, the value to the same decimal place, both in one prefix chosen from the larger
 * of the two. Without an uncertainty, six significant digits.
 */
export function quantityParts(value: number, unit: string, uncertainty: number | null = null, options: TextOptions = {}): QuantityParts {
  if (!Number.isFinite(value)) throw new RangeError(`quantityParts: value ${value} is not finite`);
  const u = uncertainty !== null && Number.isFinite(uncertainty) && uncertainty > 0 ? uncertainty : null;
  const exponent = prefixExponent(Math.max(Math.abs(value), u ?? 0), unit);
  const v = unscale(value, exponent);
  const shownUnit = prefixedUnit(exponent, unit);
  if (u === null) return { value: group(significant(v, 6), options), unit: shownUnit, uncertainty: null, exponent };
  const us = unscale(u, exponent);
  const wanted = Math.max(0, 1 - Math.floor(Math.log10(us)));
  const room = Math.max(0, MAX_SIGNIFICANT - Math.max(1, Math.floor(Math.log10(Math.abs(v) || 1)) + 1));
  const decimals = Math.min(wanted, room);
  // Rounded up, never down, so the shown interval is not narrower than the stated one (GUM §7.2.6).
  const steps = Math.ceil(us * 10 ** decimals * (1 - 1e-12));
  const shownU = steps === 0 || us < 10 ** -decimals * 1e-6 ? `<${(10 ** -decimals).toFixed(decimals)}` : (steps / 10 ** decimals).toFixed(decimals);
  return { value: group(fixed(v, decimals), options), unit: shownUnit, uncertainty: shownU, exponent };
}

/** 'U (k = 2)' or 'u (k = 1)': what a ± stands for. */
export function uncertaintyLabel(k: Coverage): string {
  return k === 2 ? 'U (k = 2)' : 'u (k = 1)';
}

/** '1 968.27 Hz ± 0.10 Hz': a value and its uncertainty in one prefix; a table's header says U or u. */
export function formatMeasured(value: number, uncertainty: number | null, unit: string, options: TextOptions = {}): string {
  const p = quantityParts(value, unit, uncertainty, options);
  const head = join(p.value, p.unit);
  return p.uncertainty === null ? head : `${head} ± ${join(p.uncertainty, p.unit)}`;
}

/** '1 968.27 Hz ± 0.10 Hz (U, k = 2)': the form for running text, with the ± named. */
export function formatMeasuredLabelled(value: number, uncertainty: number | null, unit: string, k: Coverage): string {
  const text = formatMeasured(value, uncertainty, unit);
  return uncertainty !== null && uncertainty > 0 ? `${text} (${k === 2 ? 'U, k = 2' : 'u, k = 1'})` : text;
}

/** Limits as `lower … upper`, `≥ lower` or `≤ upper`, in the prefix given (the measured value's). */
export function formatLimitsIn(lower: number | null, upper: number | null, unit: string, exponent: number): string {
  const one = (v: number): string => formatInPrefix(v, unit, exponent);
  if (lower !== null && upper !== null) return `${one(lower)} … ${one(upper)}`;
  if (lower !== null) return `≥ ${one(lower)}`;
  if (upper !== null) return `≤ ${one(upper)}`;
  return 'no limits';
}

/** A margin, always signed ('+0.42 Hz', '−1.3 mV'), in the prefix given. */
export function formatMarginIn(margin: number, unit: string, exponent: number): string {
  const text = formatInPrefix(Math.abs(margin), unit, exponent, 3);
  return `${margin < 0 ? MINUS : '+'}${text}`;
}
