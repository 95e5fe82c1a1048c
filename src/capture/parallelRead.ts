/**
 * Reading a large plain numeric capture on every core: the data bytes are cut into pieces at line
 * boundaries, worker threads parse the pieces into the shared columns (pieceReader.ts), and this
 * thread hashes the file meanwhile and commits the pieces in file order through the row sink's
 * time-base rules. The result is the one the single-thread reader gives, bit for bit (tested over
 * layouts and split points). From the first piece that is not plain on, the file is read on in this
 * thread as before, so errors and warnings name the same lines.
 */
import { availableParallelism } from 'node:os';
import { closeSync, existsSync, openSync, readSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { ByteScanner } from './byteScanner.js';
import type { ScannerLayout } from './byteScanner.js';
import { identityOf, PieceReader } from './pieceReader.js';
import type { PieceResult, PieceSetup, PieceTask } from './pieceReader.js';
import type { RowSink } from './rowSink.js';

/**
 * Files below this size are read in one thread. A worker costs about 0.1–0.2 s of CPU before its
 * first row (its own Node start-up and a cold scanner), which a 43 MB file (1 M rows, read in about
 * 0.4 s by one thread) does not win back: measured on a shared 2-core machine, bench/README.md.
 */
export const PARALLEL_MIN_BYTES = 64 << 20;
export const PIECE_BYTES = 4 << 20;

/**
 * Threads that read pieces beside this one: each takes the next piece with `take` and hands its
 * result to `done`. This thread reads pieces too, whenever the next one to commit is not ready.
 */
export interface PieceHelpers {
  setup(s: PieceSetup, take: () => PieceTask | undefined, done: (index: number, r: PieceResult | null) => void): void;
  /** Hands a result's buffers back for reuse. */
  recycle(r: PieceResult): void;
  /** Whether a result came from a helper (its buffers go back to it). */
  owns(r: PieceResult): boolean;
  /** Waits for the pieces being read (so nothing writes to the columns after), then stops. */
  close(): Promise<void>;
}

/** Pieces of the data bytes, each with a slot of rows sized for its shortest possible rows. */
export function planPieces(dataStart: number, size: number, pieceBytes: number, minRowBytes: number): PieceTask[] {
  const tasks: PieceTask[] = [];
  let slot = 0;
  for (let a = dataStart, i = 0; a < size; a += pieceBytes, i++) {
    const b = Math.min(size, a + pieceBytes);
    // A piece holds the lines that start in [a, b): at most (b − a) / minRowBytes of them, plus the one cut at b.
    const slotRows = Math.ceil((b - a) / minRowBytes) + 16;
    tasks.push({ index: i, nominalStart: a, nominalEnd: b, slotStart: slot, slotRows });
    slot += slotRows;
  }
  return tasks;
}

export function slotRowsOf(tasks: readonly PieceTask[]): number {
  return tasks.reduce((n, t) => n + t.slotRows, 0);
}

/** The worker script beside this module (dist/capture or the bundle); absent when run from sources. */
const WORKER_URL = new URL('./pieceWorker.js', import.meta.url);

/**
 * Worker threads beside this one for a file of this size: one per further core (at most 3), none
 * for small files, on one core, or when run from sources (no built worker script).
 */
export function workersFor(size: number): number {
  if (size < PARALLEL_MIN_BYTES || !existsSync(fileURLToPath(WORKER_URL))) return 0;
  return Math.min(availableParallelism() - 1, 3);
}

/** Starts the workers at once, so that they load while this thread sniffs the layout. */
export function startWorkerPool(count: number, script: URL = WORKER_URL): PieceHelpers {
  return new WorkerPool(
    Array.from({ length: count }, () => new Worker(script)),
    true,
  );
}

/**
 * Piece helpers on worker threads someone else started and keeps (their script must answer piece
 * messages with PieceServer): close() waits for their pieces, then lets them go without stopping them.
 */
export function pieceHelpersOn(workers: readonly Worker[]): PieceHelpers {
  return new WorkerPool(workers, false);
}

/** No helpers: this thread reads every piece. */
export function noHelpers(): PieceHelpers {
  return { setup: () => undefined, recycle: () => undefined, owns: () => false, close: async () => undefined };
}

export interface PlainPieces {
  readonly helpers: PieceHelpers;
  readonly tasks: readonly PieceTask[];
  readonly sink: RowSink;
  readonly layout: ScannerLayout;
  readonly targets: Int32Array;
  readonly scales: Float64Array;
  readonly trailingDelimiter: boolean;
  readonly dataStart: number;
  /** The size the source was opened with: the file must still have it. */
  readonly size: number;
  /** The source's chunks after the sniffed part: read to the end here, for the file's hash. */
  readonly rest: AsyncIterable<Buffer>;
}

/** Reads the data bytes in pieces into the sink (closing the runner), hashing the file meanwhile. */
export async function readPlainInPieces(q: PlainPieces): Promise<void> {
  const path = q.layout.file;
  let fd: number;
  try {
    fd = openSync(path, 'r');
  } catch (e) {
    await q.helpers.close();
    throw e;
  }
  try {
    const identity = identityOf(fd);
    const { delimiter, decimalMark, terminator, columnCount } = q.layout;
    const setup: PieceSetup = {
      path,
      identity,
      layout: { delimiter, decimalMark, terminator, columnCount },
      trailingDelimiter: q.trailingDelimiter,
      targets: q.targets,
      scales: q.scales,
      columns: q.sink.buffers,
      dataStart: q.dataStart,
    };
    // A file that changed size since it was opened is read on in one thread: its pieces would not match.
    const tasks = identity.size === q.size ? q.tasks : [];
    await readInPieces({ helpers: q.helpers, setup, tasks, sink: q.sink, layout: q.layout, fd, drain: () => drain(q.rest) });
  } finally {
    closeSync(fd);
  }
}

/** Reads the chunks to the end (the source hashes them), letting the workers' answers in every 8 MiB. */
async function drain(rest: AsyncIterable<Buffer>): Promise<void> {
  let n = 0;
  for await (const chunk of rest) {
    n += chunk.length;
    if (n >= 8 << 20) {
      n = 0;
      await new Promise((resolve) => setImmediate(resolve));
    }
  }
}

interface PieceRead {
  readonly helpers: PieceHelpers;
  readonly setup: PieceSetup;
  readonly tasks: readonly PieceTask[];
  readonly sink: RowSink;
  readonly layout: ScannerLayout;
  /** For reading on in this thread from the first piece that is not plain. */
  readonly fd: number;
  /** Hashes the rest of the file meanwhile (the source's own read loop). */
  readonly drain: () => Promise<void>;
}

async function readInPieces(p: PieceRead): Promise<void> {
  const { helpers, tasks, sink } = p;
  const own = new PieceReader(p.setup);
  const spare: PieceResult[] = [];
  const results: (PieceResult | null | undefined)[] = new Array(tasks.length);
  let next = 0;
  let stopped = false;
  let wake: (() => void) | null = null;
  const take = (): PieceTask | undefined => (!stopped && next < tasks.length ? tasks[next++] : undefined);
  helpers.setup(p.setup, take, (i, r) => {
    results[i] = r;
    wake?.();
  });
  const hashing = p.drain();
  hashing.catch(() => undefined);
  let line = p.layout.firstLine;
  let from = p.setup.dataStart;
  let resumeAt = tasks.length === 0 ? from : -1;
  try {
    for (let i = 0; i < tasks.length; i++) {
      while (results[i] === undefined) {
        const t = take();
        if (t) {
          const reuse = spare.pop();
          results[t.index] = own.read(t, reuse?.times, reuse?.exps);
          // Lets the helpers' answers and the hashing in between two pieces.
          await new Promise((resolve) => setImmediate(resolve));
        } else await new Promise<void>((resolve) => (wake = resolve));
      }
      const r = results[i]!;
      results[i] = null;
      if (r === null || !r.plain) {
        resumeAt = from;
        break;
      }
      sink.commitRows(r.times, r.exps, r.rows, line, tasks[i].slotStart);
      line += r.rows;
      from = r.end;
      // Buffers of this thread's pieces are reused here, the helpers' go back to them.
      if (spare.length < 2 && !helpers.owns(r)) spare.push(r);
      else helpers.recycle(r);
    }
  } finally {
    stopped = true;
    await helpers.close();
    own.close();
  }
  if (resumeAt >= 0) readOnFrom(p, resumeAt, line);
  await hashing;
}

/** The single-thread reader from byte `at` (a line start) and line `line` to the end of the file. */
function readOnFrom(p: PieceRead, at: number, line: number): void {
  const scanner = new ByteScanner({ ...p.layout, firstLine: line }, p.sink);
  const buf = Buffer.allocUnsafe(1 << 20);
  for (let pos = at; ; ) {
    const n = readSync(p.fd, buf, 0, buf.length, pos);
    if (n <= 0) break;
    scanner.feed(buf.subarray(0, n));
    pos += n;
  }
  scanner.end();
}

class WorkerPool implements PieceHelpers {
  private readonly running = new Map<Worker, number>();
  private readonly spare: PieceResult[] = [];
  private readonly answered = new WeakSet<PieceResult>();
  private take: () => PieceTask | undefined = () => undefined;
  private done: (index: number, r: PieceResult | null) => void = () => undefined;
  private idleWaiters: (() => void)[] = [];
  private failed = false;
  private readonly detach: (() => void)[] = [];

  /** `owned`: the pool started the workers and stops them on close; otherwise it only lets them go. */
  constructor(
    private readonly workers: readonly Worker[],
    private readonly owned: boolean,
  ) {
    for (const w of workers) {
      const onMessage = (r: unknown): void => {
        // A worker shared with other work answers only pieces while it is lent to this pool.
        if (!isPieceResult(r)) return;
        this.answered.add(r);
        this.settle(w, r);
      };
      // A worker that fails is not used again; its piece is read on in order by the main thread.
      const onError = (): void => {
        this.failed = true;
        this.settle(w, null);
      };
      // A worker gone without an answer (out of memory, stopped) leaves its piece to the main thread too.
      const onExit = (): void => {
        this.failed = true;
        if (this.running.has(w)) this.settle(w, null);
      };
      w.on('message', onMessage).on('error', onError).on('exit', onExit);
      this.detach.push(() => w.off('message', onMessage).off('error', onError).off('exit', onExit));
    }
  }

  setup(s: PieceSetup, take: () => PieceTask | undefined, done: (index: number, r: PieceResult | null) => void): void {
    this.take = take;
    this.done = done;
    for (const w of this.workers) {
      w.postMessage({ setup: s });
      this.feed(w);
    }
  }

  recycle(r: PieceResult): void {
    if (this.spare.length < this.workers.length * 2) this.spare.push(r);
  }

  owns(r: PieceResult): boolean {
    return this.answered.has(r);
  }

  async close(): Promise<void> {
    if (this.running.size > 0) await new Promise<void>((resolve) => this.idleWaiters.push(resolve));
    if (this.owned) {
      await Promise.all(this.workers.map((w) => w.terminate()));
      return;
    }
    for (const w of this.workers) w.postMessage({ finished: true });
    for (const off of this.detach.splice(0)) off();
  }

  private settle(w: Worker, r: PieceResult | null): void {
    const index = this.running.get(w);
    this.running.delete(w);
    if (index !== undefined) this.done(index, r);
    if (!this.failed) this.feed(w);
    if (this.running.size === 0) for (const wake of this.idleWaiters.splice(0)) wake();
  }

  private feed(w: Worker): void {
    if (this.failed) return;
    const task = this.take();
    if (!task) return;
    this.running.set(w, task.index);
    const reuse = this.spare.pop();
    const transfer = reuse ? [reuse.times.buffer as ArrayBuffer, reuse.exps.buffer as ArrayBuffer] : [];
    w.postMessage({ task, ...(reuse ? { times: reuse.times, exps: reuse.exps } : {}) }, transfer);
  }
}

function isPieceResult(r: unknown): r is PieceResult {
  return typeof r === 'object' && r !== null && 'plain' in r && 'index' in r;
}
