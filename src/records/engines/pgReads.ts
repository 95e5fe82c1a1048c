/**
 * What the shared store reads besides whole runs (pgRuns.ts): the runs' summaries (the unit listing
 * and batch), the rows that verifying the store needs (fingerprints, calibration iterations, the
 * chain), and small lookups.
 * Each read is one query (or one per table), never one per unit, so a listing of 10 000 units costs a
 * few round trips; the judging is the embedded store's own code (readRuns.ts, calibrationRead.ts,
 * auditStore.ts, attempts.ts), so both engines decide the same way on the same rows.
 */
import type { StoredCapture } from '../../types/index.js';
import { assembleCalibrations } from '../calibrationRead.js';
import type { CalibrationCaptureRow, CalibrationRunRow, IterationRow } from '../calibrationRead.js';
import { entryOf } from '../chain.js';
import type { ChainArray, ChainEntry } from '../chain.js';
import { judgeDigestRows, toStoredRun } from '../readRuns.js';
import type { DamagedRow, DigestRow, RunDigestRow, RunFilter, RunRow } from '../readRuns.js';
import type { StoredCalibrationRun } from '../../types/index.js';
import { PgCallError } from './pgSync.js';
import { listingColumns, SUMMARY_COLUMNS, summaryRowOf } from '../runSummary.js';
import type { SummaryArray, SummaryRow } from '../runSummary.js';
import type { PgSyncClient } from './pgSync.js';

/** Every run's fingerprint checked as readRunDigests does on SQLite (the verdict's fields taken out by jsonb). */
export function pgReadRunDigests(client: PgSyncClient, filter: RunFilter = {}, againstSummaries = false): { rows: RunDigestRow[]; damaged: DamagedRow[] } {
  const where = filter.unit !== undefined ? 'WHERE unit = $1' : '';
  const args = filter.unit !== undefined ? [filter.unit] : [];
  let rows: DigestRow[];
  try {
    rows = client.query<DigestRow>(
      `SELECT *, verdict_json::jsonb ->> 'statement' AS verdict_statement, verdict_json::jsonb ->> 'unit' AS verdict_unit,
         ${againstSummaries ? '(SELECT s.verdict_sha256 FROM run_summaries s WHERE s.run_id = runs.id)' : 'NULL'} AS summary_verdict_sha256,
         ${againstSummaries ? '(SELECT s.run_digest FROM run_summaries s WHERE s.run_id = runs.id)' : 'NULL'} AS summary_run_digest
       FROM runs ${where} ORDER BY started_at, id`,
      args,
    ).rows;
  } catch (err) {
    // 22P02: a verdict that is not JSON at all stops the cast; judge every row the slow way.
    if (!(err instanceof PgCallError) || err.code !== '22P02') throw err;
    const all = client.query<RunRow>(`SELECT * FROM runs ${where} ORDER BY started_at, id`, args).rows;
    const captures = pgCapturesByRun(client, all.map((r) => r.id));
    const damaged: DamagedRow[] = [];
    const out: RunDigestRow[] = [];
    for (const row of all) {
      const run = toStoredRun(row, captures.get(row.id) ?? []);
      if ('problem' in run) damaged.push(run);
      else out.push({ id: run.id, unit: run.unit, digest: run.digest, intact: run.intact, captures: run.captures });
    }
    return { rows: out, damaged };
  }
  return judgeDigestRows(rows, pgCapturesByRun(client, filter.unit !== undefined ? rows.map((r) => r.id) : undefined));
}

/** The captures of these runs (all runs when `ids` is undefined), by run, in their order. */
export function pgCapturesByRun(client: PgSyncClient, ids?: readonly number[]): Map<number, StoredCapture[]> {
  const out = new Map<number, StoredCapture[]>();
  if (ids !== undefined && ids.length === 0) return out;
  const rows = client.query<{ run_id: number; sha256: string; original_path: string; size: string; layout: string; condition: string; file: string }>(
    `SELECT rc.run_id, rc.sha256, rc.original_path, rc.size, rc.layout, rc.condition, b.file
     FROM run_captures rc JOIN blobs b ON b.sha256 = rc.sha256
     ${ids === undefined ? '' : 'WHERE rc.run_id = ANY($1::integer[])'} ORDER BY rc.run_id, rc.seq`,
    ids === undefined ? [] : [ids],
  ).rows;
  for (const r of rows) {
    const list = out.get(r.run_id) ?? [];
    list.push({ path: r.original_path, sha256: r.sha256, size: Number(r.size), layout: r.layout, condition: r.condition, archivePath: r.file });
    out.set(r.run_id, list);
  }
  return out;
}

/** Calibration runs (of one unit, or all) with their iterations, each re-hashed. */
export function pgReadCalibrationRows(client: PgSyncClient, unit?: string): { runs: StoredCalibrationRun[]; damaged: DamagedRow[] } {
  const runs = client.query<CalibrationRunRow>(`SELECT * FROM calibration_runs ${unit === undefined ? '' : 'WHERE unit = $1'} ORDER BY id`, unit === undefined ? [] : [unit]).rows;
  if (runs.length === 0) return { runs: [], damaged: [] };
  const ids = runs.map((r) => r.id);
  const iterations = client.query<IterationRow>('SELECT * FROM calibration_iterations WHERE calibration_id = ANY($1::integer[]) ORDER BY calibration_id, number', [ids]).rows;
  const captures = client.query<CalibrationCaptureRow>(
    `SELECT cc.iteration_id, cc.sha256, cc.original_path, cc.size, cc.layout, cc.step, b.file
     FROM calibration_captures cc JOIN blobs b ON b.sha256 = cc.sha256
     WHERE cc.iteration_id = ANY($1::integer[]) ORDER BY cc.iteration_id, cc.seq`,
    [iterations.map((i) => i.id)],
  ).rows;
  return assembleCalibrations(runs, iterations, captures);
}

/** Every chain entry in order, as arrays (chainRows on SQLite). */
export function pgChainRows(client: PgSyncClient): ChainArray[] {
  return client.queryArrays('SELECT seq, kind, row_id, row_digest, link FROM chain ORDER BY seq') as unknown as ChainArray[];
}

export function pgChainEntries(client: PgSyncClient): ChainEntry[] {
  return pgChainRows(client).map(entryOf);
}

/**
 * The SHA-256 of each stored capture's bytes as the chunks hold them now, computed by the server
 * (pg_catalog.sha256 over the chunks in order), so verifying does not move the archive over the
 * network. A capture whose chunks are gone or out of sequence hashes to null.
 */
export function pgCaptureHashes(client: PgSyncClient, sha256s?: readonly string[]): Map<string, string | null> {
  const rows = client.query<{ sha256: string; actual: string | null; size: string; parts: number; last: number | null }>(
    `SELECT b.sha256, b.size, COUNT(c.seq)::integer AS parts, MAX(c.seq) AS last,
       encode(pg_catalog.sha256(COALESCE(string_agg(c.bytes, ''::bytea ORDER BY c.seq), ''::bytea)), 'hex') AS actual
     FROM blobs b LEFT JOIN capture_chunks c ON c.sha256 = b.sha256
     ${sha256s === undefined ? '' : 'WHERE b.sha256 = ANY($1::text[])'} GROUP BY b.sha256, b.size`,
    sha256s === undefined ? [] : [sha256s],
  ).rows;
  const out = new Map<string, string | null>();
  for (const r of rows) out.set(r.sha256, r.parts === 0 || r.last !== r.parts - 1 ? null : r.actual);
  return out;
}

export function pgDistinct(client: PgSyncClient, column: 'unit' | 'spec_name'): string[] {
  return client.query<{ v: string }>(`SELECT DISTINCT ${column} AS v FROM runs ORDER BY v`).rows.map((r) => r.v);
}

export function pgCalibratedSerials(client: PgSyncClient): string[] {
  return client.query<{ unit: string }>('SELECT DISTINCT unit FROM calibration_runs ORDER BY unit').rows.map((r) => r.unit);
}

export function pgSpecText(client: PgSyncClient, sha256: string): string | undefined {
  const row = client.query<{ text: Buffer | null }>('SELECT text FROM specs WHERE sha256 = $1', [sha256]).rows[0];
  return row?.text ? Buffer.from(row.text).toString('utf8') : undefined;
}

/** The first run that recorded these bytes for this unit and condition (captureSeen.ts's rule). */
export function pgCaptureRecorded(client: PgSyncClient, key: { unit: string; condition: string; sha256: string; kind?: string }): number | undefined {
  return client.query<{ id: number }>(
    `SELECT rc.run_id AS id FROM run_captures rc JOIN runs r ON r.id = rc.run_id
     WHERE rc.sha256 = $1 AND rc.condition = $2 AND r.unit = $3 AND r.kind = $4 ORDER BY rc.run_id LIMIT 1`,
    [key.sha256, key.condition, key.unit, key.kind ?? 'check'],
  ).rows[0]?.id;
}

/** The captures of one run, in their order. */
export function pgRunCaptures(client: PgSyncClient, runId: number): StoredCapture[] {
  return pgCapturesByRun(client, [runId]).get(runId) ?? [];
}

/** Every run (or one unit's) with its summary columns, by unit and oldest first, in one query, as arrays (readSummaryArrays on SQLite). */
export function pgSummaryArrays(client: PgSyncClient, unit?: string): SummaryArray[] {
  return client.queryArrays(
    `SELECT ${SUMMARY_COLUMNS} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id ${unit === undefined ? '' : 'WHERE r.unit = $1'} ORDER BY r.unit, r.started_at, r.id`,
    unit === undefined ? [] : [unit],
  );
}

/** Every run as a listing reads it (listingColumns: whether its summary holds, hashed by the server), in pgSummaryArrays' order. */
export function pgListingArrays(client: PgSyncClient): SummaryArray[] {
  return client.queryArrays(`SELECT ${LISTING_PG} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id ORDER BY r.unit, r.started_at, r.id`);
}

const LISTING_PG = listingColumns('pg');

/** pgSummaryArrays as objects of one shape (the whole-store audit judges them so). */
export function pgSummaryRows(client: PgSyncClient, unit?: string): SummaryRow[] {
  return pgSummaryArrays(client, unit).map(summaryRowOf);
}

/** The compact checks of these runs, by run, in one query (their SHA-256 is in the verified summary). */
export function pgSummaryChecks(client: PgSyncClient, ids: readonly number[]): Map<number, string> {
  const out = new Map<number, string>();
  if (ids.length === 0) return out;
  const rows = client.queryArrays('SELECT run_id, checks_json FROM run_summary_checks WHERE run_id = ANY($1::integer[])', [ids]) as [number, unknown][];
  for (const [id, checks] of rows) out.set(id, String(checks));
  return out;
}
