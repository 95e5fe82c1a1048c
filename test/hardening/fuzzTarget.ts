/**
 * One hostile capture file through the reader and the analysis, judged: a Capture that hangs together
 * and measures to finite numbers (or withheld values with a reason), or a BenchError of the reader with
 * all its fields. Anything else — another exception, NaN or Infinity in a report, a broken invariant,
 * or a read that outlasts its time limit — is returned as a problem.
 */
import { createHash } from 'node:crypto';
import { readCapture } from '../../src/capture/index.js';
import { measureCapture } from '../../src/analysis/index.js';
import { isBenchError } from '../../src/types/index.js';
import type { Capture, MeasureReport } from '../../src/types/index.js';
import { nonFinitePaths } from './budget.js';

export type Outcome =
  | { readonly kind: 'capture'; readonly capture: Capture }
  | { readonly kind: 'bench-error'; readonly code: string }
  | { readonly kind: 'crash'; readonly detail: string }
  | { readonly kind: 'hang'; readonly detail: string };

export async function judgeCapture(path: string, bytes: Buffer, limitMs: number): Promise<Outcome> {
  let timer: NodeJS.Timeout | undefined;
  const hang = new Promise<Outcome>((resolve) => {
    timer = setTimeout(() => resolve({ kind: 'hang', detail: `reading took longer than ${limitMs} ms` }), limitMs);
  });
  try {
    return await Promise.race([readAndMeasure(path, bytes), hang]);
  } finally {
    clearTimeout(timer);
  }
}

async function readAndMeasure(path: string, bytes: Buffer): Promise<Outcome> {
  let capture: Capture;
  try {
    capture = await readCapture(path);
  } catch (err) {
    if (!isBenchError(err)) return { kind: 'crash', detail: `readCapture threw ${String((err as Error)?.stack ?? err)}` };
    // Each field is one line of the three-line message (STYLE.md §14), whatever bytes the file held.
    const oneLine = !/[\r\n]/.test(err.problem + err.expected + err.fix);
    const fieldsOk = err.code.startsWith('capture.') && err.problem !== '' && err.expected !== '' && err.fix !== '' && err.exitCode === 2 && oneLine;
    return fieldsOk ? { kind: 'bench-error', code: err.code } : { kind: 'crash', detail: `BenchError with missing fields: ${JSON.stringify(err.toJSON())}` };
  }
  const broken = captureProblems(capture, bytes);
  if (broken) return { kind: 'crash', detail: broken };
  let report: MeasureReport;
  try {
    report = measureCapture(capture, { plotData: true });
  } catch (err) {
    return { kind: 'crash', detail: `measureCapture threw ${String((err as Error)?.stack ?? err)}` };
  }
  const problems = reportProblems(report);
  return problems ? { kind: 'crash', detail: problems } : { kind: 'capture', capture };
}

/** What every Capture promises (src/types/capture.ts), checked against the bytes on disk. */
export function captureProblems(c: Capture, bytes: Buffer): string | null {
  const sha = createHash('sha256').update(bytes).digest('hex');
  if (c.sha256 !== sha) return `sha256 ${c.sha256} is not the file's ${sha}`;
  if (c.size !== bytes.length) return `size ${c.size} is not the file's ${bytes.length} bytes`;
  if (!(c.sampleInterval > 0 && Number.isFinite(c.sampleInterval))) return `sample interval ${c.sampleInterval}`;
  if (!Number.isFinite(c.startTime)) return `start time ${c.startTime}`;
  if (!(c.length >= 2) || c.channels.length === 0) return `length ${c.length} with ${c.channels.length} channel(s)`;
  for (const ch of c.channels) {
    if (ch.samples.length !== c.length) return `channel ${ch.name} holds ${ch.samples.length} samples, not ${c.length}`;
    let gaps = 0;
    for (const v of ch.samples) {
      if (Number.isNaN(v)) gaps++;
      else if (!Number.isFinite(v)) return `channel ${ch.name} holds ${v}; invalid samples must be NaN`;
    }
    // Resampling widens a gap to the grid points on either side of it, so only then may it grow.
    const countOk = c.layout.resampled ? gaps >= ch.invalidCount : gaps === ch.invalidCount;
    if (!countOk) return `channel ${ch.name} counts ${ch.invalidCount} invalid samples but holds ${gaps} NaN`;
  }
  return null;
}

/** No NaN or Infinity anywhere; a withheld value (null) always carries its reason and note. */
export function reportProblems(r: MeasureReport): string | null {
  const bad = nonFinitePaths(r);
  if (bad.length > 0) return `non-finite numbers in the report: ${bad.join(', ')}`;
  for (const ch of r.channels) {
    for (const [id, m] of Object.entries(ch.measurements)) {
      if (m.value === null && (!m.reason || !m.note)) return `${ch.name}.${id} is withheld without a reason and note`;
      if (m.value !== null && m.reason !== undefined) return `${ch.name}.${id} has both a value and a reason`;
    }
  }
  return null;
}
