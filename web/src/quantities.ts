// Numbers and measurement names on the page come from the one formatter and the one label table the
// reports use (src/types/quantityText.ts, src/types/measurementLabels.ts), bundled into the page, so
// the page, the terminal and the printed record write a quantity the same way: one SI-prefix table,
// digit groups of three, the minus sign U+2212, one display name per measurement id.
import { formatInPrefix, group, prefixExponent } from '../../src/types/quantityText.js';

export { measurementLabel } from '../../src/types/measurementLabels.js';

/** A count with the house digit groups: 10000000 → "10 000 000". */
export function countText(n: number): string {
  return group(String(Math.round(n)));
}

/**
 * The tick texts of one plot axis: every tick in the prefix of the largest one, with as many
 * significant digits as it takes to tell neighbouring ticks apart (a deep zoom into a long record
 * puts ticks a sample apart at half a second: 500.0001 ms, 500.0002 ms).
 */
export function axisTicks(splits: readonly number[], unit: string, step: number): string[] {
  const largest = Math.max(0, ...splits.map((v) => Math.abs(v)));
  const exponent = prefixExponent(largest, unit);
  const gap = step > 0 && Number.isFinite(step) ? step : largest || 1;
  const digits = Math.min(15, Math.max(1, Math.ceil(Math.log10((largest || gap) / gap)) + 2));
  return splits.map((v) => (Number.isFinite(v) ? formatInPrefix(Math.abs(v) < gap * 1e-9 ? 0 : v, unit, exponent, digits) : ''));
}
