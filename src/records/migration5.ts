/**
 * Schema 5: test attempts. A run now records which of its unit's test attempts it belongs to (the
 * unit's own count, from 1), why it opened a new one when it did, and the technician's note (what was
 * repaired or trimmed). The columns live on the run row, so the run's fingerprint (and through it the
 * hash chain) covers them; the append-only triggers still refuse any later change.
 * Runs stored before this schema keep NULL here and are grouped on reading by the rule a new run
 * follows (attempts.ts): a run continues its unit's latest attempt while that attempt still waits for
 * a condition, and opens the next one otherwise. Nothing stored before is changed.
 * Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';

export function migrateTo5(db: Database): void {
  db.exec(`
ALTER TABLE runs ADD COLUMN attempt INTEGER CHECK (attempt IS NULL OR attempt >= 1);
ALTER TABLE runs ADD COLUMN attempt_reason TEXT;
ALTER TABLE runs ADD COLUMN note TEXT;
CREATE INDEX runs_by_unit_attempt ON runs (unit, attempt);
`);
}
