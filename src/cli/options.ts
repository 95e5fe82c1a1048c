/** Parsing of command-line values; mistakes are BenchErrors naming the flag. */
import { BenchError } from '../types/index.js';

export function parsePositive(flag: string, raw: string | undefined): number | undefined {
  if (raw === undefined) return undefined;
  const v = Number(raw.trim());
  if (!Number.isFinite(v) || v <= 0) {
    throw new BenchError({
      code: 'usage.bad-number',
      file: '-',
      problem: `${flag} got "${raw}", which is not a positive number`,
      expected: `a positive number in SI base units, e.g. ${flag} 1e6`,
      fix: `write ${flag} with a plain number such as 2.5e-6 or 400000`,
    });
  }
  return v;
}
