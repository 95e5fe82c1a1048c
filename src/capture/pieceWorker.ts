/**
 * The worker thread of the piece reader (parallelRead.ts): takes the setup once, then pieces one at
 * a time, and answers each with its PieceResult (the x values' buffers are transferred, not copied,
 * and come back with a later task for reuse).
 */
import { parentPort } from 'node:worker_threads';
import { PieceReader } from './pieceReader.js';
import type { PieceSetup, PieceTask } from './pieceReader.js';

type Message = { readonly setup: PieceSetup } | { readonly task: PieceTask; readonly times?: Float64Array; readonly exps?: Int32Array };

let reader: PieceReader | null = null;

parentPort?.on('message', (m: Message) => {
  if ('setup' in m) {
    reader = new PieceReader(m.setup);
    return;
  }
  const r = reader!.read(m.task, m.times, m.exps);
  parentPort!.postMessage(r, [r.times.buffer as ArrayBuffer, r.exps.buffer as ArrayBuffer]);
});
