/**
 * The embedded store's reads of run summaries (runSummary.ts): every run joined with its summary in
 * one query (the listing and its verification), the checks of chosen runs in one query (batch
 * statistics), and a unit's run heads for placing a new run. Never one query per run or per unit.
 */
import type { Database } from 'better-sqlite3';
import type { StoredRun } from '../types/index.js';
import { readRunHeads } from './attempts.js';
import { lightRun, listingColumns, SQLITE_SHA256, SUMMARY_COLUMNS, summaryRowOf } from './runSummary.js';
import { sha256Hex } from './digest.js';
import type { SummaryArray, SummaryRow } from './runSummary.js';

/**
 * Every run (or one unit's) with its summary columns, by unit and oldest first within it (the order of
 * the runs_by_unit index, so SQLite sorts nothing), as arrays of the column values: better-sqlite3's
 * own row objects cost several times more to build and to collect.
 */
export function readSummaryArrays(db: Database, unit?: string): SummaryArray[] {
  const sql = `SELECT ${SUMMARY_COLUMNS} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id ${unit === undefined ? '' : 'WHERE r.unit = ?'} ORDER BY r.unit, r.started_at, r.id`;
  return db.prepare(sql).raw(true).all(...(unit === undefined ? [] : [unit])) as unknown[][];
}

/** Every run as a listing reads it (listingColumns: whether its summary holds, hashed as SQLite writes it), in readSummaryArrays' order. */
export function readListingArrays(db: Database): SummaryArray[] {
  // The text is hashed as SQLite writes it and dropped at once: only the answer reaches the rows.
  db.function(SQLITE_SHA256, { deterministic: true }, (text: unknown) => (typeof text === 'string' ? sha256Hex(text) : null));
  return db.prepare(`SELECT ${LISTING_SQLITE} FROM runs r LEFT JOIN run_summaries s ON s.run_id = r.id ORDER BY r.unit, r.started_at, r.id`).raw(true).all() as unknown[][];
}

const LISTING_SQLITE = listingColumns('sqlite');

/** readSummaryArrays as objects of one shape (the whole-store audit judges them so). */
export function readSummaryRows(db: Database, unit?: string): SummaryRow[] {
  return readSummaryArrays(db, unit).map(summaryRowOf);
}

/** The compact checks of these runs, by run (their SHA-256 is in the verified summary). */
export function readSummaryChecks(db: Database, ids: readonly number[]): Map<number, string> {
  const out = new Map<number, string>();
  if (ids.length === 0) return out;
  const rows = db.prepare('SELECT run_id, checks_json FROM run_summary_checks WHERE run_id IN (SELECT value FROM json_each(?))').raw(true).all(JSON.stringify(ids)) as [number, unknown][];
  for (const [id, checks] of rows) out.set(id, String(checks));
  return out;
}

/**
 * The unit's runs as placing a new run reads them (attempts.ts), from their summaries; a unit with a
 * run that has none (a store being upgraded, a run that failed its fingerprint) is read from the
 * verdicts as before schema 7.
 */
export function readSummaryHeads(db: Database, unit: string): StoredRun[] {
  const heads: StoredRun[] = [];
  for (const row of readSummaryArrays(db, unit)) {
    const run = lightRun(row);
    if (!run) return readRunHeads(db, unit);
    heads.push(run);
  }
  return heads;
}
