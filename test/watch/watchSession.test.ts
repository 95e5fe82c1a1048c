/**
 * `watch` sessions on a real temporary folder (chokidar, real files), run in-process. Captures are
 * copies of the demo files (invented scenario, src/syntheticCaptures/scenario.ts): FK-0101 is built good,
 * FK-0103 has a charge/discharge current mismatch, FK-0104 a timing capacitor 6 % high.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync, readFileSync, writeFileSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { KESTREL_CONDITIONS, KESTREL_UNITS, synthesize, writeCsv } from '../../src/syntheticCaptures/index.js';
import { openStore } from '../../src/records/index.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { copySample, makeDrop, SAMPLES, startSession, waitFor, writeSlowly } from './helpers/session.js';

let root: string;
let drop: string;
beforeEach(() => {
  root = makeTempDir('benchproof-watch-');
  drop = makeDrop(root);
});
afterEach(() => removeTempDir(root));

function storedRuns(): { unit: string; condition: string; statement: string }[] {
  const store = openStore(join(root, 'data'), { mode: 'read' });
  try {
    return store.runs().map((r) => ({ unit: r.unit, condition: r.captures.map((c) => c.condition).join('+'), statement: r.statement }));
  } finally {
    store.close();
  }
}

describe('watch session', { timeout: 180_000 }, () => {
  it('checks and stores two captures that land together, one stdout line each with unit, condition, statement and first cause', async () => {
    const s = startSession(root);
    await s.ready;
    copySample('FK-0101_mid.csv', drop);
    copySample('FK-0103_mid.csv', drop);
    await waitFor(() => s.lines().length >= 2, 'two status lines', s.err);
    const tally = await s.stop();
    const lines = s.lines().sort();
    expect(lines).toHaveLength(2);
    // One condition of three each: both attempts wait, and causes wait for the rest to land.
    expect(lines[0]).toMatch(/^FK-0101_mid\.csv {2}FK-0101 {2}mid {2}PASS {2}\(FK-0101 1\/3, waiting for low, high; so far PASS; run 1 of attempt #1\)$/);
    expect(lines[1]).toMatch(/^FK-0103_mid\.csv {2}FK-0103 {2}mid {2}FAIL {2}\(FK-0103 1\/3, waiting for low, high; so far FAIL; run 1 of attempt #1\)$/);
    // The stored run is what `check FILE` stores: the other conditions are not measured in it.
    expect(storedRuns().sort((a, b) => a.unit.localeCompare(b.unit))).toEqual([
      { unit: 'FK-0101', condition: 'mid', statement: 'not-measured' },
      { unit: 'FK-0103', condition: 'mid', statement: 'fail' },
    ]);
    expect(tally.statements).toMatchObject({ pass: 1, fail: 1 });
    expect(s.err()).toMatch(/watch stopped: 2 file\(s\) checked \(1 PASS, 1 FAIL\); runs in /);
  });

  it('adds each landed file to the unit’s open attempt, so the attempt completes and passes once every condition is in', async () => {
    const s = startSession(root);
    await s.ready;
    for (const [i, condition] of ['low', 'mid', 'high'].entries()) {
      copySample(`FK-0101_${condition}.csv`, drop);
      await waitFor(() => s.lines().length >= i + 1, `status line ${i + 1}`, s.err);
    }
    await s.stop();
    // Runs hold the landed file plus the open attempt's captures: low; low+mid; low+mid+high.
    const runs = storedRuns();
    expect(runs.map((r) => r.condition.split('+').sort().join('+'))).toEqual(['low', 'low+mid', 'high+low+mid']);
    expect(runs.map((r) => r.statement)).toEqual(['not-measured', 'not-measured', 'pass']);
    expect(s.lines()[1]).toMatch(/\(FK-0101 2\/3, waiting for high; so far PASS; run 2 of attempt #1\)$/);
    expect(s.lines()[2]).toMatch(/^FK-0101_high\.csv {2}FK-0101 {2}high {2}PASS {2}\(FK-0101 3\/3: PASS; run 3 of attempt #1\)$/);
  });

  it('reads a file written in slow pieces once, after it has settled', async () => {
    const s = startSession(root, { settleMs: 1500 });
    await s.ready;
    const bytes = readFileSync(join(SAMPLES, 'FK-0104_low.csv'));
    await writeSlowly(join(drop, 'FK-0104_low.csv'), bytes, 10, 100);
    await waitFor(() => s.lines().length >= 1, 'the status line', s.err);
    // That the settle rule reports the file once and never again is tested on fake timers
    // (watchFolder.test.ts); here, that the session reads and stores it whole.
    await s.stop();
    expect(s.lines()).toHaveLength(1);
    expect(s.lines()[0]).toMatch(/^FK-0104_low\.csv {2}FK-0104 {2}low {2}FAIL {2}\(FK-0104 1\/3, waiting for mid, high; so far FAIL/);
    const store = openStore(join(root, 'data'), { mode: 'read' });
    try {
      const runs = store.runs();
      expect(runs).toHaveLength(1);
      expect(runs[0].captures[0].size).toBe(bytes.length);
    } finally {
      store.close();
    }
  });

  it('records a capture read in several pieces with the SHA-256 of the whole file (FIPS 180-4), as check does', async () => {
    // 56 000 rows, about 2.2 MB: more than two of the 1 MiB pieces the landed file is hashed and
    // archived in, so the pieces must join exactly (a 2.2 GB capture is the same code, more pieces).
    const unit = KESTREL_UNITS[0];
    const f = KESTREL_CONDITIONS[1].nominal * unit.frequencyScale;
    const common = { frequency: f, sampleRate: f * 1500, samples: 56_000, bits: 8, phase: 0.137 };
    const text = writeCsv([
      { name: 'CH1', unit: 'V', signal: synthesize({ ...common, shape: 'triangle', amplitude: 3, offset: 0.01, noise: 0.006, fullScale: 20, seed: 11 }) },
      { name: 'CH2', unit: 'V', signal: synthesize({ ...common, shape: 'pulse', amplitude: 5, duty: 0.5, edge: { tau: 1.5e-6 }, noise: 0.012, fullScale: 40, seed: 12 }) },
    ], { format: 'exponential', precision: 7 });
    const bytes = Buffer.from(text);
    expect(bytes.length).toBeGreaterThan(2 * 2 ** 20);
    const s = startSession(root);
    await s.ready;
    writeFileSync(join(drop, 'FK-0101_mid.csv'), bytes);
    await waitFor(() => s.lines().length >= 1, 'the status line', s.err);
    await s.stop();
    expect(s.lines()[0]).toMatch(/^FK-0101_mid\.csv {2}FK-0101 {2}mid {2}PASS/);
    const store = openStore(join(root, 'data'), { mode: 'read' });
    try {
      const [run] = store.runs();
      expect(run.captures[0].sha256).toBe(createHash('sha256').update(bytes).digest('hex'));
      expect(run.captures[0].size).toBe(bytes.length);
      expect(readFileSync(join(root, 'data', run.captures[0].archivePath)).equals(bytes)).toBe(true);
    } finally {
      store.close();
    }
  });

  it('gives an error line naming a corrupt file and goes on to check the next one', async () => {
    const s = startSession(root);
    await s.ready;
    writeFileSync(join(drop, 'FK-0102_mid.csv'), Buffer.from([0x47, 0x00, 0x01, 0x02, 0xff, 0x0a]));
    await waitFor(() => s.err().includes('FK-0102_mid.csv'), 'the error line', s.err);
    copySample('FK-0101_low.csv', drop);
    await waitFor(() => s.lines().length >= 1, 'the status line', s.err);
    const tally = await s.stop();
    expect(s.err()).toContain('benchproof: could not check FK-0102_mid.csv: this looks like a binary file, not text');
    expect(s.lines()).toEqual([expect.stringMatching(/^FK-0101_low\.csv {2}FK-0101 {2}low {2}PASS/)]);
    expect(tally.errors).toBe(1);
  });

  it('says which pattern a file name missed, and stores nothing for it', async () => {
    const s = startSession(root);
    await s.ready;
    copySample('FK-0101_mid.csv', drop, 'scope-01.csv');
    await waitFor(() => s.err().includes('scope-01.csv'), 'the skip line', s.err);
    await s.stop();
    expect(s.err()).toContain('benchproof: skipped scope-01.csv: the file name "scope-01.csv" does not match the capture pattern "{unit}_{condition}.csv" of samples/fh210-spec.yaml');
    expect(s.out()).toBe('');
  });

  it('does not record a capture twice across a restart, and checks it again once its bytes change', async () => {
    copySample('FK-0101_high.csv', drop);
    const first = startSession(root);
    await waitFor(() => first.lines().length >= 1, 'the first status line', first.err);
    await first.stop();
    const second = startSession(root);
    await waitFor(() => second.err().includes('already recorded'), 'the already-recorded line', second.err);
    expect(second.err()).toMatch(/benchproof: FK-0101_high\.csv: already recorded for FK-0101 at high \(run #1\); not stored again/);
    expect(storedRuns()).toHaveLength(1);
    // The scope overwrites the file with another capture under the same name: a new check.
    copySample('FK-0104_high.csv', drop, 'FK-0101_high.csv');
    await waitFor(() => second.lines().length >= 1, 'the status line for the new bytes', second.err);
    const tally = await second.stop();
    expect(second.lines()[0]).toMatch(/^FK-0101_high\.csv {2}FK-0101 {2}high {2}FAIL/);
    expect(tally.recordedAlready).toBe(1);
    expect(storedRuns()).toHaveLength(2);
  });

  it('leaves files already in the folder alone with newOnly, and checks a file that lands later', async () => {
    copySample('FK-0101_low.csv', drop);
    const s = startSession(root, { newOnly: true });
    await s.ready;
    copySample('FK-0101_mid.csv', drop);
    await waitFor(() => s.lines().length >= 1, 'the status line', s.err);
    await s.stop();
    expect(s.lines()).toEqual([expect.stringMatching(/^FK-0101_mid\.csv /)]);
    expect(s.err()).not.toContain('FK-0101_low.csv');
  });

  it('stores each capture once when two sessions watch the same folder with the same data folder', async () => {
    const a = startSession(root);
    const b = startSession(root);
    await Promise.all([a.ready, b.ready]);
    for (const c of ['low', 'mid', 'high']) copySample(`FK-0103_${c}.csv`, drop);
    const handled = (s: typeof a): number => s.lines().length + (s.err().match(/already recorded/g) ?? []).length;
    await waitFor(() => handled(a) >= 3 && handled(b) >= 3, 'both sessions to handle all three files', () => a.err() + b.err());
    await Promise.all([a.stop(), b.stop()]);
    expect(a.lines().length + b.lines().length).toBe(3);
    // One run per landed file (companions already recorded may ride along in later runs).
    const runs = storedRuns();
    expect(runs).toHaveLength(3);
    expect([...new Set(runs.flatMap((r) => r.condition.split('+')))].sort()).toEqual(['high', 'low', 'mid']);
  });

  it("refreshes the unit's HTML record in the report folder and prints NDJSON with --json", async () => {
    const s = startSession(root, { json: true, reportDir: join(root, 'drop') });
    await s.ready;
    copySample('FK-0104_mid.csv', drop);
    await waitFor(() => s.lines().length >= 1, 'the status line', s.err);
    await s.stop();
    const doc = JSON.parse(s.lines()[0]);
    expect(doc).toMatchObject({ schemaVersion: 1, event: 'checked', unit: 'FK-0104', condition: 'mid', statement: 'fail', words: 'FAIL', runStatement: 'fail' });
    expect(doc.cause.title).toBe('timing capacitor off its value');
    expect(existsSync(doc.record)).toBe(true);
    expect(readFileSync(doc.record, 'utf8')).toContain('FK-0104');
    const stderr = s.err().trim().split('\n').map((l) => JSON.parse(l));
    expect(stderr.map((e) => e.event)).toEqual(['watching', 'summary']);
  });
});
