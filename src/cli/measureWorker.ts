/**
 * The worker thread of `measure` (measureWorkers.ts): it helps read a large capture in pieces
 * (the capture stage's PieceServer), then measures the channels it is given with the same
 * measureCapture as the main thread, on the samples it was sent (shared memory when the capture was
 * read in pieces). It answers each job with the report, or with the error's message, in which case
 * the main thread measures that channel itself. The analysis stage loads only once the reading is
 * over (or the first job comes): loaded at start it delayed the worker's first piece.
 */
import { parentPort } from 'node:worker_threads';
import { isPieceMessage, PieceServer } from '../capture/index.js';
import { isMeasureJob } from './measureJobs.js';
import type { MeasureJob } from './measureJobs.js';

type Analysis = typeof import('../analysis/index.js');

if (parentPort) {
  const port = parentPort;
  const pieces = new PieceServer(port);
  let analysis: Promise<Analysis> | null = null;
  const loadAnalysis = (): Promise<Analysis> => (analysis ??= import('../analysis/index.js'));
  const measure = async (m: MeasureJob): Promise<void> => {
    try {
      const { measureCapture } = await loadAnalysis();
      port.postMessage({ measured: m.job, report: measureCapture(m.capture, m.options) });
    } catch (e) {
      port.postMessage({ failed: m.job, message: e instanceof Error ? e.message : String(e) });
    }
  };
  port.on('message', (m: unknown) => {
    if (isPieceMessage(m)) {
      pieces.handle(m);
      if ('finished' in m) void loadAnalysis().catch(() => undefined);
      return;
    }
    if (isMeasureJob(m)) void measure(m);
  });
}
