/**
 * A store written by the release before test attempts (commit c320a2a, schema 3) opens, migrates and
 * reads as attempts without losing a run. The fixture `store-c320a2a.records.db.gz` was made by that
 * release's own command line on the shipped samples (records.db only, vacuumed; the capture archive
 * is left out, as nothing here reads it):
 *
 *   check FK-0101_{low,mid,high}.csv            → run 1  PASS
 *   check FK-0106_{low,mid,high}.csv            → run 2  FAIL
 *   check FK-0103_low.csv, _mid.csv, _high.csv  → runs 3, 4, 5 (one file each)
 *   check FK-0102_mid.csv                       → run 6  NOT MEASURED
 *   check FK-0106_{low,mid,high}.csv            → run 7  FAIL
 *   calibrate FK-0104 before/, then after/      → calibration run 1, iterations 1 and 2
 *
 * The archive is rebuilt from the shipped samples themselves (the archived copies are those bytes,
 * under their SHA-256), so the store's own audit finds every capture it names.
 *
 * Expected counts and statements are what that release's own `units` printed for the store:
 * FK-0101 PASS 1 run, FK-0102 NOT MEASURED 1 run, FK-0103 FAIL 3 runs, FK-0106 FAIL 2 runs.
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { gunzipSync } from 'node:zlib';
import { fileURLToPath } from 'node:url';
import Database from 'better-sqlite3';
import { LATEST_SCHEMA, openStore, summarizeBatch } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { runCli } from '../helpers/cliHarness.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

const FIXTURE = fileURLToPath(new URL('./fixtures/store-c320a2a.records.db.gz', import.meta.url));
const SAMPLES = fileURLToPath(new URL('../../samples/', import.meta.url));

/** The content-addressed archive of every shipped sample capture, as the store lays it out (archive.ts). */
function rebuildArchive(dataDir: string): void {
  for (const folder of ['captures', 'calibration/before', 'calibration/after']) {
    for (const name of readdirSync(join(SAMPLES, folder)).filter((n) => n.endsWith('.csv'))) {
      const bytes = readFileSync(join(SAMPLES, folder, name));
      const sha = createHash('sha256').update(bytes).digest('hex');
      mkdirSync(join(dataDir, 'captures', sha.slice(0, 2)), { recursive: true });
      writeFileSync(join(dataDir, 'captures', sha.slice(0, 2), `${sha}.csv`), bytes);
    }
  }
}

let root: string;
let dir: string;
beforeEach(() => {
  root = makeTempDir();
  dir = join(root, 'benchproof-data');
  mkdirSync(dir);
  writeFileSync(join(dir, 'records.db'), gunzipSync(readFileSync(FIXTURE)));
  rebuildArchive(dir);
});
afterEach(() => removeTempDir(root));

describe('a store written by the release before attempts', () => {
  it('opens at schema 3 and migrates to the latest schema with every run and iteration still there and intact', () => {
    const before = new Database(join(dir, 'records.db'), { readonly: true });
    expect(before.pragma('user_version', { simple: true })).toBe(3);
    before.close();

    const store = openStore(dir);
    try {
      expect(store.schemaVersion).toBe(LATEST_SCHEMA);
      const runs = store.runs();
      expect(runs.map((r) => r.id)).toEqual([1, 2, 3, 4, 5, 6, 7]);
      expect(runs.every((r) => r.intact)).toBe(true);
      expect(runs.map((r) => [r.unit, r.statement])).toEqual([
        ['FK-0101', 'pass'],
        ['FK-0106', 'fail'],
        ['FK-0103', 'fail'],
        ['FK-0103', 'fail'],
        ['FK-0103', 'fail'],
        ['FK-0102', 'not-measured'],
        ['FK-0106', 'fail'],
      ]);
      expect(store.calibrations('FK-0104')[0].iterations.map((i) => i.number)).toEqual([1, 2]);
    } finally {
      store.close();
    }
  });

  it('reads each old run as part of an attempt: complete sets are one attempt each, single files wait for the rest', () => {
    const store = openStore(dir);
    try {
      const units = Object.fromEntries(store.listUnits().map((u) => [u.unit, u]));
      expect(units['FK-0101']).toMatchObject({ state: 'complete', attempts: 1, firstComplete: 'pass', latestComplete: 'pass', runs: 1 });
      expect(units['FK-0106']).toMatchObject({ state: 'complete', attempts: 2, firstComplete: 'fail', latestComplete: 'fail', runs: 2 });
      // Three separate one-file checks were never checked together: one attempt, still waiting.
      expect(units['FK-0103']).toMatchObject({ state: 'incomplete', attempts: 1, waitingFor: ['low', 'mid'], runs: 3 });
      expect(units['FK-0102']).toMatchObject({ state: 'incomplete', attempts: 1, waitingFor: ['low', 'high'] });
      expect(units['FK-0102'].firstComplete).toBeUndefined();

      const rec = store.unitRecord('FK-0106')!;
      expect(rec.runs.map((r) => [r.id, r.number, r.attempt])).toEqual([
        [2, 1, 1],
        [7, 2, 2],
      ]);
      expect(rec.attempts!.map((a) => [a.number, a.reason, a.state, a.closed])).toEqual([
        [1, 'first', 'complete', true],
        [2, 'after-complete', 'complete', true],
      ]);
    } finally {
      store.close();
    }
  });

  it('counts first-pass and final yield over complete attempts and lists the waiting units apart', () => {
    const store = openStore(dir);
    try {
      const [spec] = summarizeBatch(store.runs()).specs;
      // FK-0101 passed, FK-0106 failed twice; FK-0102 and FK-0103 never completed an attempt.
      expect(spec.firstPass).toMatchObject({ units: 2, accepted: 1, fraction: 0.5 });
      expect(spec.final).toMatchObject({ units: 2, accepted: 1, fraction: 0.5 });
      expect(spec.incomplete).toEqual([
        { unit: 'FK-0102', waitingFor: ['low', 'high'] },
        { unit: 'FK-0103', waitingFor: ['low', 'mid'] },
      ]);
    } finally {
      store.close();
    }
  });

  it('completes an attempt the old release left waiting when the missing conditions are checked now, from the archived capture', async () => {
    const r = await runCli(['check', 'samples/captures/FK-0102_low.csv', 'samples/captures/FK-0102_high.csv', '--spec', 'samples/fh210-spec.yaml', '--data', dir, '--summary']);
    expect(r.code).toBe(0);
    expect(r.stderr).toContain('FK-0102: checked together with FK-0102_mid.csv from its open attempt #1');
    expect(r.stderr).toContain('stored run 2 of FK-0102, attempt #1 (PASS)');
    const store = openStore(dir);
    try {
      const [spec] = summarizeBatch(store.runs()).specs;
      // FK-0101 and now FK-0102 passed their first complete attempt, FK-0106 failed: 2 of 3.
      expect(spec.firstPass).toMatchObject({ units: 3, accepted: 2 });
      expect(spec.incomplete).toEqual([{ unit: 'FK-0103', waitingFor: ['low', 'mid'] }]);
    } finally {
      store.close();
    }
  });

  it('stores a new run after the migration in the next attempt, numbered per unit, with its note covered by the fingerprint', () => {
    const store = openStore(dir);
    try {
      const run = kestrelRun({ unit: 'FK-0106', startedAt: '2026-12-06T09:00:00.000Z' });
      const saved = store.saveRun({ ...run, note: 'C3 replaced with a 4.7 nF C0G part' });
      expect(saved).toMatchObject({ attempt: 3, attemptReason: 'note', note: 'C3 replaced with a 4.7 nF C0G part' });
      const rec = store.unitRecord('FK-0106')!;
      expect(rec.runs.map((r) => r.number)).toEqual([1, 2, 3]);
      expect(rec.runs[2]).toMatchObject({ id: 8, attempt: 3, intact: true });
      expect(rec.attempts!.at(-1)).toMatchObject({ number: 3, notes: ['C3 replaced with a 4.7 nF C0G part'], statement: 'pass' });
    } finally {
      store.close();
    }
  });
});
