/**
 * Copy-over: an existing bench's embedded store (records.db and its capture archive) into the shared
 * store. The bench's store is verified whole first (every fingerprint, the chain, every archived
 * capture re-hashed) and nothing is copied from one that fails. Rows are copied as they are stored —
 * every column of the run and of its checks, causes, measurements and capture links, the stored
 * verdict text byte for byte, the times, the attempt placing and the fingerprint — in the bench's
 * chain order, each run (or calibration iteration) in one transaction under the store-wide write
 * lock, where it joins the shared store's chain. Capture bytes are re-hashed as they are read from
 * the archive. Each copied row carries an origin id (the bench's outbox id, else `copy:` and its
 * fingerprint), so a second copy finds it and adds nothing. Copied into an empty shared store, the
 * rows get the same numbers and the chain the same head as on the bench.
 */
import Database from 'better-sqlite3';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { chainEntries } from '../chain.js';
import { DATABASE_FILE, openStore } from '../openStore.js';
import { unverifiedError } from '../storeErrors.js';
import { sha256Hex } from '../digest.js';
import { BenchError } from '../../types/index.js';
import { applyPgMigrations } from './pgSchema.js';
import { putCapture } from './pgCaptures.js';
import { WRITE_LOCK, insertRows, pgAppendLink, pgChainHead, pgInsertSummary } from './pgSaveRun.js';
import type { PgSyncClient } from './pgSync.js';

export interface CopyResult {
  readonly runs: { readonly copied: number; readonly present: number };
  readonly iterations: { readonly copied: number; readonly present: number };
  readonly captures: number;
}

type Row = Record<string, unknown>;

const RUN_CHILDREN = ['condition_results', 'checks', 'causes', 'run_captures', 'measurements'] as const;

/** Copy the bench store in `fromDir` into the shared store behind `client` (migrated first). */
export function copyIntoShared(fromDir: string, label: string, client: PgSyncClient, shown: string, onEach?: (done: number, total: number) => void): CopyResult {
  const source = openStore(fromDir, { mode: 'read', label });
  try {
    const audit = source.audit();
    if (audit.problems.length > 0) throw unverifiedError(label, audit);
  } finally {
    source.close();
  }
  applyPgMigrations(client, shown);
  const db = new Database(join(fromDir, DATABASE_FILE), { readonly: true, fileMustExist: true });
  try {
    const uids = new Map((db.prepare('SELECT kind, row_id, uid FROM outbox').all() as { kind: string; row_id: number; uid: string }[]).map((r) => [`${r.kind}:${r.row_id}`, r.uid]));
    const entries = chainEntries(db);
    const counts = { runs: { copied: 0, present: 0 }, iterations: { copied: 0, present: 0 }, captures: new Set<string>() };
    const calibrationIds = new Map<number, number>();
    entries.forEach((e, i) => {
      const uidOf = (kind: string, id: number, digest: string): string => uids.get(`${kind}:${id}`) ?? `copy:${kind}:${digest}`;
      const copied = client.transaction(() => {
        client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
        if (e.kind === 'summary') return copySummary(db, client, e.row_id, uidOf);
        const uid = uidOf(e.kind, e.row_id, e.row_digest);
        return e.kind === 'run' ? copyRun(db, fromDir, client, e.row_id, uid, counts.captures) : copyIteration(db, fromDir, client, e.row_id, uid, calibrationIds, counts.captures);
      });
      onEach?.(i + 1, entries.length);
      if (e.kind === 'summary') return;
      const tally = e.kind === 'run' ? counts.runs : counts.iterations;
      if (copied) tally.copied += 1;
      else tally.present += 1;
    });
    return { runs: counts.runs, iterations: counts.iterations, captures: counts.captures.size };
  } finally {
    db.close();
  }
}

function copyRun(db: Database.Database, dir: string, client: PgSyncClient, id: number, uid: string, captures: Set<string>): boolean {
  if (client.query('SELECT 1 FROM runs WHERE origin_uid = $1', [uid]).rowCount > 0) return false;
  const run = db.prepare('SELECT * FROM runs WHERE id = ?').get(id) as Row;
  copySpec(db, client, String(run.spec_sha256));
  const links = db.prepare('SELECT * FROM run_captures WHERE run_id = ? ORDER BY seq').all(id) as Row[];
  for (const l of links) copyBlob(db, dir, client, String(l.sha256), captures);
  const { id: _id, origin_uid: _u, origin_digest: digest, ...columns } = run;
  const newId = insertOne(client, 'runs', { ...columns, origin_uid: uid, origin_digest: digest ?? null });
  for (const table of RUN_CHILDREN) {
    const rows = db.prepare(`SELECT * FROM ${table} WHERE run_id = ?`).all(id) as Row[];
    insertAll(client, table, rows.map((r) => ({ ...r, run_id: newId })));
  }
  pgAppendLink(client, 'run', newId, String(run.digest));
  return true;
}

/**
 * A run's summary, at its place in the bench's chain: the row as the bench holds it (verified with
 * the store; its fingerprint names no run number, so it holds for the copied run as it is).
 */
function copySummary(db: Database.Database, client: PgSyncClient, runId: number, uidOf: (kind: string, id: number, digest: string) => string): boolean {
  const run = db.prepare('SELECT digest FROM runs WHERE id = ?').get(runId) as { digest: string };
  const target = client.query<{ id: number }>('SELECT id FROM runs WHERE origin_uid = $1', [uidOf('run', runId, run.digest)]).rows[0]?.id;
  if (target === undefined) throw new RangeError(`store copy: the summary of run #${runId} comes before its run`);
  if (client.query('SELECT 1 FROM run_summaries WHERE run_id = $1', [target]).rowCount > 0) return false;
  const s = db.prepare('SELECT s.*, c.checks_json FROM run_summaries s JOIN run_summary_checks c ON c.run_id = s.run_id WHERE s.run_id = ?').get(runId) as Record<string, string | number | null>;
  const values = {
    runDigest: String(s.run_digest), attempt: s.attempt as number | null, attemptReason: s.attempt_reason as string | null, note: s.note as string | null,
    verdictSha256: String(s.verdict_sha256), checksSha256: String(s.checks_sha256), stateJson: String(s.state_json), checksJson: String(s.checks_json), digest: String(s.digest),
  };
  pgInsertSummary(client, target, values, pgChainHead(client));
  return true;
}

function copyIteration(db: Database.Database, dir: string, client: PgSyncClient, id: number, uid: string, calibrationIds: Map<number, number>, captures: Set<string>): boolean {
  if (client.query('SELECT 1 FROM calibration_iterations WHERE origin_uid = $1', [uid]).rowCount > 0) return false;
  const it = db.prepare('SELECT * FROM calibration_iterations WHERE id = ?').get(id) as Row;
  const sourceRun = Number(it.calibration_id);
  const run = db.prepare('SELECT * FROM calibration_runs WHERE id = ?').get(sourceRun) as Row;
  copySpec(db, client, String(run.spec_sha256));
  let target = calibrationIds.get(sourceRun);
  if (target === undefined) {
    const { id: _id, ...columns } = run;
    target = insertOne(client, 'calibration_runs', columns);
    calibrationIds.set(sourceRun, target);
  }
  const links = db.prepare('SELECT * FROM calibration_captures WHERE iteration_id = ? ORDER BY seq').all(id) as Row[];
  for (const l of links) copyBlob(db, dir, client, String(l.sha256), captures);
  const { id: _id, origin_uid: _u, origin_digest: digest, ...columns } = it;
  const newId = insertOne(client, 'calibration_iterations', { ...columns, calibration_id: target, origin_uid: uid, origin_digest: digest ?? null });
  insertAll(client, 'calibration_captures', links.map((l) => ({ ...l, iteration_id: newId })));
  pgAppendLink(client, 'calibration', newId, String(it.digest));
  return true;
}

function copySpec(db: Database.Database, client: PgSyncClient, sha256: string): void {
  const spec = db.prepare('SELECT * FROM specs WHERE sha256 = ?').get(sha256) as { sha256: string; name: string; revision: string; text: Buffer | null };
  client.query('INSERT INTO specs (sha256, name, revision, text) VALUES ($1, $2, $3, $4) ON CONFLICT (sha256) DO NOTHING', [spec.sha256, spec.name, spec.revision, spec.text]);
  if (spec.text) client.query('UPDATE specs SET text = $1 WHERE sha256 = $2 AND text IS NULL', [spec.text, spec.sha256]);
}

/** The archived capture's bytes into the chunk table, re-hashed on the way (once per copy). */
function copyBlob(db: Database.Database, dir: string, client: PgSyncClient, sha256: string, done: Set<string>): void {
  if (done.has(sha256)) return;
  const blob = db.prepare('SELECT file, first_stored_at FROM blobs WHERE sha256 = ?').get(sha256) as { file: string; first_stored_at: string };
  const bytes = readFileSync(join(dir, ...blob.file.split('/')));
  if (sha256Hex(bytes) !== sha256) {
    throw new BenchError({
      code: 'records.capture-changed',
      file: join(dir, blob.file),
      problem: `the archived capture no longer hashes to ${sha256.slice(0, 12)}… (it changed after the store was verified); the copy stopped before it`,
      expected: 'the capture archive unchanged while it is copied',
      fix: 'run benchproof store copy again; what was copied stays and is not copied twice',
    });
  }
  putCapture(client, bytes, blob.file, blob.first_stored_at);
  done.add(sha256);
}

function insertOne(client: PgSyncClient, table: string, row: Row): number {
  const keys = Object.keys(row);
  return client.query<{ id: number }>(`INSERT INTO ${table} (${keys.join(', ')}) VALUES (${keys.map((_, i) => `$${i + 1}`).join(', ')}) RETURNING id`, keys.map((k) => row[k])).rows[0].id;
}

function insertAll(client: PgSyncClient, table: string, rows: readonly Row[]): void {
  if (rows.length === 0) return;
  const keys = Object.keys(rows[0]);
  insertRows(client, `${table} (${keys.join(', ')})`, rows.map((r) => keys.map((k) => r[k])));
}
