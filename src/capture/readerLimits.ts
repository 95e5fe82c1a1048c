/**
 * Bounds on what one capture may cost, so that a hostile or broken file is refused early instead of
 * running for minutes or taking the machine's memory:
 *   - decompression stops once a .gz has unpacked past its limit (a ratio of the stored size, with a
 *     floor; `--unpack-limit MB` sets it);
 *   - a run of blank or comment lines is refused past MAX_BLANK_RUN lines;
 *   - the samples held in memory are capped by the machine's memory as well as by MAX_SAMPLES.
 * The constants are our choice (common practice, no source); each is stated in its error message.
 */
import { totalmem } from 'node:os';
import process from 'node:process';
import { captureError } from './errors.js';

/**
 * Unpacked bytes allowed per stored byte. Text captures compress 3–20× (noisy numbers) and up to
 * about 60× (an index and a constant); gzip itself stops near 1030× (RFC 1951's longest match), which
 * only blank or repeated lines reach.
 */
export const UNPACK_RATIO = 100;
/** Unpacked bytes always allowed, whatever the ratio: small .gz files of a few thousand rows. */
export const UNPACK_FLOOR = 256 * 2 ** 20;
/** Blank or `#` comment lines allowed in a row anywhere in the data. */
export const MAX_BLANK_RUN = 100_000;
/** Share of the machine's memory the sample columns may take (the rest: the analysis, growth copies). */
const MEMORY_SHARE = 0.5;

/** The unpacked size at which reading a .gz stops: the option when given, else ratio × stored with a floor. */
export function unpackLimitBytes(storedBytes: number, optionMB: number | undefined): number {
  if (optionMB !== undefined) return optionMB * 1e6;
  return Math.max(UNPACK_FLOOR, UNPACK_RATIO * storedBytes);
}

export function unpackLimitError(file: string, limit: number, stored: number, fromOption: boolean) {
  const mb = String(+(limit / 1e6).toPrecision(3));
  return captureError('unpack-limit', file, {
    problem: `the compressed capture unpacks to more than ${mb} MB (from ${+(stored / 1e6).toPrecision(3)} MB stored); reading stopped there`,
    expected: fromOption
      ? `at most the ${mb} MB given with --unpack-limit`
      : `at most ${UNPACK_RATIO}× its stored size or ${UNPACK_FLOOR / 2 ** 20} MiB, whichever is larger: text captures compress far less`,
    fix: 'check the file with `gzip -l`; if it really is a capture this large, give --unpack-limit with a size in MB above its unpacked size',
  });
}

export function blankRunError(file: string, firstLine: number) {
  return captureError('blank-run', file, {
    line: firstLine,
    problem: `more than ${MAX_BLANK_RUN} blank or comment lines in a row start here; reading stopped`,
    expected: 'rows of data, with at most a few blank or # comment lines between them',
    fix: 'check that this is the capture you meant (it may be damaged or padded); cut the blank lines out, then measure again',
  });
}

/**
 * Bytes of sample memory this machine can give one capture: half of its memory, or of the control
 * group's limit when the process runs under one (process.constrainedMemory, Node ≥ 19.6). The
 * columns are typed arrays outside the JavaScript heap, so V8's heap limit does not bound them: the
 * machine's memory does.
 */
export function sampleMemoryBudget(): number {
  // Without a limit Node reports 2^64 (or 0 on systems without control groups).
  const limit = process.constrainedMemory?.() ?? 0;
  const total = totalmem();
  const mem = limit > 0 && limit < total ? limit : total;
  return Math.floor(mem * MEMORY_SHARE);
}
