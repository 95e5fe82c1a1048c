/**
 * The worker thread of the piece reader (parallelRead.ts): every message is a piece setup or task,
 * answered by PieceServer.
 */
import { parentPort } from 'node:worker_threads';
import { PieceServer } from './pieceServer.js';
import type { PieceMessage } from './pieceServer.js';

if (parentPort) {
  const server = new PieceServer(parentPort);
  parentPort.on('message', (m: PieceMessage) => server.handle(m));
}
