import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { existsSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { openStore } from '../../src/records/index.js';
import { BenchError } from '../../src/types/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';
import { expectWithin } from '../helpers/expectWithin.js';

let dir: string;
beforeEach(() => {
  dir = join(makeTempDir(), 'benchproof-data');
});
afterEach(() => removeTempDir(join(dir, '..')));

const sha = (b: Uint8Array): string => createHash('sha256').update(b).digest('hex');

describe('record store', () => {
  it('saveRun then unitRecord gives back the same run, field for field, when stored and read in two sessions', () => {
    const run = kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' });
    const store = openStore(dir);
    const saved = store.saveRun(run);
    store.close();
    const again = openStore(dir, { mode: 'read' });
    const rec = again.unitRecord('FK-0101');
    again.close();
    expect(rec?.runs).toHaveLength(1);
    const back = rec!.runs[0];
    expect(back).toEqual(saved);
    expect(back.verdict).toEqual(run.verdict);
    expect(back.diagnosis).toEqual(run.diagnosis);
    expect(back.intact).toBe(true);
    expect(back.spec).toEqual({ name: run.spec.name, revision: 'C', sha256: run.spec.sha256 });
    expect([back.operator, back.station, back.toolVersion, back.startedAt]).toEqual(['R. Okafor', 'bench-2', '0.1.0', run.startedAt]);
    const mid = back.verdict.conditions[1].checks[0];
    expectWithin(mid.value, run.verdict.conditions[1].checks[0].value!, { abs: 0 }, 'exact JSON round trip of a double (ECMA-262 Number::toString)');
    expect(back.captures.map((c) => c.sha256)).toEqual(run.captures.map((c) => c.sha256));
  });

  it('saveRun archives each capture once under its SHA-256, read-only, byte for byte, and leaves the user file alone', () => {
    const run = kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T10:00:00.000Z' });
    const userFile = join(dir, '..', run.files[0].name);
    writeFileSync(userFile, run.files[0].bytes);
    const before = statSync(userFile);
    const store = openStore(dir);
    const fromPath = { ...run, captures: run.captures.map((c, i) => (i === 0 ? { ...c, bytes: undefined, sourcePath: userFile } : c)) };
    const first = store.saveRun(fromPath);
    store.saveRun({ ...run, startedAt: '2026-03-03T10:00:00.000Z' });
    const blobs = new Database(join(dir, 'records.db'), { readonly: true }).prepare('SELECT COUNT(*) AS n FROM blobs').get() as { n: number };
    store.close();
    expect(blobs.n).toBe(3);
    for (const c of first.captures) {
      const archived = join(dir, c.archivePath);
      expect(c.archivePath).toBe(`captures/${c.sha256.slice(0, 2)}/${c.sha256}.csv`);
      expect(sha(readFileSync(archived))).toBe(c.sha256);
      expect(statSync(archived).mode & 0o777).toBe(0o444);
    }
    const after = statSync(userFile);
    expect([after.mtimeMs, after.size, sha(readFileSync(userFile))]).toEqual([before.mtimeMs, before.size, run.captures[0].sha256]);
  });

  it('keeps every run of a re-tested unit and lets the latest decide its status', () => {
    const store = openStore(dir);
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-02T11:00:00.000Z', frequencyScale: 0.943 }));
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-05T08:30:00.000Z' }));
    // Stored later but started earlier (a late upload) must not decide the status.
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-01T08:30:00.000Z', frequencyScale: 0.943 }));
    const rec = store.unitRecord('FK-0104')!;
    const units = store.listUnits();
    store.close();
    expect(rec.runs.map((r) => r.statement)).toEqual(['fail', 'fail', 'pass']);
    expect(rec.status).toBe('pass');
    expect(units).toEqual([
      expect.objectContaining({ unit: 'FK-0104', status: 'pass', firstStatement: 'fail', runs: 3, lastTestedAt: '2026-03-05T08:30:00.000Z' }),
    ]);
  });

  it('refuses to change or remove a stored run through SQL, and flags a run altered behind its back', () => {
    const store = openStore(dir);
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    store.close();
    const db = new Database(join(dir, 'records.db'));
    expect(() => db.prepare("UPDATE runs SET statement = 'pass' WHERE id = ?").run(saved.id)).toThrow(/append-only/);
    expect(() => db.prepare('DELETE FROM checks WHERE run_id = ?').run(saved.id)).toThrow(/append-only/);
    db.exec('DROP TRIGGER runs_no_update');
    db.prepare("UPDATE runs SET operator = 'someone else' WHERE id = ?").run(saved.id);
    db.close();
    // By default every read of a store that fails verification is refused, naming the run.
    const strict = openStore(dir, { mode: 'read' });
    expect(() => strict.unitRecord('FK-0101')).toThrow(/run #1 of FK-0101: its content no longer matches/);
    expect(() => strict.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    strict.close();
    const again = openStore(dir, { mode: 'read', unverified: 'mark' });
    expect(again.unitRecord('FK-0101')!.runs[0].intact).toBe(false);
    again.close();
  });

  it('refuses a capture whose bytes changed since it was measured, storing nothing', () => {
    const run = kestrelRun({ unit: 'FK-0103', startedAt: '2026-03-02T12:00:00.000Z', riseFraction: 0.48 });
    const tampered = { ...run, captures: [{ ...run.captures[0], bytes: Buffer.from('time,v\n0,1\n') }] };
    const store = openStore(dir);
    expect(() => store.saveRun(tampered)).toThrow(BenchError);
    expect(store.listUnits()).toEqual([]);
    store.close();
  });

  it('applies WAL journaling and reports a sound database after several runs', () => {
    const store = openStore(dir);
    for (const u of ['FK-0101', 'FK-0102', 'FK-0103']) store.saveRun(kestrelRun({ unit: u, startedAt: '2026-03-02T12:00:00.000Z' }));
    expect(store.integrityCheck()).toEqual(['ok']);
    store.close();
    const db = new Database(join(dir, 'records.db'), { readonly: true });
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.prepare('SELECT COUNT(*) AS n FROM measurements').get()).toEqual({ n: 3 * 3 * 8 });
    db.close();
    expect(existsSync(join(dir, 'tmp'))).toBe(true);
  });
});
