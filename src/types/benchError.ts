/**
 * The one error class users see. Every field is data; the message is rendered from the fields
 * in one place (renderBenchError) so text and JSON output cannot drift apart.
 */
import type { ErrorCode } from './errorCodes.js';

export interface BenchErrorFields {
  /** Stable dotted id, e.g. `capture.no-time-base`: one of ERROR_CODES, which the README lists. */
  readonly code: ErrorCode;
  /** The file the problem is in (a capture, a spec, the data folder); '-' for the command line. */
  readonly file: string;
  /** 1-based line in that file, where one applies. */
  readonly line?: number;
  /** What is wrong, in one sentence. */
  readonly problem: string;
  /** What would be valid. */
  readonly expected: string;
  /** One concrete step that fixes it. */
  readonly fix: string;
  /** Further problems found in the same pass (e.g. every mistake in a spec), each rendered the same way. */
  readonly issues?: readonly BenchErrorFields[];
}

export class BenchError extends Error implements BenchErrorFields {
  readonly code: ErrorCode;
  readonly file: string;
  readonly line?: number;
  readonly problem: string;
  readonly expected: string;
  readonly fix: string;
  readonly issues?: readonly BenchErrorFields[];
  readonly exitCode = 2 as const;

  constructor(fields: BenchErrorFields) {
    super(renderBenchError(fields));
    this.name = 'BenchError';
    this.code = fields.code;
    this.file = fields.file;
    if (fields.line !== undefined) this.line = fields.line;
    this.problem = fields.problem;
    this.expected = fields.expected;
    this.fix = fields.fix;
    if (fields.issues !== undefined) this.issues = fields.issues;
  }

  toJSON(): BenchErrorFields & { exitCode: 2 } {
    return {
      code: this.code,
      file: this.file,
      ...(this.line !== undefined ? { line: this.line } : {}),
      problem: this.problem,
      expected: this.expected,
      fix: this.fix,
      ...(this.issues !== undefined ? { issues: this.issues } : {}),
      exitCode: 2,
    };
  }
}

/**
 * Three lines, the actionable part last: `<file>:<line>: <problem>`, `expected: …`, `fix: …`.
 * Further issues follow, each in the same three lines.
 */
export function renderBenchError(e: BenchErrorFields): string {
  const where = e.line !== undefined ? `${e.file}:${e.line}` : e.file;
  const head = `${where}: ${e.problem}\n  expected: ${e.expected}\n  fix: ${e.fix}`;
  return [head, ...(e.issues ?? []).map((i) => renderBenchError(i))].join('\n');
}

export function isBenchError(x: unknown): x is BenchError {
  return x instanceof BenchError;
}
