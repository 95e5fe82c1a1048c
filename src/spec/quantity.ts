/**
 * Values with SI prefixes and units as people write them in a spec: "2.5 kHz", "40 mV", "1.5 %",
 * "6 Vpp", "4.7 nF", "25 V/ms". One parser and one formatter, so a spec written by `spec init` reads
 * back to the same numbers. Prefixes follow the SI Brochure (BIPM, 9th ed., 2019, Table 7); the
 * decorations Vpp/Vpk/Vrms are trade habit (common practice, no source) and all mean volts.
 */

export interface Quantity {
  readonly value: number;
  /** SI unit after conversion ('Hz', 's', 'V', 'V/s', 'A', 'F', 'Ω', '%', 'dB', 'dBc', 'bits'), '' for a bare number. */
  readonly unit: string;
}

/** Decimal exponent of each prefix (µ written as µ, μ or u). */
const PREFIX: Readonly<Record<string, number>> = { p: -12, n: -9, u: -6, µ: -6, μ: -6, m: -3, '': 0, k: 3, M: 6, G: 9 };

/** n·10^e, dividing for negative e so "4.7 nF" gives exactly the double nearest 4.7e-9. */
const scale = (n: number, e: number): number => (e < 0 ? n / 10 ** -e : n * 10 ** e);

/** Written unit → SI unit, and whether an SI prefix may precede it. */
const UNITS: Readonly<Record<string, { si: string; prefix: boolean; exponent?: number }>> = {
  Hz: { si: 'Hz', prefix: true },
  s: { si: 's', prefix: true },
  V: { si: 'V', prefix: true },
  Vpp: { si: 'V', prefix: true },
  'Vp-p': { si: 'V', prefix: true },
  Vpk: { si: 'V', prefix: true },
  Vrms: { si: 'V', prefix: true },
  A: { si: 'A', prefix: true },
  F: { si: 'F', prefix: true },
  Ω: { si: 'Ω', prefix: true },
  ohm: { si: 'Ω', prefix: true },
  '%': { si: '%', prefix: false },
  ppm: { si: '%', prefix: false, exponent: -4 },
  dB: { si: 'dB', prefix: false },
  dBc: { si: 'dBc', prefix: false },
  bit: { si: 'bits', prefix: false },
  bits: { si: 'bits', prefix: false },
};

const NUMBER = /^([+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;
const SLOPE = /^([pnuµμmkMG]?)V\/([pnuµμmkMG]?)s$/;

/** Parse a number with an optional unit; null when the text is not one. A bare number has unit ''. */
export function parseQuantity(input: string | number): Quantity | null {
  if (typeof input === 'number') return Number.isFinite(input) ? { value: input, unit: '' } : null;
  const text = input.trim().replace(/^−/, '-');
  const m = NUMBER.exec(text);
  if (!m) return null;
  const n = Number(m[1]);
  const scaled = parseUnit(m[2].trim());
  if (!scaled || !Number.isFinite(n)) return null;
  return { value: scale(n, scaled.exponent), unit: scaled.si };
}

function parseUnit(written: string): { si: string; exponent: number } | null {
  if (written === '') return { si: '', exponent: 0 };
  const slope = SLOPE.exec(written);
  if (slope) return { si: 'V/s', exponent: PREFIX[slope[1]] - PREFIX[slope[2]] };
  const exact = UNITS[written];
  if (exact) return { si: exact.si, exponent: exact.exponent ?? 0 };
  const prefixed = UNITS[written.slice(1)];
  const p = PREFIX[written[0]];
  if (prefixed?.prefix && p !== undefined && written.length > 1) return { si: prefixed.si, exponent: p };
  return null;
}

/** The value in `siUnit`, or null when the quantity carries another unit. A bare number is taken as already in `siUnit`. */
export function valueIn(q: Quantity, siUnit: string): number | null {
  if (q.unit === '' || q.unit === siUnit) return q.value;
  return null;
}

const PREFIXABLE = new Set(['Hz', 's', 'V', 'A', 'F', 'Ω', 'V/s']);
const STEPS: readonly [string, number][] = [
  ['G', 9],
  ['M', 6],
  ['k', 3],
  ['', 0],
  ['m', -3],
  ['µ', -6],
  ['n', -9],
  ['p', -12],
];

/** "261.63 Hz", "14.8 mV", "4.7 nF", "-3 V", "1.5 %": `significant` digits, trailing zeros dropped. */
export function formatQuantity(value: number, unit: string, significant = 5): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatQuantity: value ${value} is not finite`);
  const digits = (x: number): string => String(Number(x.toPrecision(significant)));
  if (!PREFIXABLE.has(unit) || value === 0) return unit === '' ? digits(value) : `${digits(value)} ${unit}`;
  const mag = Math.abs(value);
  const [p, e] = STEPS.find(([, step]) => mag >= scale(1 - 1e-12, step)) ?? STEPS[STEPS.length - 1];
  const body = unit === 'V/s' ? `${p}V/s` : `${p}${unit}`;
  return `${digits(scale(value, -e))} ${body}`;
}
