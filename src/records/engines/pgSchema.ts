/**
 * The shared store's schema on PostgreSQL: the same numbered steps as the embedded store
 * (migrations.ts), each written in PostgreSQL's dialect, with the same tables, columns, checks and
 * append-only rule (a trigger that refuses every UPDATE and DELETE on a record table). The capture
 * bytes live in the database too, in `capture_chunks` (pgCaptures.ts), so every bench reads the
 * same archive without a shared folder.
 *
 * PostgreSQL has no `user_version`; the schema version is the last step in `schema_migrations`.
 * Its DDL is transactional, so a step's tables and its log row commit together or not at all, and
 * the log cannot disagree with the tables the way an SQLite dump can. Each step runs in its own
 * transaction under a transaction-level advisory lock and re-reads the version inside it, so two
 * benches opening a new store at once apply each step exactly once. A newer schema is refused
 * (`records.newer-schema`), never migrated over.
 *
 * The data-moving parts of steps 2 and 4 (filling measurements and the chain from older rows) have
 * nothing to move in a store that starts at step 1 empty; records come in through saving or
 * `store copy`, both at the latest schema. Step 7 does move data: a shared store in use at schema 6
 * holds runs, whose summaries it fills (PG_FILLS).
 */
import { BenchError } from '../../types/index.js';
import { LATEST_SCHEMA, MIGRATIONS } from '../migrations.js';
import type { PgSyncClient } from './pgSync.js';
import { PgCallError } from './pgSync.js';
import { fillSummaries } from '../migration7.js';
import type { RunRow } from '../readRuns.js';
import { pgCapturesByRun } from './pgReads.js';
import { WRITE_LOCK, pgChainHead, pgInsertSummary } from './pgSaveRun.js';

/** Any fixed 64-bit number, used only to serialize schema changes between benches (pg_advisory_xact_lock). */
const SCHEMA_LOCK = 2_026_120_520;

const appendOnly = (table: string): string => `
CREATE TRIGGER ${table}_append_only BEFORE UPDATE OR DELETE ON ${table}
  FOR EACH ROW EXECUTE FUNCTION benchproof_append_only();`;

const STATEMENT_CHECK = "CHECK (statement IN ('pass', 'conditional-pass', 'conditional-fail', 'fail', 'not-measured'))";

const STEP_1 = `
CREATE TABLE schema_migrations (version integer PRIMARY KEY, name text NOT NULL, applied_at text NOT NULL);
CREATE TABLE specs (sha256 text PRIMARY KEY, name text NOT NULL, revision text NOT NULL, text bytea);
CREATE TABLE runs (
  id integer GENERATED ALWAYS AS IDENTITY PRIMARY KEY,
  unit text NOT NULL, kind text NOT NULL DEFAULT 'check', started_at text NOT NULL, stored_at text NOT NULL,
  operator text NOT NULL, station text NOT NULL, spec_name text NOT NULL, spec_revision text NOT NULL,
  spec_sha256 text NOT NULL REFERENCES specs(sha256), tool_version text NOT NULL, decision_rule text NOT NULL,
  statement text NOT NULL ${STATEMENT_CHECK},
  verdict_json text NOT NULL, diagnosis_json text NOT NULL, digest text NOT NULL);
CREATE INDEX runs_by_unit ON runs (unit, started_at, id);
CREATE INDEX runs_by_spec ON runs (spec_name, started_at, id);
CREATE TABLE condition_results (run_id integer NOT NULL REFERENCES runs(id), condition text NOT NULL, statement text NOT NULL, PRIMARY KEY (run_id, condition));
CREATE TABLE checks (
  run_id integer NOT NULL REFERENCES runs(id), seq integer NOT NULL, condition text NOT NULL, output text NOT NULL,
  measurement text NOT NULL, unit text NOT NULL, value double precision, expanded_uncertainty double precision,
  lower double precision, upper double precision, nominal double precision, guard double precision NOT NULL,
  margin double precision, statement text NOT NULL, note text, PRIMARY KEY (run_id, seq));
CREATE TABLE causes (
  run_id integer NOT NULL REFERENCES runs(id), rank integer NOT NULL, cause_id text NOT NULL, title text NOT NULL,
  score double precision NOT NULL, evidence_json text NOT NULL, confirm text NOT NULL, PRIMARY KEY (run_id, rank));
CREATE TABLE blobs (sha256 text PRIMARY KEY, size bigint NOT NULL, file text NOT NULL, first_stored_at text NOT NULL);
CREATE TABLE capture_chunks (
  sha256 text NOT NULL REFERENCES blobs(sha256), seq integer NOT NULL CHECK (seq >= 0), bytes bytea NOT NULL,
  PRIMARY KEY (sha256, seq));
CREATE TABLE run_captures (
  run_id integer NOT NULL REFERENCES runs(id), seq integer NOT NULL, sha256 text NOT NULL REFERENCES blobs(sha256),
  original_path text NOT NULL, size bigint NOT NULL, layout text NOT NULL, condition text NOT NULL, PRIMARY KEY (run_id, seq));
`;

const STEP_2 = `
CREATE TABLE measurements (
  run_id integer NOT NULL REFERENCES runs(id), capture_index integer NOT NULL, capture_sha256 text NOT NULL,
  channel_index integer NOT NULL, channel text NOT NULL, measurement text NOT NULL, value double precision,
  uncertainty double precision, unit text NOT NULL, reason text, method text,
  PRIMARY KEY (run_id, capture_index, channel_index, measurement));
CREATE INDEX measurements_by_id ON measurements (measurement, run_id);
CREATE FUNCTION benchproof_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_TABLE_NAME = 'specs' AND TG_OP = 'UPDATE' AND OLD.text IS NULL
     AND NEW.sha256 = OLD.sha256 AND NEW.name = OLD.name AND NEW.revision = OLD.revision THEN
    RETURN NEW; -- a spec's text may be added once when an earlier run stored only its identity
  END IF;
  RAISE EXCEPTION 'benchproof records are append-only: % rows are never changed or removed', TG_TABLE_NAME
    USING ERRCODE = 'restrict_violation';
END $$;
${['runs', 'condition_results', 'checks', 'causes', 'blobs', 'capture_chunks', 'run_captures', 'measurements', 'specs'].map(appendOnly).join('')}
`;

const STEP_3 = `
CREATE TABLE calibration_runs (
  id integer GENERATED ALWAYS AS IDENTITY PRIMARY KEY, unit text NOT NULL, spec_name text NOT NULL,
  spec_revision text NOT NULL, spec_sha256 text NOT NULL REFERENCES specs(sha256), started_at text NOT NULL);
CREATE INDEX calibration_runs_by_unit ON calibration_runs (unit, id);
CREATE TABLE calibration_iterations (
  id integer GENERATED ALWAYS AS IDENTITY PRIMARY KEY, calibration_id integer NOT NULL REFERENCES calibration_runs(id),
  number integer NOT NULL, started_at text NOT NULL, stored_at text NOT NULL, operator text NOT NULL, station text NOT NULL,
  tool_version text NOT NULL, statement text NOT NULL ${STATEMENT_CHECK},
  meets_limits integer NOT NULL CHECK (meets_limits IN (0, 1)), result_json text NOT NULL, digest text NOT NULL,
  UNIQUE (calibration_id, number));
CREATE TABLE calibration_captures (
  iteration_id integer NOT NULL REFERENCES calibration_iterations(id), seq integer NOT NULL,
  sha256 text NOT NULL REFERENCES blobs(sha256), original_path text NOT NULL, size bigint NOT NULL, layout text NOT NULL,
  step text NOT NULL, PRIMARY KEY (iteration_id, seq));
${['calibration_runs', 'calibration_iterations', 'calibration_captures'].map(appendOnly).join('')}
`;

const STEP_4 = `
CREATE TABLE chain (
  seq integer GENERATED ALWAYS AS IDENTITY PRIMARY KEY, kind text NOT NULL, row_id integer NOT NULL,
  row_digest text NOT NULL, link text NOT NULL, UNIQUE (kind, row_id));
${appendOnly('chain')}
`;

const STEP_5 = `
ALTER TABLE runs ADD COLUMN attempt integer CHECK (attempt IS NULL OR attempt >= 1);
ALTER TABLE runs ADD COLUMN attempt_reason text;
ALTER TABLE runs ADD COLUMN note text;
CREATE INDEX runs_by_unit_attempt ON runs (unit, attempt);
`;

const STEP_6 = `
ALTER TABLE runs ADD COLUMN origin_uid text;
ALTER TABLE runs ADD COLUMN origin_digest text;
CREATE UNIQUE INDEX runs_by_origin ON runs (origin_uid) WHERE origin_uid IS NOT NULL;
ALTER TABLE calibration_iterations ADD COLUMN origin_uid text;
ALTER TABLE calibration_iterations ADD COLUMN origin_digest text;
CREATE UNIQUE INDEX calibration_iterations_by_origin ON calibration_iterations (origin_uid) WHERE origin_uid IS NOT NULL;
CREATE TABLE outbox (
  kind text NOT NULL CHECK (kind IN ('run', 'calibration')), row_id integer NOT NULL, uid text NOT NULL UNIQUE,
  queued_at text NOT NULL, PRIMARY KEY (kind, row_id));
CREATE TABLE outbox_sent (
  kind text NOT NULL, row_id integer NOT NULL, sent_at text NOT NULL, server_row integer NOT NULL,
  PRIMARY KEY (kind, row_id), FOREIGN KEY (kind, row_id) REFERENCES outbox (kind, row_id));
${['outbox', 'outbox_sent'].map(appendOnly).join('')}
-- PL/pgSQL does not promise to stop at the first false AND: the spec-text test now only runs on specs,
-- so a refused change of another table names the append-only rule instead of failing on OLD.text.
CREATE OR REPLACE FUNCTION benchproof_append_only() RETURNS trigger LANGUAGE plpgsql AS $$
BEGIN
  IF TG_TABLE_NAME = 'specs' AND TG_OP = 'UPDATE' THEN
    IF OLD.text IS NULL AND NEW.sha256 = OLD.sha256 AND NEW.name = OLD.name AND NEW.revision = OLD.revision THEN
      RETURN NEW; -- a spec's text may be added once when an earlier run stored only its identity
    END IF;
  END IF;
  RAISE EXCEPTION 'benchproof records are append-only: % rows are never changed or removed', TG_TABLE_NAME
    USING ERRCODE = 'restrict_violation';
END $$;
`;

const STEP_7 = `
CREATE TABLE run_summaries (
  run_id integer PRIMARY KEY REFERENCES runs(id), run_digest text NOT NULL, attempt integer, attempt_reason text, note text,
  verdict_sha256 text NOT NULL, checks_sha256 text NOT NULL, state_json text NOT NULL, digest text NOT NULL);
CREATE TABLE run_summary_checks (run_id integer PRIMARY KEY REFERENCES run_summaries(run_id), checks_json text NOT NULL);
${appendOnly('run_summaries')}${appendOnly('run_summary_checks')}
`;

/** The PostgreSQL form of each numbered step, in the order of MIGRATIONS. */
export const PG_STEPS: readonly string[] = [STEP_1, STEP_2, STEP_3, STEP_4, STEP_5, STEP_6, STEP_7];

/**
 * Data a step moves, run in the step's transaction after its DDL. Step 7 summarises the runs a shared
 * store already holds (migration7.ts), under the write lock too, so no bench adds a link meanwhile.
 */
const PG_FILLS: Readonly<Record<number, (client: PgSyncClient) => void>> = {
  7: (client) => {
    client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
    fillSummaries(
      (after) => {
        const rows = client.query<RunRow>('SELECT * FROM runs WHERE id > $1 ORDER BY id LIMIT 200', [after]).rows;
        return { rows, captures: pgCapturesByRun(client, rows.map((r) => r.id)) };
      },
      (runId, summary) => pgInsertSummary(client, runId, summary, pgChainHead(client)),
    );
  },
};

/** The schema version of the shared store: 0 when it has no benchproof tables yet. */
export function pgSchemaVersion(client: PgSyncClient): number {
  const has = client.query<{ t: string | null }>("SELECT to_regclass('schema_migrations')::text AS t").rows[0].t;
  if (has === null) return 0;
  return client.query<{ v: number | null }>('SELECT MAX(version) AS v FROM schema_migrations').rows[0].v ?? 0;
}

/**
 * The version as a bench opening the store finds it, in one statement (every command opens the store,
 * so this is on every check's path): the log read directly, a store without one being version 0.
 * Outside any transaction, so the error of a missing table aborts nothing.
 */
function openingVersion(client: PgSyncClient): number {
  try {
    return client.query<{ v: number | null }>('SELECT MAX(version) AS v FROM schema_migrations').rows[0].v ?? 0;
  } catch (err) {
    // 42P01 undefined_table: no benchproof tables yet.
    if (err instanceof PgCallError && err.code === '42P01') return 0;
    throw err;
  }
}

/** Bring the shared store up to the latest schema; returns the version. `shown` names it in errors. */
export function applyPgMigrations(client: PgSyncClient, shown: string): number {
  if (PG_STEPS.length !== MIGRATIONS.length) throw new RangeError(`the PostgreSQL schema has ${PG_STEPS.length} steps, the embedded one ${MIGRATIONS.length}`);
  const found = openingVersion(client);
  if (found > LATEST_SCHEMA) throw newerPgSchema(shown, found);
  if (found === LATEST_SCHEMA) return found;
  MIGRATIONS.forEach((step, i) => {
    client.transaction(() => {
      client.query('SELECT pg_advisory_xact_lock($1)', [SCHEMA_LOCK]);
      const now = pgSchemaVersion(client);
      if (now > LATEST_SCHEMA) throw newerPgSchema(shown, now);
      if (now >= step.version) return;
      client.query(PG_STEPS[i]);
      PG_FILLS[step.version]?.(client);
      client.query('INSERT INTO schema_migrations (version, name, applied_at) VALUES ($1, $2, $3)', [step.version, step.name, new Date().toISOString()]);
    });
  });
  return pgSchemaVersion(client);
}

function newerPgSchema(shown: string, found: number): BenchError {
  return new BenchError({
    code: 'records.newer-schema',
    file: shown,
    problem: `the shared store was written by a newer benchproof (schema ${found}; this one knows up to ${LATEST_SCHEMA})`,
    expected: `a store with schema ${LATEST_SCHEMA} or older`,
    fix: 'update benchproof on this computer; the records are left untouched',
  });
}
