/** BenchErrors of the capture reader; every code is listed in index.ts. */
import { BenchError } from '../types/index.js';

export interface CaptureProblem {
  readonly line?: number;
  readonly problem: string;
  readonly expected: string;
  readonly fix: string;
}

export function captureError(code: string, file: string, p: CaptureProblem): BenchError {
  return new BenchError({
    code: `capture.${code}`,
    file,
    ...(p.line !== undefined ? { line: p.line } : {}),
    problem: p.problem,
    expected: p.expected,
    fix: p.fix,
  });
}

/** The generic "expected" text for a capture's layout. */
export const EXPECTED_CSV =
  'a text capture: optional `key,value` lines, an optional header row, then rows of numbers ' +
  'separated by commas, semicolons, tabs or spaces';
