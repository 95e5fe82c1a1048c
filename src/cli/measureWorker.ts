/**
 * The worker thread of `measure` (measureWorkers.ts): it helps read a large capture in pieces
 * (the capture stage's PieceServer), then measures the channels it is given with the same
 * measureCapture as the main thread, on the samples it was sent (shared memory when the capture was
 * read in pieces). It answers each job with the report, or with the error's message, in which case
 * the main thread measures that channel itself.
 */
import { parentPort } from 'node:worker_threads';
import { measureCapture } from '../analysis/index.js';
import { isPieceMessage, PieceServer } from '../capture/index.js';
import { isMeasureJob } from './measureJobs.js';

if (parentPort) {
  const port = parentPort;
  const pieces = new PieceServer(port);
  port.on('message', (m: unknown) => {
    if (isPieceMessage(m)) return pieces.handle(m);
    if (!isMeasureJob(m)) return;
    try {
      port.postMessage({ measured: m.job, report: measureCapture(m.capture, m.options) });
    } catch (e) {
      port.postMessage({ failed: m.job, message: e instanceof Error ? e.message : String(e) });
    }
  });
}
