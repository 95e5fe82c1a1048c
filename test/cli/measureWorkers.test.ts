/**
 * `measure` on worker threads (src/cli/measureWorkers.ts): the channels shared out between this
 * thread and a worker give the report measureCapture gives in one thread, value for value and in the
 * same order; the reference is the single-thread path itself, an independent run of the same pure
 * functions (common practice, no source). The worker script runs built (tests run from sources):
 * the cases with a real worker need `npm run build` first.
 */
import { describe, expect, it } from 'vitest';
import { existsSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { measureCapture } from '../../src/analysis/index.js';
import { MeasureWorkers } from '../../src/cli/measureWorkers.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { captureOf } from '../analysis/captureOf.js';
import { tempFolder } from '../helpers/tempFolders.js';

// Demo scenario (ours): FH-210 Kestrel VCO at `mid`, its triangle and pulse, a hum-laden sine and a dead probe.
const kestrel = { frequency: 261.63, sampleRate: 100_000, samples: 20_000, phase: 0.1 } as const;
const capture = captureOf([
  synthesize({ ...kestrel, shape: 'triangle', amplitude: 3, noise: 0.004, seed: 31 }),
  synthesize({ ...kestrel, shape: 'pulse', amplitude: 5, edge: { tau: 1e-6 }, noise: 0.004, seed: 32 }),
  synthesize({ ...kestrel, shape: 'sine', amplitude: 1, noise: 0.002, seed: 33 }),
  synthesize({ ...kestrel, shape: 'sine', amplitude: 0, noise: 0.001, seed: 34 }),
]);

const folder = tempFolder('benchproof-measure-workers-');

const builtWorker = new URL('../../dist/cli/measureWorker.js', import.meta.url);

describe('measure on worker threads', () => {
  it.runIf(existsSync(fileURLToPath(builtWorker)))('gives the single-thread report, channel for channel and in file order, with a worker thread measuring some channels', async () => {
    const alone = measureCapture(capture, { plotData: true });
    const workers = new MeasureWorkers(1, builtWorker);
    try {
      const shared = await workers.measure(capture, { plotData: true }, measureCapture);
      expect(shared.channels.map((c) => c.name)).toEqual(['ch1', 'ch2', 'ch3', 'ch4']);
      // Plain data either way: the JSON a user gets is the same text.
      expect(JSON.stringify(shared)).toBe(JSON.stringify(alone));
      expect(workers.helped).toBeGreaterThan(0);
      // A second capture on the same workers (measure takes file after file).
      const again = await workers.measure(capture, {}, measureCapture);
      expect(JSON.stringify(again)).toBe(JSON.stringify(measureCapture(capture)));
    } finally {
      await workers.close();
    }
  });

  it('gives the single-thread report when the worker thread fails: its channels are measured by this thread', async () => {
    const script = join(folder, 'broken-worker.mjs');
    writeFileSync(script, "throw new Error('worker failed to start');\n");
    const workers = new MeasureWorkers(1, pathToFileURL(script));
    try {
      const shared = await workers.measure(capture, {}, measureCapture);
      expect(JSON.stringify(shared)).toBe(JSON.stringify(measureCapture(capture)));
      expect(workers.helped).toBe(0);
    } finally {
      await workers.close();
    }
  });

  it('measures a one-channel capture in this thread alone', async () => {
    const script = join(folder, 'unused-worker.mjs');
    writeFileSync(script, "throw new Error('a one-channel capture needs no worker');\n");
    const workers = new MeasureWorkers(1, pathToFileURL(script));
    const one = { ...capture, channels: [capture.channels[0]] };
    try {
      expect(JSON.stringify(await workers.measure(one, {}, measureCapture))).toBe(JSON.stringify(measureCapture(one)));
    } finally {
      await workers.close();
    }
  });
});
