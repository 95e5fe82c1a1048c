import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import Database from 'better-sqlite3';
import { LATEST_SCHEMA, MIGRATIONS, openStore, runDigest } from '../../src/records/index.js';
import type { BenchError } from '../../src/types/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

let root: string;
let dir: string;
beforeEach(() => {
  root = makeTempDir();
  dir = join(root, 'benchproof-data');
});
afterEach(() => removeTempDir(root));

/** What a benchproof with schema 1 wrote: rows by hand, no measurements table, captures archived. */
function writeSchema1Run(dbFile: string, run: ReturnType<typeof kestrelRun>): void {
  const db = new Database(dbFile);
  const captures = run.captures.map((c) => ({ ...c, archivePath: `captures/${c.sha256.slice(0, 2)}/${c.sha256}.csv` }));
  for (const c of captures) {
    mkdirSync(join(dirname(dbFile), 'captures', c.sha256.slice(0, 2)), { recursive: true });
    writeFileSync(join(dirname(dbFile), c.archivePath), c.bytes!);
  }
  const digest = runDigest({ ...run, kind: 'check', spec: { name: run.spec.name, revision: run.spec.revision, sha256: run.spec.sha256 }, captures });
  db.prepare('INSERT INTO specs (sha256, name, revision, text) VALUES (?, ?, ?, NULL)').run(run.spec.sha256, run.spec.name, run.spec.revision);
  const id = db
    .prepare(`INSERT INTO runs (unit, started_at, stored_at, operator, station, spec_name, spec_revision, spec_sha256, tool_version,
      decision_rule, statement, verdict_json, diagnosis_json, digest) VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`)
    .run(run.unit, run.startedAt, run.startedAt, run.operator, run.station, run.spec.name, run.spec.revision, run.spec.sha256,
      run.toolVersion, run.verdict.decisionRule, run.verdict.statement, JSON.stringify(run.verdict), JSON.stringify(run.diagnosis), digest)
    .lastInsertRowid;
  captures.forEach((c, i) => {
    db.prepare('INSERT OR IGNORE INTO blobs (sha256, size, file, first_stored_at) VALUES (?, ?, ?, ?)').run(c.sha256, c.size, c.archivePath, run.startedAt);
    db.prepare('INSERT INTO run_captures VALUES (?, ?, ?, ?, ?, ?, ?)').run(id, i, c.sha256, c.path, c.size, c.layout, c.condition);
  });
  db.close();
}

describe('schema migrations', () => {
  it('brings a schema-1 store up to the latest on open, filling every measured value of the old runs', () => {
    openStore(dir, { schemaVersion: 1 }).close();
    const old = kestrelRun({ unit: 'FK-0106', startedAt: '2025-11-20T14:00:00.000Z', frequencyScale: 0.94 });
    writeSchema1Run(join(dir, 'records.db'), old);

    const store = openStore(dir);
    expect(store.schemaVersion).toBe(LATEST_SCHEMA);
    const rec = store.unitRecord('FK-0106')!;
    expect(rec.runs[0].verdict).toEqual(old.verdict);
    expect(rec.runs[0].intact).toBe(true);
    store.saveRun(kestrelRun({ unit: 'FK-0106', startedAt: '2026-03-02T09:00:00.000Z' }));
    expect(store.unitRecord('FK-0106')!.runs.map((r) => r.statement)).toEqual(['fail', 'pass']);
    store.close();

    const db = new Database(join(dir, 'records.db'), { readonly: true });
    expect(db.pragma('user_version', { simple: true })).toBe(LATEST_SCHEMA);
    expect(db.prepare('SELECT version FROM schema_migrations ORDER BY version').all()).toEqual(MIGRATIONS.map((m) => ({ version: m.version })));
    // 3 captures × (4 triangle + 3 pulse measurements + 1 withheld THD) per run, for the migrated run and the new one.
    expect(db.prepare('SELECT run_id, COUNT(*) AS n FROM measurements GROUP BY run_id ORDER BY run_id').all()).toEqual([
      { run_id: 1, n: 24 },
      { run_id: 2, n: 24 },
    ]);
    const withheld = db.prepare("SELECT value, reason FROM measurements WHERE run_id = 1 AND measurement = 'thd' LIMIT 1").get();
    expect(withheld).toEqual({ value: null, reason: 'not-applicable' });
    db.close();
  });

  it('applies each migration exactly once when the store is opened again', () => {
    openStore(dir).close();
    openStore(dir).close();
    const db = new Database(join(dir, 'records.db'), { readonly: true });
    expect(db.prepare('SELECT COUNT(*) AS n FROM schema_migrations').get()).toEqual({ n: LATEST_SCHEMA });
    db.close();
  });

  it('refuses a store written by a newer benchproof and leaves it untouched', () => {
    openStore(dir).close();
    const db = new Database(join(dir, 'records.db'));
    db.pragma('user_version = 99');
    db.close();
    let caught: BenchError | undefined;
    try {
      openStore(dir);
    } catch (err) {
      caught = err as BenchError;
    }
    expect(caught?.code).toBe('records.newer-schema');
    const after = new Database(join(dir, 'records.db'), { readonly: true });
    expect(after.pragma('user_version', { simple: true })).toBe(99);
    after.close();
  });
});
