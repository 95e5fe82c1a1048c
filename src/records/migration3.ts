/**
 * Schema 3: calibration runs. A calibration run groups the iterations of one unit (each a capture set
 * decided against the spec's calibration limits, with its trim guidance); each iteration keeps its
 * result as JSON with a SHA-256 fingerprint, and its captures in the content-addressed archive (the
 * `blobs` table shared with check runs). The new tables are append-only like the others.
 * Frozen: later changes go in a new numbered migration.
 */
import type { Database } from 'better-sqlite3';

const CALIBRATION_TABLES = ['calibration_runs', 'calibration_iterations', 'calibration_captures'];

const CALIBRATION_SQL = `
CREATE TABLE calibration_runs (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  unit TEXT NOT NULL,
  spec_name TEXT NOT NULL,
  spec_revision TEXT NOT NULL,
  spec_sha256 TEXT NOT NULL REFERENCES specs(sha256),
  started_at TEXT NOT NULL
);
CREATE INDEX calibration_runs_by_unit ON calibration_runs (unit, id);
CREATE TABLE calibration_iterations (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  calibration_id INTEGER NOT NULL REFERENCES calibration_runs(id),
  number INTEGER NOT NULL,
  started_at TEXT NOT NULL,
  stored_at TEXT NOT NULL,
  operator TEXT NOT NULL,
  station TEXT NOT NULL,
  tool_version TEXT NOT NULL,
  statement TEXT NOT NULL
    CHECK (statement IN ('pass', 'conditional-pass', 'conditional-fail', 'fail', 'not-measured')),
  meets_limits INTEGER NOT NULL CHECK (meets_limits IN (0, 1)),
  result_json TEXT NOT NULL,
  digest TEXT NOT NULL,
  UNIQUE (calibration_id, number)
);
CREATE TABLE calibration_captures (
  iteration_id INTEGER NOT NULL REFERENCES calibration_iterations(id),
  seq INTEGER NOT NULL,
  sha256 TEXT NOT NULL REFERENCES blobs(sha256),
  original_path TEXT NOT NULL,
  size INTEGER NOT NULL,
  layout TEXT NOT NULL,
  step TEXT NOT NULL,
  PRIMARY KEY (iteration_id, seq)
);
`;

function appendOnlySql(table: string): string {
  const abort = `SELECT RAISE(ABORT, 'benchproof records are append-only: ${table} rows are never changed or removed');`;
  return `CREATE TRIGGER ${table}_no_update BEFORE UPDATE ON ${table} BEGIN ${abort} END;
CREATE TRIGGER ${table}_no_delete BEFORE DELETE ON ${table} BEGIN ${abort} END;`;
}

export function migrateTo3(db: Database): void {
  db.exec(CALIBRATION_SQL);
  db.exec(CALIBRATION_TABLES.map(appendOnlySql).join('\n'));
}
