import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { existsSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { openStore } from '../../src/records/index.js';
import { kestrelRun } from '../records/fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from '../records/helpers/tempData.js';
import { calibrationIteration } from './calibrationIterations.js';

let root: string;
let dir: string;
beforeEach(() => {
  root = makeTempDir();
  dir = join(root, 'benchproof-data');
});
afterEach(() => removeTempDir(root));

// Demo values (invented): a first capture set 1.3 % low in scale and 100 cents flat, then one on the law.
const before = (unit = 'FK-0104', at = '2026-03-03T10:00:00.000Z') => calibrationIteration(unit, at, 0.987, -100.9, 'as found');
const after = (unit = 'FK-0104', at = '2026-03-03T10:20:00.000Z') => calibrationIteration(unit, at, 1, 0.4, 'after trims');

describe('calibration records', () => {
  it('saveCalibration keeps the iterations of one run in order and reads them back field for field', () => {
    const store = openStore(dir);
    const first = store.saveCalibration(before());
    const second = store.saveCalibration(after());
    store.close();
    expect([first.startedRun, second.startedRun]).toEqual([true, false]);
    expect(second.calibrationId).toBe(first.calibrationId);

    const again = openStore(dir, { mode: 'read' });
    const runs = again.calibrations('FK-0104');
    again.close();
    expect(runs).toHaveLength(1);
    expect(runs[0].complete).toBe(true);
    expect(runs[0].iterations.map((i) => i.number)).toEqual([1, 2]);
    expect(runs[0].iterations[0].result).toEqual(before().result);
    expect(runs[0].iterations[1].result).toEqual(after().result);
    expect(runs[0].iterations.every((i) => i.intact)).toBe(true);
    expect(runs[0].iterations[0].captures.map((c) => c.condition)).toEqual(['0', '1', '2', '3', '4', '5']);
    for (const c of runs[0].iterations[1].captures) expect(existsSync(join(dir, c.archivePath))).toBe(true);
  });

  it('saveCalibration starts a new run after one met its limits, on --new-run, and when the spec text changed', () => {
    const store = openStore(dir);
    store.saveCalibration(before());
    store.saveCalibration(after());
    expect(store.saveCalibration(before('FK-0104', '2026-03-04T09:00:00.000Z')).startedRun).toBe(true);
    expect(store.saveCalibration({ ...before('FK-0104', '2026-03-04T09:10:00.000Z'), newRun: true }).startedRun).toBe(true);
    const changed = before('FK-0104', '2026-03-04T09:20:00.000Z');
    const otherSpec = { ...changed, spec: { name: changed.spec.name, revision: 'D', sha256: 'a'.repeat(64) } };
    expect(store.saveCalibration(otherSpec).startedRun).toBe(true);
    expect(store.calibrations('FK-0104').map((r) => r.iterations.length)).toEqual([2, 1, 1, 1]);
    store.close();
  });

  it('unitRecord shows a unit that was only calibrated, with no check runs and status not measured', () => {
    const store = openStore(dir);
    store.saveCalibration(before('FK-0110'));
    const rec = store.unitRecord('FK-0110');
    expect(store.unitSerials()).toContain('FK-0110');
    store.close();
    expect(rec?.runs).toEqual([]);
    expect(rec?.status).toBe('not-measured');
    expect(rec?.calibrations?.[0].iterations).toHaveLength(1);
  });

  it('unitRecord carries the calibration runs next to the check runs of the same unit', () => {
    const store = openStore(dir);
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-03T11:00:00.000Z' }));
    store.saveCalibration(before());
    const rec = store.unitRecord('FK-0104');
    store.close();
    expect(rec?.runs).toHaveLength(1);
    expect(rec?.calibrations).toHaveLength(1);
  });

  it('a stored iteration cannot be changed through SQL, and one changed behind the triggers reads as not intact', () => {
    const store = openStore(dir);
    store.saveCalibration(before());
    store.close();
    const db = new Database(join(dir, 'records.db'));
    expect(() => db.prepare("UPDATE calibration_iterations SET statement = 'pass'").run()).toThrow(/append-only/);
    expect(() => db.prepare('DELETE FROM calibration_runs').run()).toThrow(/append-only/);
    db.exec('DROP TRIGGER calibration_iterations_no_update');
    db.prepare("UPDATE calibration_iterations SET result_json = replace(result_json, '\"as found\"', '\"as left\"')").run();
    db.close();
    // Read by default, the changed store is refused; asked to read anyway, the iteration is marked.
    const refused = openStore(dir, { mode: 'read' });
    expect(() => refused.calibrations('FK-0104')).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    refused.close();
    const again = openStore(dir, { mode: 'read', unverified: 'mark' });
    expect(again.calibrations('FK-0104')[0].iterations[0].intact).toBe(false);
    again.close();
  });

  it('saveCalibration refuses an iteration whose result names another unit', () => {
    const store = openStore(dir);
    expect(() => store.saveCalibration({ ...before(), unit: 'FK-0199' })).toThrow(RangeError);
    store.close();
  });
});
