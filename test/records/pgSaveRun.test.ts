/**
 * Storing runs in the shared store (pgSaveRun) against a throwaway PostgreSQL cluster: the same
 * fingerprint, attempt and chain link as the embedded store for the same run, and eight processes
 * on two simulated benches writing 50 runs each at once, all stored, none twice, the chain whole.
 * The expected values come from the embedded store (an independent engine: SQLite) and from
 * recomputing the chain (chain.ts's published rule). Skips without the server.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { spawn } from 'node:child_process';
import { fileURLToPath } from 'node:url';
import { PgSyncClient } from '../../src/records/engines/pgSync.js';
import { applyPgMigrations } from '../../src/records/engines/pgSchema.js';
import { pgSaveRun } from '../../src/records/engines/pgSaveRun.js';
import { pgReadRunRows } from '../../src/records/engines/pgRuns.js';
import type { StoredRun } from '../../src/types/index.js';
import { CHAIN_START, chainLink, openStore } from '../../src/records/index.js';
import { kestrelRun } from './fixtures/kestrelRun.js';
import { exited } from './helpers/children.js';
import { makeTempDir, removeTempDir } from './helpers/tempData.js';
import { isSkipped, startPgCluster } from '../helpers/pgCluster.js';
import type { PgCluster } from '../helpers/pgCluster.js';

const started = startPgCluster();
const skip = isSkipped(started) ? started.skip : undefined;
if (skip) console.warn(`note: PostgreSQL tests skipped: ${skip}`);
afterAll(() => {
  if (!isSkipped(started)) started.stop();
});

const here = (name: string): string => fileURLToPath(new URL(name, import.meta.url));

function verifyChain(c: PgSyncClient): number {
  const rows = c.query<{ kind: 'run'; row_id: number; row_digest: string; link: string }>('SELECT kind, row_id, row_digest, link FROM chain ORDER BY seq').rows;
  let prev = CHAIN_START;
  for (const r of rows) {
    const want = chainLink(prev, r.kind, r.row_id, r.row_digest);
    if (want !== r.link) throw new Error(`chain broken at ${r.kind} ${r.row_id}`);
    prev = r.link;
  }
  return rows.length;
}

describe.skipIf(skip !== undefined)('pgSaveRun', () => {
  const cluster = started as PgCluster;

  it('pgSaveRun stores a run with the same fingerprint, attempts and chain link as the embedded store', () => {
    const c = new PgSyncClient(cluster.createDatabase('same'));
    const dir = makeTempDir();
    const local = openStore(dir);
    try {
      applyPgMigrations(c, 'test');
      // A waiting run (only 'low' captured), then a complete one, then a new-attempt request.
      const full = kestrelRun({ unit: 'FK-0101', startedAt: '2026-12-05T09:00:00Z' });
      const waiting = { ...full, verdict: { ...full.verdict, captures: full.verdict.captures.slice(0, 1), waitingFor: ['mid', 'high'] }, captures: full.captures.slice(0, 1) };
      const runs = [waiting, { ...full, startedAt: '2026-12-05T09:10:00Z' }, { ...full, startedAt: '2026-12-05T09:20:00Z', newAttempt: true }];
      for (const run of runs) {
        const a = local.saveRun(run);
        const b = pgSaveRun(c, run);
        expect({ digest: b.digest, attempt: b.attempt, reason: b.attemptReason, number: b.number }).toEqual({ digest: a.digest, attempt: a.attempt, reason: a.attemptReason, number: a.number });
      }
      // Each run and its summary (runSummary.ts) have one entry each.
      expect(verifyChain(c)).toBe(6);
      const head = c.query<{ link: string }>('SELECT link FROM chain ORDER BY seq DESC LIMIT 1').rows[0].link;
      expect(head).toBe(local.chainHead());
    } finally {
      local.close();
      c.close();
      removeTempDir(dir);
    }
  });

  it('pgReadRunRows reads back the runs the embedded store reads for the same saves, and marks a run changed behind the store', () => {
    const url = cluster.createDatabase('readback');
    const c = new PgSyncClient(url);
    const dir = makeTempDir();
    const local = openStore(dir);
    try {
      applyPgMigrations(c, 'test');
      for (const [unit, minute] of [['FK-0103', 0], ['FK-0104', 5], ['FK-0103', 10]] as const) {
        const run = kestrelRun({ unit, startedAt: `2026-12-05T10:${String(minute).padStart(2, '0')}:00Z`, seed: 11 + minute });
        local.saveRun(run);
        pgSaveRun(c, run);
      }
      // What the record shows does not depend on the engine: ids, storing times and archive places aside.
      const shape = (r: StoredRun): unknown => ({ ...r, id: 0, storedAt: '', captures: r.captures.map((k) => ({ ...k, archivePath: '' })) });
      const fromPg = pgReadRunRows(c, { unit: 'FK-0103' });
      expect(fromPg.damaged).toEqual([]);
      expect(fromPg.runs.map(shape)).toEqual(local.runs({ unit: 'FK-0103' }).map(shape));
      expect(fromPg.runs.every((r) => r.intact)).toBe(true);
      cluster.psql("SET session_replication_role = replica; UPDATE runs SET operator = 'someone else' WHERE unit = 'FK-0104'", 'readback');
      const after = pgReadRunRows(c).runs;
      expect(after.map((r) => [r.unit, r.intact])).toEqual([['FK-0103', true], ['FK-0104', false], ['FK-0103', true]]);
    } finally {
      local.close();
      c.close();
      removeTempDir(dir);
    }
  });

  // A long run, only with BENCHPROOF_HARDENING=long (npx vitest run test/records/pgSaveRun.test.ts):
  // eight processes, each starting a TypeScript loader (with the transpile cache of
  // test/helpers/cachedTsHooks.mjs) and a client worker, take a while on a 2-core machine. 50 runs
  // per process, a multiple of the 5 units each process cycles over, so every unit gets the same
  // number of runs.
  const long = process.env.BENCHPROOF_HARDENING === 'long';
  const perProcess = 50;
  const total = 8 * perProcess;
  it.runIf(long)(`eight processes on two benches writing ${perProcess} runs each at once store all ${total}, none twice, in one whole chain`, async () => {
    const url = cluster.createDatabase('eight');
    const c = new PgSyncClient(url);
    try {
      applyPgMigrations(c, 'test');
      // Bench A's four processes test the same five units at once; bench B's four test five others.
      const children = [0, 1, 2, 3, 4, 5, 6, 7].map((i) =>
        spawn(process.execPath, ['--import', here('../helpers/registerCachedTs.mjs'), here('./pgWriter.ts'), url, i < 4 ? 'bench-a' : 'bench-b', i < 4 ? 'FK-01' : 'FK-02', String(perProcess), '5'], { stdio: ['ignore', 'pipe', 'pipe'] }),
      );
      const exits = await Promise.all(children.map(exited));
      for (const e of exits) expect(e.stderr, e.stderr).toBe('');
      expect(exits.map((e) => e.code)).toEqual(Array(8).fill(0));
      const printedIds = exits.flatMap((e) => e.stdout.trim().split('\n').map((l) => Number(l.split(' ')[1])));
      expect(new Set(printedIds).size).toBe(total);
      const stored = c.query<{ n: string; d: string }>('SELECT COUNT(*) AS n, COUNT(DISTINCT id) AS d FROM runs').rows[0];
      expect([Number(stored.n), Number(stored.d)]).toEqual([total, total]);
      // Two chain entries per run since schema 7: the run's, then its summary's.
      expect(verifyChain(c)).toBe(2 * total);
      // Each unit's runs were all complete, so each opened its own attempt: 1…n with no number twice.
      const perUnit = c.query<{ unit: string; n: string; a: string; mx: number }>('SELECT unit, COUNT(*) AS n, COUNT(DISTINCT attempt) AS a, MAX(attempt) AS mx FROM runs GROUP BY unit ORDER BY unit').rows;
      expect(perUnit).toHaveLength(10);
      const each = total / 10;
      for (const u of perUnit) expect([Number(u.n), Number(u.a), u.mx]).toEqual([each, each, each]);
    } finally {
      c.close();
    }
  }, 240_000);
});
