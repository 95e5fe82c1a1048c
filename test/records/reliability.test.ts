/**
 * Reliability of the store with real separate processes: two writers at once, and a writer killed
 * with SIGKILL in the middle of a run. SQLite's guarantees under test: WAL mode with a busy timeout
 * serialises writers (sqlite.org/wal.html, "Concurrency"); an uncommitted transaction is rolled back
 * on the next open (sqlite.org/atomiccommit.html, "Hot Rollback Journals" / WAL recovery).
 */
import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import Database from 'better-sqlite3';
import { openStore } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { exited, printed, spawnWriter, writeSpan } from './helpers/children.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';

let root: string;
let dir: string;
beforeEach(() => {
  root = makeTempDir();
  dir = join(root, 'benchproof-data');
});
afterEach(() => removeTempDir(root));

/** Every stored run is whole: its rows agree with its verdict, and its archived captures hash to their names. */
function expectOnlyWholeRuns(dataDir: string): number {
  const db = new Database(join(dataDir, 'records.db'), { readonly: true });
  try {
    expect(db.pragma('integrity_check', { simple: true })).toBe('ok');
    expect(db.pragma('foreign_key_check')).toEqual([]);
    const runs = db.prepare('SELECT id, verdict_json FROM runs').all() as { id: number; verdict_json: string }[];
    for (const run of runs) {
      const verdict = JSON.parse(run.verdict_json) as { conditions: { checks: unknown[] }[] };
      const checks = db.prepare('SELECT COUNT(*) AS n FROM checks WHERE run_id = ?').get(run.id) as { n: number };
      const captures = db.prepare('SELECT COUNT(*) AS n FROM run_captures WHERE run_id = ?').get(run.id) as { n: number };
      expect(checks.n).toBe(verdict.conditions.reduce((s, c) => s + c.checks.length, 0));
      expect(captures.n).toBe(3);
    }
    for (const table of ['checks', 'condition_results', 'causes', 'run_captures', 'measurements']) {
      const orphans = db.prepare(`SELECT COUNT(*) AS n FROM ${table} WHERE run_id NOT IN (SELECT id FROM runs)`).get() as { n: number };
      expect(orphans.n, `rows in ${table} without their run`).toBe(0);
    }
    const blobs = db.prepare('SELECT sha256, file FROM blobs').all() as { sha256: string; file: string }[];
    for (const b of blobs) expect(createHash('sha256').update(readFileSync(join(dataDir, b.file))).digest('hex')).toBe(b.sha256);
    return runs.length;
  } finally {
    db.close();
  }
}

describe('record store with several processes', () => {
  it('stores every run when two processes create the data folder and write at the same time', async () => {
    // Both wait for each other before opening and again before writing (see writer.ts).
    const barrier = join(root, 'barrier');
    mkdirSync(barrier);
    const a = spawnWriter(dir, 'FK-A', 20, 'loop', barrier);
    const b = spawnWriter(dir, 'FK-B', 20, 'loop', barrier);
    const [ea, eb] = await Promise.all([exited(a), exited(b)]);
    expect(ea, ea.stderr).toMatchObject({ code: 0 });
    expect(eb, eb.stderr).toMatchObject({ code: 0 });
    // The two writers' spans of activity overlap: each tried to write while the other was writing.
    const [a0, a1] = writeSpan(ea.stdout);
    const [b0, b1] = writeSpan(eb.stdout);
    expect(Math.max(a0, b0), `A ${a0}…${a1}, B ${b0}…${b1}`).toBeLessThan(Math.min(a1, b1));
    expect(expectOnlyWholeRuns(dir)).toBe(40);
    const store = openStore(dir, { mode: 'read' });
    expect(store.unitSerials().filter((u) => u.startsWith('FK-A'))).toHaveLength(20);
    expect(store.runs().every((r) => r.intact)).toBe(true);
    store.close();
  });

  it('leaves no trace of a run whose process is killed inside the write transaction', async () => {
    const store = openStore(dir);
    store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:00:00.000Z' }));
    store.close();
    const child = spawnWriter(dir, 'FK-KILL', 1, 'hang');
    const done = exited(child);
    await printed(child, /^in-transaction$/);
    child.kill('SIGKILL');
    expect((await done).signal).toBe('SIGKILL');
    expect(expectOnlyWholeRuns(dir)).toBe(1);
    const again = openStore(dir);
    expect(again.unitSerials()).toEqual(['FK-0101']);
    // A later writer still works after the interrupted one.
    again.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T10:00:00.000Z' }));
    expect(again.integrityCheck()).toEqual(['ok']);
    again.close();
    expect(existsSync(join(dir, 'tmp')) ? readdirSync(join(dir, 'tmp')) : []).toEqual([]);
  });

  it('keeps only whole runs when a writer is killed at an arbitrary moment of a stream of runs', async () => {
    const child = spawnWriter(dir, 'FK-STREAM', 400, 'loop');
    const done = exited(child);
    await printed(child, /^stored \d+ /, 5);
    child.kill('SIGKILL');
    expect((await done).signal).toBe('SIGKILL');
    const stored = expectOnlyWholeRuns(dir);
    expect(stored).toBeGreaterThanOrEqual(5);
    expect(stored).toBeLessThan(400);
  });
});
