/**
 * Values with SI prefixes and units as people write them in a spec: "2.5 kHz", "40 mV", "1.5 %",
 * "6 Vpp", "4.7 nF", "25 V/ms". One parser and one formatter, so a spec written by `spec init` reads
 * back to the same numbers. Prefixes follow the SI Brochure (BIPM, 9th ed., 2019, Table 7); the
 * decorations Vpp/Vpk/Vrms are trade habit (common practice, no source) and all mean volts.
 */
import { PREFIX_EXPONENTS as PREFIX, formatSignificant } from '../types/index.js';

export interface Quantity {
  readonly value: number;
  /** SI unit after conversion ('Hz', 's', 'V', 'V/s', 'A', 'F', 'Ω', '%', 'dB', 'dBc', 'bits'), '' for a bare number. */
  readonly unit: string;
}


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

/** A number, its integer part optionally grouped in threes by spaces as the formatter writes it. */
const NUMBER = /^([+-]?(?:\d{1,3}(?: \d{3})+(?:\.\d*)?|\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?)\s*(.*)$/;
const SLOPE = /^([pnuµμmkMG]?)V\/([pnuµμmkMG]?)s$/;

/** Parse a number with an optional unit; null when the text is not one. A bare number has unit ''. */
export function parseQuantity(input: string | number): Quantity | null {
  if (typeof input === 'number') return Number.isFinite(input) ? { value: input, unit: '' } : null;
  const text = input.trim().replace(/^\u2212/, '-');
  const m = NUMBER.exec(text);
  if (!m) return null;
  const n = Number(m[1].replace(/ /g, ''));
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

/** "261.63 Hz", "14.8 mV", "1 968.3 Hz", "−3 V" for people (notes, causes): the shared formatter, `significant` digits, trailing zeros dropped. */
export function formatQuantity(value: number, unit: string, significant = 5): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatQuantity: value ${value} is not finite`);
  return formatSignificant(value, unit, significant);
}

/** The same number for a spec file a program reads back (`spec init`): ASCII minus, no digit groups ("1968 Hz", "-3 V"). */
export function formatSpecQuantity(value: number, unit: string, significant = 5): string {
  if (!Number.isFinite(value)) throw new RangeError(`formatSpecQuantity: value ${value} is not finite`);
  return formatSignificant(value, unit, significant, { plain: true });
}
