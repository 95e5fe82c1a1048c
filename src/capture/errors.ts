/** BenchErrors of the capture reader; every code is listed in index.ts. */
import { BenchError, type CaptureErrorName } from '../types/index.js';

export interface CaptureProblem {
  readonly line?: number;
  readonly problem: string;
  readonly expected: string;
  readonly fix: string;
}

export function captureError(code: CaptureErrorName, file: string, p: CaptureProblem): BenchError {
  return new BenchError({
    code: `capture.${code}`,
    file,
    ...(p.line !== undefined ? { line: p.line } : {}),
    // Problems quote the file, which may hold line breaks (a lone CR, a quoted field); each field
    // stays one line of the three-line message.
    problem: oneLine(p.problem),
    expected: oneLine(p.expected),
    fix: oneLine(p.fix),
  });
}

const oneLine = (s: string): string => s.replace(/[\r\n]+/g, ' ');

/** The generic "expected" text for a capture's layout. */
export const EXPECTED_CSV =
  'a text capture: optional `key,value` lines, an optional header row, then rows of numbers ' +
  'separated by commas, semicolons, tabs or spaces';
