/**
 * Worker threads for `measure` on large captures: one per further core (at most three), started
 * before the first file is read so that they load while this thread sniffs and reads. They read
 * pieces of each file beside this thread (the capture stage's piece reader, into shared columns),
 * then measure channels beside it. Each channel is measured by the same pure measureCapture on its
 * own, so the report is the one a single thread makes, channels in file order. A worker that fails
 * leaves its channels to this thread. Small captures use none: a worker's own start-up (about 0.1 s
 * of CPU, bench/README.md) would cost more than it saves.
 */
import { availableParallelism } from 'node:os';
import process from 'node:process';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { MeasureCaptureOptions } from '../analysis/index.js';
import { pieceHelpersOn } from '../capture/index.js';
import type { PieceOptions } from '../capture/index.js';
import type { Capture, ChannelReport, MeasureReport } from '../types/index.js';
import { isMeasureAnswer } from './measureJobs.js';
import type { MeasureAnswer, MeasureJob } from './measureJobs.js';

/**
 * Captures from this size on are read and measured with workers (about 1.5 M rows of two channels).
 * Measured on a shared 2-core machine (bench/README.md): at 1 M rows a worker took the main
 * thread's CPU from about 0.93 to 0.75 s but added about 0.5 s of CPU (its start-up and its analysis
 * running cold) and 23 MiB of peak memory, which two cores cannot turn into a shorter run; at 4 M
 * and 10 M rows the main thread's share fell by 0.5 and 2.3 s.
 */
export const MEASURE_WORKERS_MIN_BYTES = 64 << 20;
/**
 * Pieces of at most 4 MiB (each costs a message each way) and at least 16 per file, so that on a
 * smaller file the threads still finish reading close together.
 */
const MAX_PIECE_BYTES = 4 << 20;
const MIN_PIECES = 16;
/** The worker script beside this module (dist/cli or the bundle); absent when run from sources. */
const WORKER_URL = new URL('./measureWorker.js', import.meta.url);

type Measure = (capture: Capture, options: MeasureCaptureOptions) => MeasureReport;

interface Pending {
  readonly worker: Worker;
  readonly resolve: (r: MeasureReport) => void;
  readonly reject: (e: Error) => void;
}

/**
 * Workers for captures of up to `bytes`, or null when they would not pay (or cannot start), or when
 * BENCHPROOF_MEASURE_THREADS=1 asks for one thread (`npm run bench` times both ways, alternating, so
 * that an idle machine shows where the workers pay; also for a machine whose other cores are busy).
 */
export function startMeasureWorkers(bytes: number, script: URL = WORKER_URL, env: Readonly<Record<string, string | undefined>> = process.env): MeasureWorkers | null {
  const count = Math.min(availableParallelism() - 1, 3);
  if (env.BENCHPROOF_MEASURE_THREADS === '1') return null;
  if (bytes < MEASURE_WORKERS_MIN_BYTES || count < 1 || !existsSync(fileURLToPath(script))) return null;
  return new MeasureWorkers(count, script);
}

export class MeasureWorkers {
  private readonly live = new Set<Worker>();
  private readonly pending = new Map<number, Pending>();
  private jobs = 0;
  /** Channels the workers have measured so far (tests check that they took part). */
  helped = 0;

  constructor(count: number, script: URL) {
    for (let i = 0; i < count; i++) {
      const w = new Worker(script);
      this.live.add(w);
      w.on('message', (m: unknown) => {
        if (isMeasureAnswer(m)) this.answer(m);
      });
      w.on('error', (e) => this.lose(w, e));
      w.on('exit', () => this.lose(w, new Error('measure worker exited')));
    }
  }

  /** How readCapture reads with these workers: in pieces from MEASURE_WORKERS_MIN_BYTES on. */
  pieceOptions(bytes: number): PieceOptions {
    const pieceBytes = Math.max(1 << 20, Math.min(MAX_PIECE_BYTES, Math.ceil(bytes / MIN_PIECES)));
    return { helpers: () => pieceHelpersOn([...this.live]), pieceBytes, minBytes: MEASURE_WORKERS_MIN_BYTES };
  }

  /**
   * `measure(capture)` with the channels shared out between this thread and the workers: this
   * thread takes the first channel, each worker the next free one whenever it is free.
   */
  async measure(capture: Capture, options: MeasureCaptureOptions, measure: Measure): Promise<MeasureReport> {
    const n = capture.channels.length;
    if (n < 2 || this.live.size === 0) return measure(capture, options);
    const only = (i: number): Capture => ({ ...capture, channels: [capture.channels[i]] });
    const channels: ChannelReport[] = new Array<ChannelReport>(n);
    let head: MeasureReport | null = null;
    const keep = (i: number, r: MeasureReport): void => {
      head ??= r;
      channels[i] = r.channels[0];
    };
    let next = 0;
    const take = (): number => (next < n ? next++ : -1);
    const here = (i: number): void => keep(i, measure(only(i), options));
    const first = take();
    const helping = [...this.live].map(async (w) => {
      for (let i = take(); i >= 0; i = take()) {
        try {
          keep(i, await this.send(w, only(i), options));
          this.helped++;
        } catch {
          // A failed worker's channel is measured here (an error it met will be met here too, and reported).
          here(i);
          return;
        }
      }
    });
    here(first);
    for (;;) {
      // Lets the workers' answers in, so that a free worker takes the next channel.
      await new Promise((resolve) => setImmediate(resolve));
      const i = take();
      if (i < 0) break;
      here(i);
    }
    await Promise.all(helping);
    return { ...head!, channels };
  }

  async close(): Promise<void> {
    const all = [...this.live];
    this.live.clear();
    await Promise.all(all.map((w) => w.terminate()));
  }

  private send(worker: Worker, capture: Capture, options: MeasureCaptureOptions): Promise<MeasureReport> {
    if (!this.live.has(worker)) return Promise.reject(new Error('measure worker gone'));
    const job = ++this.jobs;
    return new Promise<MeasureReport>((resolve, reject) => {
      this.pending.set(job, { worker, resolve, reject });
      const message: MeasureJob = { job, capture, options };
      worker.postMessage(message);
    });
  }

  private answer(m: MeasureAnswer): void {
    const id = 'measured' in m ? m.measured : m.failed;
    const p = this.pending.get(id);
    if (!p) return;
    this.pending.delete(id);
    if ('measured' in m) p.resolve(m.report);
    else p.reject(new Error(m.message));
  }

  private lose(worker: Worker, e: Error): void {
    this.live.delete(worker);
    for (const [id, p] of this.pending) {
      if (p.worker !== worker) continue;
      this.pending.delete(id);
      p.reject(e);
    }
  }
}
