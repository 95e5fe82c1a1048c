import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { join } from 'node:path';
import { openStore, summarizeBatch } from '../../src/records/index.js';
import type { StoredRun } from '../../src/types/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';
import { expectWithin } from '../helpers/expectWithin.js';

let root: string;
let runs: StoredRun[];
const SCALES: Record<string, number> = { 'FK-0101': 1.002, 'FK-0102': 0.997, 'FK-0103': 1.0, 'FK-0104': 1.004 };

beforeAll(() => {
  root = makeTempDir();
  const store = openStore(join(root, 'data'));
  const day = (d: number, h = 9): string => new Date(Date.UTC(2026, 2, d, h)).toISOString();
  store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: day(2), frequencyScale: SCALES['FK-0101'] }));
  store.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: day(2, 10), frequencyScale: SCALES['FK-0102'] }));
  store.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: day(3), riseFraction: 0.48 }));
  store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: day(3, 11), frequencyScale: 0.943 }));
  store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: day(5), frequencyScale: SCALES['FK-0104'] }));
  runs = store.runs();
  store.close();
});
afterAll(() => removeTempDir(root));

/** Textbook sample mean and n − 1 standard deviation, written out independently of the code under test. */
function meanSd(xs: number[]): [number, number] {
  const mean = xs.reduce((a, b) => a + b, 0) / xs.length;
  return [mean, Math.sqrt(xs.reduce((a, b) => a + (b - mean) ** 2, 0) / (xs.length - 1))];
}

describe('summarizeBatch', () => {
  it('counts first-pass yield from each unit’s first run and final yield from its latest', () => {
    const [spec] = summarizeBatch(runs).specs;
    expect(spec.units.map((u) => [u.unit, u.first, u.latest, u.runs])).toEqual([
      ['FK-0101', 'pass', 'pass', 1],
      ['FK-0102', 'pass', 'pass', 1],
      ['FK-0103', 'fail', 'fail', 1],
      ['FK-0104', 'fail', 'pass', 2],
    ]);
    expect(spec.firstPass).toEqual({ units: 4, accepted: 2, conditional: 0, fraction: 0.5 });
    expect(spec.final).toEqual({ units: 4, accepted: 3, conditional: 0, fraction: 0.75 });
    expect(spec.runs).toBe(5);
  });

  it('summarises each checked quantity with one value per unit, from its latest run', () => {
    const [spec] = summarizeBatch(runs).specs;
    const mid = spec.measurements.find((m) => m.condition === 'mid' && m.measurement === 'frequency')!;
    const values = Object.values(SCALES).map((s) => 261.63 * s);
    const [mean, sd] = meanSd(values);
    expect(mid.count).toBe(4);
    expect(mid.values.map((v) => v.unit)).toEqual(['FK-0101', 'FK-0102', 'FK-0103', 'FK-0104']);
    expectWithin(mid.mean, mean, { rel: 1e-12 }, 'sample mean (closed form)');
    expectWithin(mid.sd, sd, { rel: 1e-9 }, 'sample standard deviation, n − 1 (closed form)');
    expectWithin(mid.min, Math.min(...values), { abs: 0 }, 'smallest value');
    expectWithin(mid.max, Math.max(...values), { abs: 0 }, 'largest value');
    // Limits 261.63 ± 2 %: Cp = (USL − LSL)/6s, Cpk = min(USL − x̄, x̄ − LSL)/3s (NIST/SEMATECH §6.1.6).
    const [lsl, usl] = [261.63 * 0.98, 261.63 * 1.02];
    expectWithin(mid.cp, (usl - lsl) / (6 * sd), { rel: 1e-9 }, 'NIST/SEMATECH e-Handbook §6.1.6 Cp formula');
    expectWithin(mid.cpk, Math.min(usl - mean, mean - lsl) / (3 * sd), { rel: 1e-9 }, 'NIST/SEMATECH e-Handbook §6.1.6 Cpk formula');
    expect(mid.remarks).toContainEqual({ kind: 'few-units', units: 4 });
  });

  it('leaves out units first tested before --since, even when re-tested after it', () => {
    const [spec] = summarizeBatch(runs, { since: '2026-03-03T00:00:00Z' }).specs;
    expect(spec.units.map((u) => u.unit)).toEqual(['FK-0103', 'FK-0104']);
    expect(summarizeBatch(runs, { since: '2026-04-01' }).specs).toEqual([]);
  });

  it('gives no spec section for a spec name with no runs', () => {
    expect(summarizeBatch(runs, { spec: 'FH-300 Merlin LFO' }).specs).toEqual([]);
    expect(summarizeBatch(runs, { spec: 'FH-210 Kestrel VCO' }).specs).toHaveLength(1);
  });

  it('withholds the spread with a reason when all units read the same', () => {
    const [spec] = summarizeBatch(runs).specs;
    const ptp = spec.measurements.find((m) => m.condition === 'low' && m.measurement === 'peakToPeak')!;
    expect([ptp.sd, ptp.cp, ptp.cpk]).toEqual([0, null, null]);
    expect(ptp.remarks).toContainEqual({ kind: 'no-spread' });
  });
});
