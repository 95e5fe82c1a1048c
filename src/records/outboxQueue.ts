/**
 * The bench's outbox in its embedded store: a run stored here because the shared store could not be
 * reached is listed in `outbox` with the id the bench made for it, in the same transaction as the
 * run; `outbox_sent` records each one the shared store has confirmed (schema 6, migration6.ts).
 */
import type { Database } from 'better-sqlite3';
import { randomUUID } from 'node:crypto';

export type OutboxKind = 'run' | 'calibration';

/** List a row just stored in the outbox; call inside its write transaction. */
export function queueOutbox(db: Database, kind: OutboxKind, rowId: number, uid: string | undefined, at: string): void {
  db.prepare('INSERT INTO outbox (kind, row_id, uid, queued_at) VALUES (?, ?, ?, ?)').run(kind, rowId, uid ?? randomUUID(), at);
}

/** One row waiting for the shared store. */
export interface OutboxEntry {
  readonly kind: OutboxKind;
  readonly rowId: number;
  readonly uid: string;
  readonly unit: string;
  readonly queuedAt: string;
}

/** The rows not confirmed sent, in the order they were stored. */
export function unsentEntries(db: Database): OutboxEntry[] {
  const rows = db
    .prepare(
      `SELECT o.kind, o.row_id, o.uid, o.queued_at, COALESCE(r.unit, c.unit) AS unit
       FROM outbox o LEFT JOIN outbox_sent s ON s.kind = o.kind AND s.row_id = o.row_id
       LEFT JOIN runs r ON o.kind = 'run' AND r.id = o.row_id
       LEFT JOIN calibration_iterations i ON o.kind = 'calibration' AND i.id = o.row_id
       LEFT JOIN calibration_runs c ON c.id = i.calibration_id
       WHERE s.row_id IS NULL ORDER BY o.queued_at, o.kind DESC, o.row_id`,
    )
    .all() as { kind: OutboxKind; row_id: number; uid: string; queued_at: string; unit: string | null }[];
  return rows.map((r) => ({ kind: r.kind, rowId: r.row_id, uid: r.uid, unit: r.unit ?? '?', queuedAt: r.queued_at }));
}

export function markSent(db: Database, kind: OutboxKind, rowId: number, serverRow: number): void {
  db.prepare('INSERT OR IGNORE INTO outbox_sent (kind, row_id, sent_at, server_row) VALUES (?, ?, ?, ?)').run(kind, rowId, new Date().toISOString(), serverRow);
}
