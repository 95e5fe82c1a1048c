/**
 * An error as the page receives it: a BenchError's fields and the same three-line message `check`
 * prints; upload limits as their own code; anything else as an internal error without details.
 */
import { isBenchError, renderBenchError } from '../types/index.js';
import type { BenchErrorFields } from '../types/index.js';

export interface ErrorBody {
  readonly status: number;
  readonly error: BenchErrorFields & { readonly message: string };
}

export function errorBody(err: unknown): ErrorBody {
  if (isBenchError(err)) return { status: 422, error: { ...err.toJSON(), message: renderBenchError(err) } };
  const code = (err as { code?: string }).code;
  if (code === 'FST_REQ_FILE_TOO_LARGE' || code === 'FST_FILES_LIMIT' || code === 'FST_PARTS_LIMIT' || code === 'FST_FIELDS_LIMIT') {
    const fields: BenchErrorFields = {
      code: 'serve.upload-too-large',
      file: '-',
      problem: code === 'FST_REQ_FILE_TOO_LARGE' ? 'a file is larger than this server accepts' : 'the drop holds more files than this server accepts',
      expected: 'files within the limits of benchproof serve (--max-upload-mb, --max-files)',
      fix: 'drop fewer or smaller files, or restart serve with higher limits',
    };
    return { status: 413, error: { ...fields, message: renderBenchError(fields) } };
  }
  const status = (err as { statusCode?: number }).statusCode;
  if (status !== undefined && status >= 400 && status < 500) {
    // The web framework's own refusals (no such route, a malformed request): the request is at fault.
    const fields: BenchErrorFields = { code: 'serve.bad-request', file: '-', problem: (err as Error).message, expected: 'a request the bench page makes', fix: 'reload the page; if it persists, see the terminal running benchproof serve' };
    return { status, error: { ...fields, message: renderBenchError(fields) } };
  }
  const fields: BenchErrorFields = { code: 'serve.internal', file: '-', problem: 'an internal error stopped this request', expected: 'a request the server can finish', fix: 'see the terminal running benchproof serve; BENCHPROOF_DEBUG=1 shows more' };
  return { status: 500, error: { ...fields, message: renderBenchError(fields) } };
}
