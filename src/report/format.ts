/**
 * Numbers for people, as the report stage names them: the shared formatter of `src/types`
 * (`quantityText.ts`: one SI-prefix table, one thousands rule, one minus sign, U rounded up to two
 * significant digits). This file only keeps the report's older names pointing at it.
 */
import { group as groupDigits, prefixExponent as prefixFor, quantityParts as partsOf } from '../types/index.js';
import type { QuantityParts } from '../types/index.js';

export type { QuantityParts };

/** '1 250.003 Hz ± 0.0040 Hz', '3.82219 ms', '1.08345 ± 0.00011'. */
export function formatQuantity(value: number, unit: string, uncertainty: number | null = null): string {
  const p = partsOf(value, unit, uncertainty);
  const head = p.unit ? `${p.value} ${p.unit}` : p.value;
  return p.uncertainty === null ? head : `${head} ± ${p.uncertainty}${p.unit ? ` ${p.unit}` : ''}`;
}

export const quantityParts = partsOf;

/** Exponent (multiple of 3) for `x` in a prefixable unit (Hz unless named). */
export const prefixExponent = (x: number, unit = 'Hz'): number => prefixFor(x, unit);

/** Group the integer part in threes with the house minus sign: '-12345.678' → '−12 345.678'. */
export const group = (s: string): string => groupDigits(s);
