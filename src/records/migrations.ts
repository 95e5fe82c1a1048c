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

export interface Migration {
  readonly version: number;
  readonly name: string;
  readonly up: (db: Database) => void;
}

export const MIGRATIONS: readonly Migration[] = [
  { version: 1, name: 'runs, checks, causes and content-addressed captures', up: migrateTo1 },
  { version: 2, name: 'every measured value with its uncertainty; append-only triggers', up: migrateTo2 },
  { version: 3, name: 'calibration runs with their iterations', up: migrateTo3 },
];

export const LATEST_SCHEMA: number = MIGRATIONS[MIGRATIONS.length - 1].version;

export function schemaVersion(db: Database): number {
  return db.pragma('user_version', { simple: true }) as number;
}

/** Bring the database up to `upTo` (the latest by default); returns the version it ends at. */
export function applyMigrations(db: Database, dir: string, upTo: number = LATEST_SCHEMA): number {
  const found = schemaVersion(db);
  if (found > LATEST_SCHEMA) throw newerSchemaError(dir, found);
  for (const step of MIGRATIONS) {
    if (step.version > upTo) break;
    db.transaction(() => {
      if (schemaVersion(db) >= step.version) return;
      step.up(db);
      db.prepare('INSERT INTO schema_migrations (version, name, applied_at) VALUES (?, ?, ?)').run(
        step.version,
        step.name,
        new Date().toISOString(),
      );
      db.pragma(`user_version = ${step.version}`);
    }).immediate();
  }
  return schemaVersion(db);
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
