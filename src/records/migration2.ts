/**
 * Schema 2: (a) a `measurements` table with every measured value and its standard uncertainty (k = 1),
 * also those no spec limit applies to, filled for runs stored under schema 1 from their verdict JSON;
 * (b) triggers that make every record table append-only, so a stored run cannot be changed or removed
 * through SQL by accident. Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';
import type { UnitVerdict } from '../types/index.js';
import { insertMeasurements } from './measurementRows.js';

const RECORD_TABLES = ['runs', 'condition_results', 'checks', 'causes', 'blobs', 'run_captures', 'measurements'];

const MEASUREMENTS_SQL = `
CREATE TABLE measurements (
  run_id INTEGER NOT NULL REFERENCES runs(id),
  capture_index INTEGER NOT NULL,
  capture_sha256 TEXT NOT NULL,
  channel_index INTEGER NOT NULL,
  channel TEXT NOT NULL,
  measurement TEXT NOT NULL,
  value REAL,
  uncertainty REAL,
  unit TEXT NOT NULL,
  reason TEXT,
  method TEXT,
  PRIMARY KEY (run_id, capture_index, channel_index, measurement)
);
CREATE INDEX measurements_by_id ON measurements (measurement, run_id);
`;

function appendOnlySql(table: string): string {
  const abort = `SELECT RAISE(ABORT, 'benchproof records are append-only: ${table} rows are never changed or removed');`;
  return `CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN ${abort} END;
CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN ${abort} END;`;
}

export function migrateTo2(db: Database): void {
  db.exec(MEASUREMENTS_SQL);
  const rows = db.prepare('SELECT id, verdict_json FROM runs ORDER BY id').all() as { id: number; verdict_json: string }[];
  for (const row of rows) insertMeasurements(db, row.id, JSON.parse(row.verdict_json) as UnitVerdict);
  db.exec(RECORD_TABLES.map(appendOnlySql).join('\n'));
  // A spec's text may be added once when an earlier run stored only its identity, never changed after.
  db.exec(`CREATE TRIGGER specs_text_kept BEFORE UPDATE ON specs WHEN OLD.text IS NOT NULL
    BEGIN SELECT RAISE(ABORT, 'benchproof records are append-only: a stored spec text is never changed'); END;
CREATE TRIGGER specs_no_delete BEFORE DELETE ON specs
    BEGIN SELECT RAISE(ABORT, 'benchproof records are append-only: specs rows are never removed'); END;`);
}
