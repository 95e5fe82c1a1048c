/**
 * Numbered schema migrations, applied in order when a store is opened. `PRAGMA user_version` holds the
 * schema number; `schema_migrations` keeps when each step ran. Every step runs in its own immediate
 * transaction and re-reads the version inside it, so two processes opening an old store at once apply
 * each step exactly once. To change the schema, append a step; never edit a released one.
 */
import type { Database } from 'better-sqlite3';
import { BenchError } from '../types/index.js';
import { migrateTo1 } from './migration1.js';
import { migrateTo2 } from './migration2.js';
import { migrateTo3 } from './migration3.js';
import { migrateTo4 } from './migration4.js';
import { migrateTo5 } from './migration5.js';
import { migrateTo6 } from './migration6.js';
import { migrateTo7 } from './migration7.js';

export interface Migration {
  readonly version: number;
  readonly name: string;
  readonly up: (db: Database) => void;
}

export const MIGRATIONS: readonly Migration[] = [
  { version: 1, name: 'runs, checks, causes and content-addressed captures', up: migrateTo1 },
  { version: 2, name: 'every measured value with its uncertainty; append-only triggers', up: migrateTo2 },
  { version: 3, name: 'calibration runs with their iterations', up: migrateTo3 },
  { version: 4, name: 'hash chain over every stored run and iteration', up: migrateTo4 },
  { version: 5, name: 'test attempts: attempt number, reason and note on each run', up: migrateTo5 },
  { version: 6, name: 'shared store: origin id and fingerprint of pushed rows; the bench outbox', up: migrateTo6 },
  { version: 7, name: 'a light summary of every run, fingerprinted and chained, for listings', up: migrateTo7 },
];

export const LATEST_SCHEMA: number = MIGRATIONS[MIGRATIONS.length - 1].version;

export function schemaVersion(db: Database): number {
  return db.pragma('user_version', { simple: true }) as number;
}

/** Tables every benchproof store has once migrated; a database without them is not one. */
const REQUIRED_TABLES = ['schema_migrations', 'specs', 'runs', 'blobs', 'run_captures', 'calibration_iterations', 'chain', 'run_summaries'];

/**
 * Bring the database up to `upTo` (the latest by default); returns the version it ends at. A version
 * that disagrees with the database (negative, reset to 0 over existing tables as an SQL dump restore
 * leaves it, or other than the steps `schema_migrations` says ran) is refused, never migrated over.
 */
export function applyMigrations(db: Database, dir: string, upTo: number = LATEST_SCHEMA): number {
  const found = checkStoreSchema(db, dir);
  for (const step of MIGRATIONS) {
    if (step.version > upTo) break;
    db.transaction(() => {
      if (schemaVersion(db) >= step.version) return;
      try {
        step.up(db);
      } catch (err) {
        throw mismatchError(dir, found, `migrating to schema ${step.version} failed (${(err as Error).message})`);
      }
      db.prepare('INSERT INTO schema_migrations (version, name, applied_at) VALUES (?, ?, ?)').run(
        step.version,
        step.name,
        new Date().toISOString(),
      );
      db.pragma(`user_version = ${step.version}`);
    }).immediate();
  }
  const version = schemaVersion(db);
  if (version === LATEST_SCHEMA) {
    const missing = REQUIRED_TABLES.filter((t) => !tableExists(db, t));
    if (missing.length) throw mismatchError(dir, version, `the tables ${missing.join(', ')} are missing`);
  }
  return version;
}

/**
 * The schema version found, after checking that it agrees with the database: read in one read
 * transaction, so the version and the tables are seen in one snapshot even while another process
 * applies a step. Reads only: openStore calls it before anything (even the journal mode) is written.
 */
export function checkStoreSchema(db: Database, dir: string): number {
  return db.transaction(() => {
    const v = schemaVersion(db);
    if (v > LATEST_SCHEMA) throw newerSchemaError(dir, v);
    checkVersionAgrees(db, dir, v);
    return v;
  })();
}

function tableExists(db: Database, name: string): boolean {
  return db.prepare("SELECT 1 FROM sqlite_master WHERE type = 'table' AND name = ?").get(name) !== undefined;
}

function checkVersionAgrees(db: Database, dir: string, found: number): void {
  if (!Number.isInteger(found) || found < 0) throw mismatchError(dir, found, 'a schema version below 0 is never written by benchproof');
  const tables = (db.prepare("SELECT name FROM sqlite_master WHERE type = 'table' AND name NOT LIKE 'sqlite_%'").all() as { name: string }[]).map((r) => r.name);
  if (found === 0) {
    if (tables.length === 0) return;
    const ran = tables.includes('schema_migrations') ? lastStep(db) : null;
    if (ran === null && !tables.includes('runs')) throw foreignError(dir, tables);
    throw mismatchError(dir, found, ran === null ? 'the migration log is missing' : `its own migration log says schema ${ran} (an SQL dump does not carry the schema version)`);
  }
  const ran = tables.includes('schema_migrations') ? lastStep(db) : null;
  if (ran !== found) throw mismatchError(dir, found, ran === null ? 'the migration log is missing' : `its own migration log says schema ${ran}`);
}

function lastStep(db: Database): number | null {
  const row = db.prepare('SELECT MAX(version) AS v FROM schema_migrations').get() as { v: number | null } | undefined;
  return row?.v ?? null;
}

/** Another program's SQLite database where records.db should be: damaged for benchproof, never migrated over. */
function foreignError(dir: string, tables: readonly string[]): BenchError {
  return new BenchError({
    code: 'records.damaged',
    file: dir,
    problem: `records.db is an SQLite database of another program (tables ${tables.slice(0, 4).join(', ')}), not a benchproof store; it was left untouched`,
    expected: 'the records.db benchproof wrote in this data folder',
    fix: 'restore records.db from your last backup, or give another folder with --data DIR',
  });
}

function mismatchError(dir: string, found: number, why: string): BenchError {
  return new BenchError({
    code: 'records.schema-mismatch',
    file: dir,
    problem: `the record database says schema version ${found}, but ${why}; it was left untouched`,
    expected: `a benchproof store at schema 1 to ${LATEST_SCHEMA} whose version agrees with its tables`,
    fix: 'restore records.db from your last backup (a copy of the file, not an SQL dump), or give another folder with --data DIR',
  });
}

function newerSchemaError(dir: string, found: number): BenchError {
  return new BenchError({
    code: 'records.newer-schema',
    file: dir,
    problem: `the records were written by a newer benchproof (schema ${found}; this one knows up to ${LATEST_SCHEMA})`,
    expected: `a data folder with schema ${LATEST_SCHEMA} or older`,
    fix: 'update benchproof on this computer; the records are left untouched',
  });
}
