/**
 * The worker thread's side of the piece reader (parallelRead.ts): takes the setup once, then pieces
 * one at a time, and answers each with its PieceResult (the x values' buffers are transferred, not
 * copied, and come back with a later task for reuse). Used by the capture's own worker script
 * (pieceWorker.ts) and by any worker that also does other work between reads (the measure command's).
 */
import type { MessagePort } from 'node:worker_threads';
import { PieceReader } from './pieceReader.js';
import type { PieceSetup, PieceTask } from './pieceReader.js';

export type PieceMessage =
  | { readonly setup: PieceSetup }
  | { readonly task: PieceTask; readonly times?: Float64Array; readonly exps?: Int32Array }
  /** The file is read: its descriptor is closed (a worker that lives on keeps none open). */
  | { readonly finished: true };

export function isPieceMessage(m: unknown): m is PieceMessage {
  return typeof m === 'object' && m !== null && ('setup' in m || 'task' in m || 'finished' in m);
}

export class PieceServer {
  private reader: PieceReader | null = null;

  constructor(private readonly port: MessagePort) {}

  handle(m: PieceMessage): void {
    if ('finished' in m) {
      this.reader?.close();
      this.reader = null;
      return;
    }
    if ('setup' in m) {
      // A new file: the previous one's reader (if any) lets its descriptor go.
      this.reader?.close();
      this.reader = new PieceReader(m.setup);
      return;
    }
    const r = this.reader!.read(m.task, m.times, m.exps);
    this.port.postMessage(r, [r.times.buffer as ArrayBuffer, r.exps.buffer as ArrayBuffer]);
  }
}
