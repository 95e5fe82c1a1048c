/**
 * Has a capture already been recorded? Runs link their captures by SHA-256 and condition
 * (`run_captures`, schema 1), so "these bytes, for this unit at this condition" is one query.
 * `saveRunOnce` makes that question and the insert one immediate transaction: two processes that
 * land the same file at the same moment (two `watch` sessions on one folder and one data folder)
 * store it once, because SQLite lets only one writer hold the write lock (sqlite.org/lang_transaction.html).
 */
import type { Database } from 'better-sqlite3';
import type { NewRun, RunKind, StoredRun } from '../types/index.js';
import { saveRun } from './saveRun.js';
import type { SaveHooks } from './saveRun.js';

/** One capture as the idempotency rule sees it. */
export interface CaptureKey {
  readonly unit: string;
  readonly condition: string;
  readonly sha256: string;
  /** Runs of this kind only ('check' by default). */
  readonly kind?: RunKind;
}

/** What `saveRunOnce` did: stored the run, or found every capture of it recorded already. */
export type SaveOnceResult = { readonly stored: true; readonly run: StoredRun } | { readonly stored: false; readonly runId: number };

/** The first run that recorded these bytes for this unit and condition, or undefined. */
export function captureRecorded(db: Database, key: CaptureKey): number | undefined {
  const row = db
    .prepare(
      `SELECT rc.run_id AS id FROM run_captures rc JOIN runs r ON r.id = rc.run_id
       WHERE rc.sha256 = ? AND rc.condition = ? AND r.unit = ? AND r.kind = ? ORDER BY rc.run_id LIMIT 1`,
    )
    .get(key.sha256, key.condition, key.unit, key.kind ?? 'check') as { id: number } | undefined;
  return row?.id;
}

/**
 * Store the run unless each of its captures is recorded already for its unit and condition; the
 * check runs inside the same write transaction as the insert (saveRun's own transaction nests as a
 * savepoint), so no other writer can slip in between.
 */
export function saveRunOnce(db: Database, dataDir: string, run: NewRun, hooks: SaveHooks = {}): SaveOnceResult {
  if (run.captures.length === 0) throw new RangeError(`saveRunOnce: run of ${run.unit} has no captures to decide on`);
  const once = db.transaction((): SaveOnceResult => {
    const earlier = run.captures.map((c) => captureRecorded(db, { unit: run.unit, condition: c.condition, sha256: c.sha256, kind: run.kind }));
    if (earlier.every((id) => id !== undefined)) return { stored: false, runId: Math.min(...(earlier as number[])) };
    return { stored: true, run: saveRun(db, dataDir, run, hooks) };
  });
  return once.immediate();
}
