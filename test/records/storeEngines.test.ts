/**
 * The record store's own rules, run against both engines: the embedded store (SQLite) and the
 * shared store (PostgreSQL, a throwaway cluster; the PostgreSQL half skips with a note without the
 * server binaries). Expected values: the run as saved (round trip), the fingerprint rule
 * (digest.ts, recomputed here), the chain rule (chain.ts, after Haber and Stornetta 1991), and
 * SHA-256 of the capture bytes (FIPS 180-4, node:crypto).
 */
import { afterAll, describe, expect, it } from 'vitest';
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import Database from 'better-sqlite3';
import { LATEST_SCHEMA, openPgStore, openStore, runDigest } from '../../src/records/index.js';
import type { RecordStore } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';

const started = startPgCluster();
const pgSkip = isSkipped(started) ? started.skip : undefined;
if (pgSkip) console.warn(`note: PostgreSQL half of the store tests skipped: ${pgSkip}`);
const dirs: string[] = [];
afterAll(() => {
  if (!isSkipped(started)) started.stop();
  for (const d of dirs) removeTempDir(d);
});

const sha = (b: Uint8Array): string => createHash('sha256').update(b).digest('hex');
let dbCount = 0;

/** One engine: how to open a fresh store, open it again, and run SQL behind its back. */
interface Engine {
  readonly name: string;
  readonly skip?: string;
  /** A new store; `empty`: a database the store has never opened (else a shared store may start migrated). */
  fresh(options?: { empty?: boolean }): Promise<{ open: (unverified?: 'refuse' | 'mark') => RecordStore; sql: (text: string) => Promise<void>; cache: string }>;
}

const embedded: Engine = {
  name: 'embedded (SQLite)',
  async fresh() {
    // Every embedded store starts empty: its migrations take a few milliseconds.
    const root = makeTempDir();
    dirs.push(root);
    const dir = join(root, 'benchproof-data');
    return {
      open: (unverified = 'refuse') => openStore(dir, { unverified }),
      sql: async (text) => {
        const db = new Database(join(dir, 'records.db'));
        try {
          db.exec(text);
        } finally {
          db.close();
        }
      },
      cache: dir,
    };
  },
};

/**
 * A database the shared store has opened once (every migration applied), made at the first call; the
 * later fresh stores are copies of it (CREATE DATABASE … TEMPLATE), as a store another bench made
 * earlier would be, instead of each test applying every migration again. Migrating an empty database
 * is tested in pgSchema.test.ts, and here by the first test, which asks for an empty one.
 */
let migrated: Promise<string> | undefined;
function migratedTemplate(cluster: PgCluster): Promise<string> {
  migrated ??= (async () => {
    await cluster.sql('CREATE DATABASE engines_migrated STRATEGY FILE_COPY');
    const root = makeTempDir();
    dirs.push(root);
    openPgStore(cluster.url('engines_migrated'), { cacheDir: join(root, 'bench-data') }).close();
    return 'engines_migrated';
  })();
  return migrated;
}

const shared: Engine = {
  name: 'shared (PostgreSQL)',
  ...(pgSkip ? { skip: pgSkip } : {}),
  async fresh({ empty = false } = {}) {
    const cluster = started as PgCluster;
    const name = `engines${++dbCount}`;
    // SQL behind the store's back goes through the helper's kept superuser connection (pg), not psql.
    // FILE_COPY copies the template's files instead of writing each page to the WAL (PostgreSQL 15
    // docs, CREATE DATABASE, STRATEGY): less of the server's time for a small database.
    const template = empty ? 'template1' : await migratedTemplate(cluster);
    await cluster.sql(`CREATE DATABASE "${name}" TEMPLATE "${template}" STRATEGY FILE_COPY`);
    const url = cluster.url(name);
    const root = makeTempDir();
    dirs.push(root);
    const cache = join(root, 'bench-data');
    return {
      open: (unverified = 'refuse') => openPgStore(url, { cacheDir: cache, unverified }),
      sql: async (text) => void (await cluster.sql(text, name)),
      cache,
    };
  },
};

const dropTriggers = {
  [embedded.name]: 'DROP TRIGGER runs_no_update; DROP TRIGGER runs_no_delete; DROP TRIGGER chain_no_delete;',
  [shared.name]: 'DROP TRIGGER runs_append_only ON runs; DROP TRIGGER chain_append_only ON chain;',
};

describe.each([embedded, shared])('the record store on the $name engine', (engine) => {
  const test = engine.skip ? it.skip : it;

  test('gives back a saved run field for field, in a later session, with its captures byte for byte', async () => {
    const s = await engine.fresh({ empty: true });
    const run = kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' });
    const store = s.open();
    const saved = store.saveRun(run);
    store.close();
    const again = s.open();
    const rec = again.unitRecord('FK-0101');
    again.close();
    expect(again.schemaVersion).toBe(LATEST_SCHEMA);
    expect(rec?.runs).toEqual([saved]);
    expect(rec!.runs[0].verdict).toEqual(run.verdict);
    // SHA-256 of the bytes the store hands back (FIPS 180-4) equals the capture's.
    for (const c of rec!.runs[0].captures) expect(sha(readFileSync(join(s.cache, c.archivePath)))).toBe(c.sha256);
  });

  test('keeps every run of a re-tested unit and lets the latest decide, in the listing too', async () => {
    const store = (await engine.fresh()).open();
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-02T11:00:00.000Z', frequencyScale: 0.943 }));
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-05T08:30:00.000Z' }));
    store.saveRun(kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-01T08:30:00.000Z', frequencyScale: 0.943 }));
    store.saveRun(kestrelRun({ unit: 'FK-0105', startedAt: '2026-03-01T08:30:00.000Z' }));
    const rec = store.unitRecord('FK-0104')!;
    const units = store.listUnits();
    store.close();
    expect(rec.runs.map((r) => r.statement)).toEqual(['fail', 'fail', 'pass']);
    expect(units.map((u) => [u.unit, u.status, u.firstStatement, u.runs, u.attempts])).toEqual([
      ['FK-0104', 'pass', 'fail', 3, 3],
      ['FK-0105', 'pass', 'pass', 1, 1],
    ]);
  });

  test('stores a capture seen before for the same unit and condition once (saveRunOnce)', async () => {
    const store = (await engine.fresh()).open();
    const run = kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T10:00:00.000Z' });
    const first = store.saveRunOnce(run);
    const second = store.saveRunOnce({ ...run, startedAt: '2026-03-02T10:05:00.000Z' });
    const runs = store.runs();
    store.close();
    expect(first.stored).toBe(true);
    expect(second).toEqual({ stored: false, runId: runs[0].id });
    expect(runs).toHaveLength(1);
  });

  test('two benches adding to the same unit at once continue one attempt, numbered in the order they are stored', async () => {
    const s = await engine.fresh();
    const [a, b] = [s.open(), s.open()];
    const full = kestrelRun({ unit: 'FK-0106', startedAt: '2026-03-03T09:00:00.000Z' });
    const only = (i: number, at: string) => ({ ...full, startedAt: at, verdict: { ...full.verdict, captures: full.verdict.captures.slice(i, i + 1), waitingFor: ['low', 'mid', 'high'].filter((_, k) => k !== i) }, captures: full.captures.slice(i, i + 1) });
    const one = a.saveRun(only(0, '2026-03-03T09:00:00.000Z'));
    const two = b.saveRun(only(1, '2026-03-03T09:00:01.000Z'));
    const three = a.saveRun({ ...full, startedAt: '2026-03-03T09:00:02.000Z' });
    const rec = b.unitRecord('FK-0106')!;
    a.close();
    b.close();
    expect([one.attempt, two.attempt, three.attempt]).toEqual([1, 1, 1]);
    expect(rec.runs.map((r) => r.number)).toEqual([1, 2, 3]);
    expect(rec.attempts?.map((x) => x.state)).toEqual(['complete']);
  });

  test('refuses a run edited behind its back, and one edited and re-fingerprinted with the fingerprint rule', async () => {
    const s = await engine.fresh();
    const store = s.open();
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    store.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T09:20:00.000Z' }));
    store.close();
    await expect(s.sql(`UPDATE runs SET operator = 'someone else' WHERE id = ${saved.id}`)).rejects.toThrow(/append-only/);
    await s.sql(dropTriggers[engine.name]);
    await s.sql(`UPDATE runs SET operator = 'someone else' WHERE id = ${saved.id}`);
    const strict = s.open();
    expect(() => strict.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(() => strict.unitRecord('FK-0101')).toThrow(/run #1 of FK-0101: its content no longer matches/);
    strict.close();
    const marked = s.open('mark');
    expect(marked.unitRecord('FK-0101')!.runs[0].intact).toBe(false);
    expect(marked.unitRecord('FK-0102')!.runs[0].intact).toBe(true);
    marked.close();
    // Re-fingerprinted as benchproof would (digest.ts): the run matches itself, not the chain.
    const edited = { ...saved, operator: 'someone else' };
    await s.sql(`UPDATE runs SET digest = '${runDigest(edited)}' WHERE id = ${saved.id}`);
    const again = s.open();
    // The listing sees the row's columns no longer match its summary; the full read names the new fingerprint.
    expect(() => again.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(() => again.unitRecord('FK-0101')).toThrow(/run #1 of FK-0101: its fingerprint differs from the one the hash chain holds/);
    again.close();
  });

  test('refuses a store whose run was deleted with its chain entry, naming the broken chain', async () => {
    const s = await engine.fresh();
    const store = s.open();
    store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    const second = store.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T09:20:00.000Z' }));
    store.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: '2026-03-02T09:25:00.000Z' }));
    store.close();
    await s.sql(dropTriggers[engine.name]);
    for (const t of ['measurements', 'run_captures', 'causes', 'checks', 'condition_results', 'run_summary_checks', 'run_summaries']) {
      await s.sql(engine === shared ? `ALTER TABLE ${t} DISABLE TRIGGER USER; DELETE FROM ${t} WHERE run_id = ${second.id}` : `DROP TRIGGER ${t}_no_delete; DELETE FROM ${t} WHERE run_id = ${second.id}`);
    }
    await s.sql(`DELETE FROM runs WHERE id = ${second.id}; DELETE FROM chain WHERE row_id = ${second.id} AND kind = 'run'`);
    const again = s.open();
    expect(() => again.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(again.audit().problems.map((p) => p.problem)).toContain('chain-broken');
    again.close();
  });

  // The listing (units, batch) verifies the chain and every run's summary (runSummary.ts), not the full
  // verdicts; reading a unit in full re-hashes its runs. These pin what each read catches.
  const unguard = (table: string): string =>
    engine === shared ? `ALTER TABLE ${table} DISABLE TRIGGER USER;` : `DROP TRIGGER IF EXISTS ${table}_no_update; DROP TRIGGER IF EXISTS ${table}_no_delete;`;

  test('refuses a listing and a batch whose run summary was edited behind its back', async () => {
    const s = await engine.fresh();
    const store = s.open();
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0103', startedAt: '2026-03-02T09:15:00.000Z', riseFraction: 0.48 }));
    store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:20:00.000Z' }));
    expect(store.listUnits().find((u) => u.unit === 'FK-0103')?.status).toBe('fail');
    store.close();
    await s.sql(`${unguard('run_summaries')} UPDATE run_summaries SET state_json = replace(state_json, '"fail"', '"pass"') WHERE run_id = ${saved.id}`);
    const again = s.open();
    expect(() => again.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(() => again.batchRuns()).toThrow(/run #1 of FK-0103: its content no longer matches/);
    again.close();
    const marked = s.open('mark');
    expect(marked.listUnits().find((u) => u.unit === 'FK-0103')?.unverifiedRuns).toEqual([saved.id]);
    marked.close();
  });

  test('refuses a batch whose run summary checks were edited, which the listing does not read', async () => {
    const s = await engine.fresh();
    const store = s.open();
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    store.close();
    await s.sql(`${unguard('run_summary_checks')} UPDATE run_summary_checks SET checks_json = replace(checks_json, '"Hz"', '"kHz"') WHERE run_id = ${saved.id}`);
    const again = s.open();
    expect(again.listUnits().map((u) => u.unit)).toEqual(['FK-0101']);
    expect(() => again.batchRuns()).toThrow(/run #1 of FK-0101: its summary's checks no longer match/);
    again.close();
  });

  test('refuses a unit record whose verdict was edited, and names it in the full audit; the listing, which never reads verdicts, still answers', async () => {
    const s = await engine.fresh();
    const store = s.open();
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    store.close();
    await s.sql(`${unguard('runs')} UPDATE runs SET verdict_json = replace(verdict_json, '"Hz"', '"kHz"') WHERE id = ${saved.id}`);
    const again = s.open();
    expect(again.listUnits().map((u) => u.unit)).toEqual(['FK-0101']);
    expect(() => again.unitRecord('FK-0101')).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(again.audit().problems.map((p) => [p.id, p.problem])).toContainEqual([saved.id, 'changed']);
    again.close();
  });

  test('refuses a listing when a run and its summary were deleted, their chain entries left', async () => {
    const s = await engine.fresh();
    const store = s.open();
    store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    const second = store.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T09:20:00.000Z' }));
    store.close();
    for (const t of ['measurements', 'run_captures', 'causes', 'checks', 'condition_results', 'run_summary_checks', 'run_summaries', 'runs']) {
      await s.sql(`${unguard(t)} DELETE FROM ${t} WHERE ${t === 'runs' ? 'id' : 'run_id'} = ${second.id}`);
    }
    const again = s.open();
    expect(() => again.listUnits()).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(again.audit('listing').problems.map((p) => [p.kind, p.id, p.problem])).toEqual([['run', second.id, 'missing']]);
    again.close();
  });

  test('stores calibration iterations as one calibration run until one meets its limits, chained like runs', async () => {
    const store = (await engine.fresh()).open();
    const run = kestrelRun({ unit: 'FK-0104', startedAt: '2026-03-02T09:15:00.000Z' });
    const result = (meets: boolean) => ({ unit: 'FK-0104', statement: meets ? 'pass' : 'fail', meetsLimits: meets, steps: [], guidance: [], notes: [], tracking: {} }) as never;
    const it0 = { unit: 'FK-0104', startedAt: '2026-03-02T10:00:00.000Z', operator: 'demo', station: 'bench-2', spec: run.spec, toolVersion: '0.1.0', result: result(false), captures: run.captures.slice(0, 1) };
    const a = store.saveCalibration(it0);
    const b = store.saveCalibration({ ...it0, startedAt: '2026-03-02T10:10:00.000Z', result: result(true) });
    const c = store.saveCalibration({ ...it0, startedAt: '2026-03-02T10:20:00.000Z' });
    const list = store.calibrations('FK-0104');
    const audit = store.audit();
    store.close();
    expect([a.startedRun, b.startedRun, c.startedRun]).toEqual([true, false, true]);
    expect(list.map((r) => r.iterations.map((i) => [i.number, i.intact]))).toEqual([[[1, true], [2, true]], [[1, true]]]);
    expect([audit.chained, audit.problems]).toEqual([3, []]);
  });
});

describe.skipIf(pgSkip !== undefined)('the shared store alone', () => {
  it('refuses a capture whose chunks were changed on the server when a unit record reads it, and in the full audit', async () => {
    const s = await shared.fresh();
    const store = s.open();
    const saved = store.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    store.close();
    await s.sql(`ALTER TABLE capture_chunks DISABLE TRIGGER USER; UPDATE capture_chunks SET bytes = bytes || '\\x0a'::bytea WHERE sha256 = '${saved.captures[1].sha256}'`);
    const again = s.open();
    expect(() => again.unitRecord('FK-0101')).toThrow(expect.objectContaining({ code: 'records.tampered' }));
    expect(again.audit().problems.map((p) => p.problem)).toEqual(['capture-changed']);
    again.close();
  });

  it('reuses a kept connection for the next open, and connects afresh when the server dropped it meanwhile', async () => {
    const cluster = started as PgCluster;
    const name = `keep${++dbCount}`;
    await cluster.sql(`CREATE DATABASE "${name}"`);
    const url = cluster.url(name);
    const cache = join(makeTempDir(), 'bench-data');
    dirs.push(dirname(cache));
    const open = () => openPgStore(url, { cacheDir: cache, keepConnection: true });
    // Counted from the helper's own connection to the database, which pg_backend_pid() leaves out.
    const sessions = async () => Number((await cluster.sql(`SELECT COUNT(*) AS n FROM pg_stat_activity WHERE datname = '${name}' AND pid <> pg_backend_pid()`, name))[0].n);
    const first = open();
    first.saveRun(kestrelRun({ unit: 'FK-0101', startedAt: '2026-03-02T09:15:00.000Z' }));
    first.close();
    const second = open();
    expect(second.listUnits().map((u) => u.unit)).toEqual(['FK-0101']);
    second.close();
    expect(await sessions()).toBe(1);
    await cluster.sql(`SELECT pg_terminate_backend(pid) FROM pg_stat_activity WHERE datname = '${name}' AND pid <> pg_backend_pid()`, name);
    const third = open();
    third.saveRun(kestrelRun({ unit: 'FK-0102', startedAt: '2026-03-02T09:20:00.000Z' }));
    expect(third.listUnits().map((u) => u.unit)).toEqual(['FK-0101', 'FK-0102']);
    third.close();
    expect(await sessions()).toBe(1);
  });

  it('refuses a shared store written by a newer schema with records.newer-schema', async () => {
    const s = await shared.fresh();
    s.open().close();
    await s.sql(`INSERT INTO schema_migrations (version, name, applied_at) VALUES (${LATEST_SCHEMA + 1}, 'later', '2030-01-01')`);
    expect(() => s.open()).toThrow(expect.objectContaining({ code: 'records.newer-schema' }));
  });

  it('stores a run pushed twice under the same bench id once, keeping the bench fingerprint beside it', async () => {
    const s = await shared.fresh();
    const store = s.open();
    const run = kestrelRun({ unit: 'FK-0103', startedAt: '2026-03-02T09:15:00.000Z' });
    const first = store.saveRun(run, { uid: 'bench-a:1', originDigest: 'f'.repeat(64) });
    const second = store.saveRun(run, { uid: 'bench-a:1', originDigest: 'f'.repeat(64) });
    const runs = store.runs();
    store.close();
    expect(second.id).toBe(first.id);
    expect(runs).toHaveLength(1);
  });
});
