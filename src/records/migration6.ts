/**
 * Schema 6: several benches, one record. A run or calibration iteration that reached the shared
 * store from a bench's outbox (or a copy-over) carries the id the bench made for it (`origin_uid`,
 * unique: pushing it twice stores it once) and the fingerprint it had on the bench (`origin_digest`).
 * On a bench, `outbox` lists the runs stored here because the shared store could not be reached,
 * each with its id; `outbox_sent` records each one the shared store has confirmed. Both are
 * append-only like every record table: an entry is never changed, a sent mark never taken back.
 * The same step is applied to both engines (pgSchema.ts), so the two stores have one schema.
 * Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';

const APPEND_ONLY = ['outbox', 'outbox_sent'].map((table) => {
  const abort = `SELECT RAISE(ABORT, 'benchproof records are append-only: ${table} rows are never changed or removed');`;
  return `CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN ${abort} END;
CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN ${abort} END;`;
});

export function migrateTo6(db: Database): void {
  db.exec(`
ALTER TABLE runs ADD COLUMN origin_uid TEXT;
ALTER TABLE runs ADD COLUMN origin_digest TEXT;
CREATE UNIQUE INDEX runs_by_origin ON runs (origin_uid) WHERE origin_uid IS NOT NULL;
ALTER TABLE calibration_iterations ADD COLUMN origin_uid TEXT;
ALTER TABLE calibration_iterations ADD COLUMN origin_digest TEXT;
CREATE UNIQUE INDEX calibration_iterations_by_origin ON calibration_iterations (origin_uid) WHERE origin_uid IS NOT NULL;
CREATE TABLE outbox (
  kind TEXT NOT NULL CHECK (kind IN ('run', 'calibration')), row_id INTEGER NOT NULL, uid TEXT NOT NULL UNIQUE,
  queued_at TEXT NOT NULL, PRIMARY KEY (kind, row_id));
CREATE TABLE outbox_sent (
  kind TEXT NOT NULL, row_id INTEGER NOT NULL, sent_at TEXT NOT NULL, server_row INTEGER NOT NULL,
  PRIMARY KEY (kind, row_id), FOREIGN KEY (kind, row_id) REFERENCES outbox (kind, row_id));
${APPEND_ONLY.join('\n')}
`);
}
