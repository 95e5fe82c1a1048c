/**
 * Store one run in the shared store: the same rows, fingerprint, attempt rule and hash-chain link as
 * the embedded store (saveRun.ts), and the capture bytes in the chunk table, all in one transaction.
 *
 * Several benches write at once. The chain is one sequence for the whole store (each link hashes
 * the one before), so every write takes one transaction-level advisory lock first: writes are
 * serialized in the order they take it, each sees every run committed before it, and the lock is
 * released by COMMIT or ROLLBACK (or the server, when a bench's connection drops). Two benches
 * testing the same unit at once therefore never get the same run placed twice or an attempt number
 * decided on a stale view: the second run is placed after the first by the same rule as on one
 * bench (it continues the first's attempt while that one still waits, else opens the next).
 */
import { readFileSync } from 'node:fs';
import type { NewRun, StoredCapture, StoredRun } from '../../types/index.js';
import { sha256Hex } from '../digest.js';
import { numberRuns, runHead } from '../attempts.js';
import type { HeadRow } from '../attempts.js';
import { chainLink, CHAIN_START } from '../chain.js';
import type { ChainKind } from '../chain.js';
import type { PgSyncClient } from './pgSync.js';
import { lightRun, SUMMARY_COLUMNS, summaryArrayOf } from '../runSummary.js';
import type { SummaryRow, SummaryValues } from '../runSummary.js';
import { archiveName } from '../archive.js';
import { BenchError } from '../../types/index.js';
import { pgReadRunRows } from './pgRuns.js';
import { summaryStatement, writeRunBatched } from './pgWriteRun.js';

/** Fixed number naming the store-wide write lock (pg_advisory_xact_lock); distinct from the schema lock. */
export const WRITE_LOCK = 2_026_120_521;

/** Where a run comes from, when it is not stored by this process directly: the id its bench made, its fingerprint there. */
export interface RunOrigin {
  /** The id the bench made for the run; a second save with the same id stores nothing. */
  readonly uid?: string;
  /** The run's fingerprint in the bench's own store (outbox), kept beside the shared store's. */
  readonly digest?: string;
}

/** A run ready to write: its capture bytes read and checked, outside any transaction. */
export interface PreparedRun {
  readonly run: NewRun;
  readonly bytes: readonly Buffer[];
  readonly captures: readonly StoredCapture[];
}

export function prepareRun(run: NewRun): PreparedRun {
  checkRun(run);
  // Read before the transaction: a bench's slow disk does not hold the store-wide lock.
  const bytes = run.captures.map((c) => {
    if (!c.bytes && c.sourcePath === undefined) throw new TypeError(`pgSaveRun: capture ${c.path} has neither bytes nor sourcePath`);
    const b = c.bytes ? Buffer.from(c.bytes) : readSource(c.path, c.sourcePath as string);
    if (sha256Hex(b) !== c.sha256) throw changedCapture(c.path, sha256Hex(b), c.sha256);
    return b;
  });
  const captures: StoredCapture[] = run.captures.map((c, i) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition, archivePath: archiveName(c.sha256, bytes[i]) }));
  return { run, bytes, captures };
}

/** Store one run in its own transaction; with an origin id already stored, the run stored then (nothing added). */
export function pgSaveRun(client: PgSyncClient, run: NewRun, origin: RunOrigin = {}): StoredRun {
  const prepared = prepareRun(run);
  return client.transaction((): StoredRun => {
    client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
    return writeRun(client, prepared, origin);
  });
}

/** The run with this origin id, if the store holds it. */
export function pgRunByOrigin(client: PgSyncClient, uid: string): number | undefined {
  return client.query<{ id: number }>('SELECT id FROM runs WHERE origin_uid = $1', [uid]).rows[0]?.id;
}

/** Write a prepared run; the caller is inside a transaction and holds WRITE_LOCK (pgWriteRun.ts). */
export function writeRun(client: PgSyncClient, prepared: PreparedRun, origin: RunOrigin = {}): StoredRun {
  return writeRunBatched(client, prepared, origin).run;
}

/**
 * Store one run in its own transaction in as few calls as it takes: BEGIN and the write lock go with
 * the reads, COMMIT with the writes (pgWriteRun.ts); any failure rolls back.
 */
export function saveRunBatched(client: PgSyncClient, prepared: PreparedRun, origin: RunOrigin = {}): StoredRun {
  let open = false;
  try {
    open = true;
    const done = writeRunBatched(client, prepared, origin, [{ sql: 'BEGIN' }, { sql: 'SELECT pg_advisory_xact_lock($1)', params: [WRITE_LOCK] }], [{ sql: 'COMMIT' }]);
    if (!done.tailRan) client.query('COMMIT');
    open = false;
    return done.run;
  } catch (err) {
    if (open) {
      try {
        client.query('ROLLBACK');
      } catch {
        // The connection is gone: the server rolls the transaction back itself.
      }
    }
    throw err;
  }
}

/** A stored run read back (numbered within its unit), for a save that found its origin id stored. */
export function storedRunById(client: PgSyncClient, id: number): StoredRun {
  const unit = client.query<{ unit: string }>('SELECT unit FROM runs WHERE id = $1', [id]).rows[0].unit;
  const runs = numberRuns(pgReadRunRows(client, { unit }).runs);
  const found = runs.find((r) => r.id === id);
  if (!found) throw new RangeError(`pgSaveRun: run #${id} of ${unit} is stored but does not read back as a run`);
  return found;
}

/** The capture's bytes from its file; a file gone or unreadable is the user's to put back, not a crash. */
function readSource(path: string, source: string): Buffer {
  try {
    return readFileSync(source);
  } catch (err) {
    throw new BenchError({
      code: 'records.capture-missing',
      file: path,
      problem: `the capture could not be read again for the shared store (${(err as { code?: string }).code ?? 'read error'}); nothing was stored`,
      expected: 'the capture file (or its archived copy in the data folder) still in place until the run is stored',
      fix: 'put the file back where it was and run the command again',
    });
  }
}

function changedCapture(path: string, now: string, was: string): BenchError {
  return new BenchError({
    code: 'records.capture-changed',
    file: path,
    problem: `the capture's bytes now hash to ${now.slice(0, 12)}…, not ${was.slice(0, 12)}… as when it was measured; nothing was stored`,
    expected: 'a capture file that stays unchanged while benchproof checks it',
    fix: 'wait until the scope or copy tool has finished writing the file, then run the check again',
  });
}

/**
 * The unit's runs as placing a new run reads them, from their summaries (a few hundred bytes each);
 * a unit with a run that has none is read from the verdicts, as before schema 7 (pgVerdictHeads).
 */
export function pgRunHeads(client: PgSyncClient, unit: string): StoredRun[] {
  const rows = client.query<SummaryRow>(`SELECT ${SUMMARY_COLUMNS} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id WHERE r.unit = $1 ORDER BY r.started_at, r.id`, [unit]).rows;
  return pgHeadsOf(client, unit, rows);
}

/** The unit's runs for placing from its summary rows; from the verdicts when one has none (before schema 7). */
export function pgHeadsOf(client: PgSyncClient, unit: string, rows: readonly SummaryRow[]): StoredRun[] {
  const heads: StoredRun[] = [];
  for (const row of rows) {
    const head = lightRun(summaryArrayOf(row));
    if (!head) return pgVerdictHeads(client, unit);
    heads.push(head);
  }
  return heads;
}

/** The unit's runs as attempts.ts's runHead reads them, from PostgreSQL's JSON functions. */
export function pgVerdictHeads(client: PgSyncClient, unit: string): StoredRun[] {
  const conditionsOf = (key: string): string =>
    `COALESCE((SELECT jsonb_agg(e.value -> 'condition' ORDER BY e.ord) FROM jsonb_array_elements(verdict_json::jsonb -> '${key}') WITH ORDINALITY AS e(value, ord)), '[]'::jsonb)::text`;
  const rows = client.query<HeadRow>(
    `SELECT id, unit, spec_name, spec_revision, spec_sha256, started_at, stored_at, statement, attempt, attempt_reason, note,
       NULLIF(verdict_json::jsonb -> 'waitingFor', 'null'::jsonb)::text AS waiting_json,
       ${conditionsOf('captures')} AS captured_json, ${conditionsOf('conditions')} AS conditions_json
     FROM runs WHERE unit = $1 ORDER BY started_at, id`,
    [unit],
  ).rows;
  return rows.map(runHead);
}

export function pgCalibratedAt(client: PgSyncClient, unit: string): string | null {
  return client.query<{ at: string | null }>('SELECT MAX(i.stored_at) AS at FROM calibration_iterations i JOIN calibration_runs c ON c.id = i.calibration_id WHERE c.unit = $1', [unit]).rows[0].at;
}

export function pgChainHead(client: PgSyncClient): string {
  return client.query<{ link: string }>('SELECT link FROM chain ORDER BY seq DESC LIMIT 1').rows[0]?.link ?? CHAIN_START;
}

/**
 * Append a link; the caller holds WRITE_LOCK, so no other link is added between reading the head and
 * this one. `head`, when the caller just wrote the newest link itself, saves reading it back.
 */
export function pgAppendLink(client: PgSyncClient, kind: ChainKind, rowId: number, digest: string, head?: string): string {
  const link = chainLink(head ?? pgChainHead(client), kind, rowId, digest);
  client.query('INSERT INTO chain (kind, row_id, row_digest, link) VALUES ($1, $2, $3, $4)', [kind, rowId, digest, link]);
  return link;
}

/** A run's summary row and its chain entry after `head` (the newest link); the caller holds WRITE_LOCK. */
export function pgInsertSummary(client: PgSyncClient, runId: number, s: SummaryValues, head: string): string {
  const { sql, params } = summaryStatement(runId, s);
  client.query(sql, params);
  return pgAppendLink(client, 'summary', runId, s.digest, head);
}

/** Up to 500 rows per INSERT: one round trip to the server instead of one per row. */
export function insertRows(client: PgSyncClient, into: string, rows: readonly (readonly unknown[])[]): void {
  for (let at = 0; at < rows.length; at += 500) {
    const part = rows.slice(at, at + 500);
    const params: unknown[] = [];
    const tuples = part.map((r) => `(${r.map((v) => `$${params.push(v)}`).join(', ')})`);
    client.query(`INSERT INTO ${into} VALUES ${tuples.join(', ')}`, params);
  }
}

function checkRun(run: NewRun): void {
  if (typeof run.unit !== 'string' || run.unit.trim() === '') throw new TypeError(`pgSaveRun: unit serial is empty (${JSON.stringify(run.unit)})`);
  if (run.verdict.unit !== run.unit) throw new RangeError(`pgSaveRun: verdict is for unit ${run.verdict.unit}, run is for ${run.unit}`);
  if (Number.isNaN(Date.parse(run.startedAt))) throw new RangeError(`pgSaveRun: startedAt ${JSON.stringify(run.startedAt)} is not an ISO 8601 time`);
  if (run.spec.text !== undefined && sha256Hex(run.spec.text) !== run.spec.sha256) throw new RangeError('pgSaveRun: spec.text does not hash to spec.sha256');
}
