/**
 * Schema 1: runs with their spec identity, per-condition and per-check results, ranked causes, and the
 * captures each run used (content-addressed in `blobs`). Each run keeps its full verdict and diagnosis
 * as JSON, so reports render exactly what was decided; the columns beside it are for queries.
 * Frozen: later changes go in a new numbered migration, never here.
 */
import type { Database } from 'better-sqlite3';

export const MIGRATION_1_SQL = `
CREATE TABLE schema_migrations (
  version INTEGER PRIMARY KEY,
  name TEXT NOT NULL,
  applied_at TEXT NOT NULL
);
CREATE TABLE specs (
  sha256 TEXT PRIMARY KEY,
  name TEXT NOT NULL,
  revision TEXT NOT NULL,
  text BLOB
);
CREATE TABLE runs (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  unit TEXT NOT NULL,
  kind TEXT NOT NULL DEFAULT 'check',
  started_at TEXT NOT NULL,
  stored_at TEXT NOT NULL,
  operator TEXT NOT NULL,
  station TEXT NOT NULL,
  spec_name TEXT NOT NULL,
  spec_revision TEXT NOT NULL,
  spec_sha256 TEXT NOT NULL REFERENCES specs(sha256),
  tool_version TEXT NOT NULL,
  decision_rule TEXT NOT NULL,
  statement TEXT NOT NULL
    CHECK (statement IN ('pass', 'conditional-pass', 'conditional-fail', 'fail', 'not-measured')),
  verdict_json TEXT NOT NULL,
  diagnosis_json TEXT NOT NULL,
  digest TEXT NOT NULL
);
CREATE INDEX runs_by_unit ON runs (unit, started_at, id);
CREATE INDEX runs_by_spec ON runs (spec_name, started_at, id);
CREATE TABLE condition_results (
  run_id INTEGER NOT NULL REFERENCES runs(id),
  condition TEXT NOT NULL,
  statement TEXT NOT NULL,
  PRIMARY KEY (run_id, condition)
);
CREATE TABLE checks (
  run_id INTEGER NOT NULL REFERENCES runs(id),
  seq INTEGER NOT NULL,
  condition TEXT NOT NULL,
  output TEXT NOT NULL,
  measurement TEXT NOT NULL,
  unit TEXT NOT NULL,
  value REAL,
  expanded_uncertainty REAL,
  lower REAL,
  upper REAL,
  nominal REAL,
  guard REAL NOT NULL,
  margin REAL,
  statement TEXT NOT NULL,
  note TEXT,
  PRIMARY KEY (run_id, seq)
);
CREATE TABLE causes (
  run_id INTEGER NOT NULL REFERENCES runs(id),
  rank INTEGER NOT NULL,
  cause_id TEXT NOT NULL,
  title TEXT NOT NULL,
  score REAL NOT NULL,
  evidence_json TEXT NOT NULL,
  confirm TEXT NOT NULL,
  PRIMARY KEY (run_id, rank)
);
CREATE TABLE blobs (
  sha256 TEXT PRIMARY KEY,
  size INTEGER NOT NULL,
  file TEXT NOT NULL,
  first_stored_at TEXT NOT NULL
);
CREATE TABLE run_captures (
  run_id INTEGER NOT NULL REFERENCES runs(id),
  seq INTEGER NOT NULL,
  sha256 TEXT NOT NULL REFERENCES blobs(sha256),
  original_path TEXT NOT NULL,
  size INTEGER NOT NULL,
  layout TEXT NOT NULL,
  condition TEXT NOT NULL,
  PRIMARY KEY (run_id, seq)
);
`;

export function migrateTo1(db: Database): void {
  db.exec(MIGRATION_1_SQL);
}
