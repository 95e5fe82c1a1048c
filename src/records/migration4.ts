/**
 * Schema 4: the hash chain (chain.ts). One append-only table of entries, one per fingerprinted row,
 * in insertion order. Rows stored before this schema are chained here in the order they were stored
 * (storing time, then kind, then number), with the fingerprints they carry, so the chain pins the
 * store as it was found; a row already changed before the upgrade still fails its own fingerprint.
 * Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';
import { appendLink } from './chain.js';
import type { ChainKind } from './chain.js';

const CHAIN_SQL = `
CREATE TABLE chain (
  seq INTEGER PRIMARY KEY AUTOINCREMENT,
  kind TEXT NOT NULL,
  row_id INTEGER NOT NULL,
  row_digest TEXT NOT NULL,
  link TEXT NOT NULL,
  UNIQUE (kind, row_id)
);
CREATE TRIGGER chain_no_update BEFORE UPDATE ON chain
  BEGIN SELECT RAISE(ABORT, 'benchproof records are append-only: chain rows are never changed or removed'); END;
CREATE TRIGGER chain_no_delete BEFORE DELETE ON chain
  BEGIN SELECT RAISE(ABORT, 'benchproof records are append-only: chain rows are never changed or removed'); END;
`;

export function migrateTo4(db: Database): void {
  db.exec(CHAIN_SQL);
  const rows = db
    .prepare(
      `SELECT 'run' AS kind, id, stored_at, digest FROM runs
       UNION ALL SELECT 'calibration' AS kind, id, stored_at, digest FROM calibration_iterations
       ORDER BY stored_at, kind DESC, id`,
    )
    .all() as { kind: ChainKind; id: number; digest: string }[];
  for (const r of rows) appendLink(db, r.kind, r.id, r.digest);
}
