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

/**
 * A unit serial given with --unit: never blank (a blank serial would be stored as a unit no one can
 * name again) and without control characters; surrounding blanks are dropped.
 */
export function parseSerial(raw: string): string {
  const serial = raw.trim();
  // eslint-disable-next-line no-control-regex -- finding control characters is the point
  if (serial === '' || /[\u0000-\u001f\u007f-\u009f]/.test(serial)) {
    throw new BenchError({
      code: 'usage.bad-serial',
      file: '-',
      problem: serial === '' ? '--unit got a blank serial' : '--unit got a serial with control characters',
      expected: 'the unit serial as printed on the unit, e.g. FK-0107',
      fix: 'write --unit FK-0107 (quote it if it holds spaces)',
    });
  }
  return serial;
}
