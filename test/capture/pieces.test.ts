/**
 * Reading a file in pieces (parallelRead.ts, the worker-thread reader) gives the capture the
 * single-thread reader gives, bit for bit, or the same error on the same line: the reference is the
 * single-thread reader itself, an independent path through the same file (common practice, no
 * source). Pieces are read here in this thread (the workers run the same PieceReader); tiny pieces
 * put the split points everywhere, including inside the sniffed part and in the middle of a row.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readCaptureLines } from '../../src/capture/readCapture.js';
import { existsSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import { Worker } from 'node:worker_threads';
import { noHelpers, pieceHelpersOn, planPieces, startWorkerPool } from '../../src/capture/parallelRead.js';
import type { PieceHelpers } from '../../src/capture/parallelRead.js';
import { PieceReader } from '../../src/capture/pieceReader.js';
import type { Capture } from '../../src/types/index.js';
import { isBenchError } from '../../src/types/index.js';
import { tempFolder } from './tempFiles.js';

const write = tempFolder();

type Outcome = { capture: Capture } | { code: string; line?: number; message: string };

/** Pieces read by the stand-in helper and found plain, to show that the piece path was taken. */
const seen = { read: 0, plain: 0 };

/**
 * A helper thread played in this thread: it takes pieces as a worker does and answers each after a
 * few turns of the event loop, so pieces finish out of order while this thread reads others.
 */
function lateHelper(): PieceHelpers {
  let reader: PieceReader | null = null;
  let busy = 0;
  let idle: (() => void) | null = null;
  return {
    setup(s, take, done) {
      reader = new PieceReader(s);
      const loop = (turns: number): void => {
        const t = take();
        if (!t) return;
        busy++;
        const later = (k: number): void => {
          if (k > 0) return void setImmediate(() => later(k - 1));
          const r = reader!.read(t);
          seen.read++;
          if (r.plain) seen.plain++;
          busy--;
          done(t.index, r);
          if (busy === 0) idle?.();
          loop((turns * 7 + 3) % 5);
        };
        later(turns);
      };
      loop(2);
      loop(0);
    },
    recycle: () => undefined,
    owns: () => false,
    close: async () => {
      if (busy > 0) await new Promise<void>((resolve) => (idle = resolve));
      reader?.close();
    },
  };
}

async function outcome(path: string, pieceBytes?: number, helpers: () => PieceHelpers = lateHelper): Promise<Outcome> {
  try {
    const pieces = pieceBytes === undefined ? undefined : { helpers, pieceBytes };
    return { capture: (await readCaptureLines(path, {}, pieces)).capture };
  } catch (e) {
    if (!isBenchError(e)) throw e;
    return { code: e.code, line: e.line, message: e.message };
  }
}

/** The parts of a capture that must agree, with every sample compared by its bits. */
function comparable(o: Outcome): unknown {
  if (!('capture' in o)) return o;
  const { channels, ...rest } = o.capture;
  return {
    ...rest,
    channels: channels.map(({ samples, ...c }) => ({ ...c, bits: Buffer.from(samples.buffer, samples.byteOffset, samples.byteLength).toString('base64') })),
  };
}

interface Shape {
  rows: number;
  delimiter: ',' | ';' | '\t';
  crlf: boolean;
  trailing: boolean;
  decimals: number;
  jitter: boolean;
  /** A disturbance at a row fraction: a blank line, a comment, text, an empty field, a restart of time, a NaN word. */
  disturb: null | { kind: 'blank' | 'comment' | 'text' | 'empty' | 'restart' | 'nan' | 'backwards'; at: number };
  seed: number;
}

function csvOf(s: Shape): string {
  const mark = s.delimiter === ';' ? ',' : '.';
  const num = (v: number, d: number): string => v.toFixed(d).replace('.', mark);
  const out: string[] = [['time', 'ch1', 'ch2'].join(s.delimiter)];
  let state = s.seed;
  const rand = (): number => ((state = (state * 1103515245 + 12345) % 2 ** 31) / 2 ** 31);
  const at = s.disturb ? Math.floor(s.disturb.at * s.rows) : -1;
  for (let i = 0; i < s.rows; i++) {
    const t = (s.disturb?.kind === 'restart' && i >= at ? i - at : i) * 1e-5 + (s.jitter && i === Math.floor(s.rows / 3) ? 3e-6 : 0);
    const v1 = Math.sin(i / 37) * 5 + (rand() - 0.5) * 0.01;
    const v2 = i % 50 < 25 ? 5 : 0;
    let fields = [t.toExponential(6).replace('.', mark), num(v1, s.decimals), num(v2, 2)];
    if (i === at && s.disturb) {
      const k = s.disturb.kind;
      if (k === 'blank') out.push('');
      if (k === 'comment') out.push('# trigger re-armed');
      if (k === 'text') fields = ['oops', 'x', 'y'];
      if (k === 'empty') fields[1] = '';
      if (k === 'nan') fields[2] = 'NaN';
      if (k === 'backwards') fields[0] = (-1).toExponential(6).replace('.', mark);
    }
    out.push(fields.join(s.delimiter) + (s.trailing ? s.delimiter : ''));
  }
  return out.join(s.crlf ? '\r\n' : '\n') + (s.crlf ? '\r\n' : '\n');
}

const shape: fc.Arbitrary<Shape> = fc.record({
  rows: fc.integer({ min: 2000, max: 6000 }),
  delimiter: fc.constantFrom<Shape['delimiter']>(',', ';', '\t'),
  crlf: fc.boolean(),
  trailing: fc.boolean(),
  decimals: fc.integer({ min: 1, max: 7 }),
  jitter: fc.boolean(),
  disturb: fc.option(fc.record({ kind: fc.constantFrom('blank', 'comment', 'text', 'empty', 'restart', 'nan', 'backwards') as fc.Arbitrary<NonNullable<Shape['disturb']>['kind']>, at: fc.double({ min: 0.05, max: 0.99, noNaN: true }) }), { freq: 2 }),
  seed: fc.integer({ min: 1, max: 2 ** 30 }),
});

describe('readCapture in pieces', () => {
  it('gives the single-thread capture bit for bit, or the same error and line, over layouts and split points', async () => {
    let n = 0;
    await fc.assert(
      fc.asyncProperty(shape, fc.integer({ min: 64, max: 40_000 }), async (s, pieceBytes) => {
        const path = write(`pieces-${n++}.csv`, csvOf(s));
        const whole = await outcome(path);
        const pieces = await outcome(path, pieceBytes);
        expect(comparable(pieces)).toEqual(comparable(whole));
      }),
      { seed: 2112, numRuns: 20 },
    );
    // Most pieces were plain, and some were not (the disturbed rows): both paths ran.
    expect(seen.plain).toBeGreaterThan(seen.read / 2);
    expect(seen.plain).toBeLessThan(seen.read);
  });

  it('reads a plain file with every piece plain, and the last piece cut in the middle of a row', async () => {
    const s: Shape = { rows: 5000, delimiter: ',', crlf: false, trailing: false, decimals: 4, jitter: false, disturb: null, seed: 7 };
    const text = csvOf(s);
    const path = write('plain.csv', text.slice(0, -1)); // no line break after the last row
    const whole = await outcome(path);
    const before = { ...seen };
    expect(comparable(await outcome(path, 1000))).toEqual(comparable(whole));
    expect(seen.read - before.read).toBeGreaterThan(20);
    expect(seen.plain - before.plain).toBe(seen.read - before.read);
    // With no helper, this thread reads every piece: the same capture again.
    const alone = await readCaptureLines(path, {}, { helpers: noHelpers, pieceBytes: 1000 });
    expect(comparable({ capture: alone.capture })).toEqual(comparable(whole));
    expect('capture' in whole && whole.capture.channels[0].samples.length).toBe(5000);
  });

  // The worker script runs built (tests run from sources): this case needs `npm run build` first.
  const builtWorker = new URL('../../dist/capture/pieceWorker.js', import.meta.url);
  it.runIf(existsSync(fileURLToPath(builtWorker)))('gives the same capture with two real worker threads reading pieces', async () => {
    const s: Shape = { rows: 20_000, delimiter: ';', crlf: true, trailing: false, decimals: 5, jitter: true, disturb: { kind: 'comment', at: 0.9 }, seed: 11 };
    const path = write('workers.csv', csvOf(s));
    const whole = await outcome(path);
    const threaded = await readCaptureLines(path, {}, { helpers: () => startWorkerPool(2, builtWorker), pieceBytes: 16_384 });
    expect(comparable({ capture: threaded.capture })).toEqual(comparable(whole));
  });

  it.runIf(existsSync(fileURLToPath(builtWorker)))('reads file after file with worker threads lent by the caller, which live on after each read', async () => {
    const workers = [new Worker(builtWorker)];
    const exited: number[] = [];
    workers[0].on('exit', (code) => exited.push(code));
    try {
      for (const seed of [21, 22, 23]) {
        const s: Shape = { rows: 12_000, delimiter: ',', crlf: seed === 22, trailing: false, decimals: 4, jitter: true, disturb: seed === 23 ? { kind: 'text', at: 0.7 } : null, seed };
        const path = write(`lent-${seed}.csv`, csvOf(s));
        const whole = await outcome(path);
        const lent = await outcome(path, 8192, () => pieceHelpersOn(workers));
        expect(comparable(lent)).toEqual(comparable(whole));
        // The columns the pieces were written into are shared: the piece path was taken.
        if ('capture' in lent) expect(lent.capture.channels[0].samples.buffer).toBeInstanceOf(SharedArrayBuffer);
      }
      expect(exited).toEqual([]);
    } finally {
      await Promise.all(workers.map((w) => w.terminate()));
    }
  });

  it('reads a file below the helpers\' smallest size in one thread, without asking for the helpers', async () => {
    const s: Shape = { rows: 3000, delimiter: ',', crlf: false, trailing: false, decimals: 3, jitter: false, disturb: null, seed: 8 };
    const path = write('small.csv', csvOf(s));
    const whole = await outcome(path);
    const refuse = (): PieceHelpers => {
      throw new Error('helpers asked for a file below their smallest size');
    };
    const read = await readCaptureLines(path, {}, { helpers: refuse, pieceBytes: 1000, minBytes: 1 << 20 });
    expect(comparable({ capture: read.capture })).toEqual(comparable(whole));
    expect(read.capture.channels[0].samples.buffer).toBeInstanceOf(ArrayBuffer);
  });

  it('gives the same capture when a worker thread fails: its pieces are read by the main thread', async () => {
    const broken = new URL(`file://${write('broken-worker.mjs', "throw new Error('worker failed to start');\n")}`);
    const s: Shape = { rows: 4000, delimiter: ',', crlf: false, trailing: true, decimals: 3, jitter: false, disturb: null, seed: 5 };
    const path = write('broken.csv', csvOf(s));
    const whole = await outcome(path);
    const read = await readCaptureLines(path, {}, { helpers: () => startWorkerPool(2, broken), pieceBytes: 4096 });
    expect(comparable({ capture: read.capture })).toEqual(comparable(whole));
  });

  it('plans slots that hold the most rows a piece can have at the shortest row length', () => {
    const tasks = planPieces(100, 10_100, 4000, 10);
    expect(tasks.map((t) => [t.nominalStart, t.nominalEnd, t.slotStart, t.slotRows])).toEqual([
      [100, 4100, 0, 416],
      [4100, 8100, 416, 416],
      [8100, 10_100, 832, 216],
    ]);
  });
});
