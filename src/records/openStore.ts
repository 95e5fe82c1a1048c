/**
 * The record store: one SQLite database (`records.db`, WAL journal, full sync) plus the capture archive
 * in a data folder. Opening applies pending migrations. A busy timeout lets several benchproof
 * processes write at once; problems with the folder become BenchErrors (exit 2).
 */
import Database from 'better-sqlite3';
import type { Database as Db } from 'better-sqlite3';
import { existsSync, mkdirSync, statSync } from 'node:fs';
import { join } from 'node:path';
import type { NewCalibrationIteration, NewRun, StoredCalibrationRun, StoredRun, UnitRecord, UnitSummary } from '../types/index.js';
import { removeStaleTemps } from './archive.js';
import { LATEST_SCHEMA, applyMigrations } from './migrations.js';
import { distinct, readRuns, specText } from './readRuns.js';
import type { RunFilter } from './readRuns.js';
import { saveRun } from './saveRun.js';
import type { SaveHooks } from './saveRun.js';
import { missingError, noRecordsError, openError, storeError } from './storeErrors.js';
import { buildUnitRecord, listUnits } from './unitSummaries.js';
import { calibratedSerials, readCalibrations, withCalibrations } from './calibrationRead.js';
import { saveCalibration } from './calibrationSave.js';
import type { SavedIteration } from './calibrationSave.js';
import { captureRecorded, saveRunOnce } from './captureSeen.js';
import type { CaptureKey, SaveOnceResult } from './captureSeen.js';

export const DATABASE_FILE = 'records.db';

export interface OpenStoreOptions {
  /** 'write' creates the folder (not its parents) when missing; 'read' needs records to exist. */
  readonly mode?: 'write' | 'read';
  /** How long to wait for another writer, in ms (default 15 000). */
  readonly busyTimeoutMs?: number;
  /** Migrate only up to this schema (for migration tests); the latest by default. */
  readonly schemaVersion?: number;
  /** The folder as the user wrote it (e.g. `./benchproof-data`), for error messages. */
  readonly label?: string;
}

export interface RecordStore {
  readonly dir: string;
  readonly dbFile: string;
  readonly schemaVersion: number;
  /** Store one run (captures archived, all rows in one transaction); returns it as stored. */
  saveRun(run: NewRun, hooks?: SaveHooks): StoredRun;
  listUnits(filter?: { readonly spec?: string }): UnitSummary[];
  unitRecord(serial: string): UnitRecord | undefined;
  runs(filter?: RunFilter): StoredRun[];
  unitSerials(): string[];
  specNames(): string[];
  specText(sha256: string): string | undefined;
  /** `PRAGMA integrity_check` lines; `['ok']` for a sound database. */
  integrityCheck(): string[];
  close(): void;
  /** The first run that recorded these capture bytes for this unit and condition (watch's idempotency). */
  captureRecorded(key: CaptureKey): number | undefined;
  /** saveRun, unless every capture of the run is recorded already; checked inside the write transaction. */
  saveRunOnce(run: NewRun, hooks?: SaveHooks): SaveOnceResult;
  /** Store one calibration iteration (joining the unit's open calibration run, or starting one) in one transaction. */
  saveCalibration(iteration: NewCalibrationIteration): SavedIteration;
  /** The unit's calibration runs with their iterations, oldest first. */
  calibrations(serial: string): StoredCalibrationRun[];
}

export function openStore(dir: string, options: OpenStoreOptions = {}): RecordStore {
  const { mode = 'write', busyTimeoutMs = 15_000, schemaVersion: upTo = LATEST_SCHEMA, label = dir } = options;
  prepareFolder(dir, mode, label);
  const dbFile = join(dir, DATABASE_FILE);
  let db: Db | undefined;
  let version: number;
  try {
    db = new Database(dbFile, { timeout: busyTimeoutMs, fileMustExist: mode === 'read' });
    db.pragma('journal_mode = WAL');
    db.pragma('synchronous = FULL');
    db.pragma('foreign_keys = ON');
    version = applyMigrations(db, label, upTo);
    if (mode === 'write') removeStaleTemps(dir);
  } catch (err) {
    // Closed at once, so a long-running watch does not collect open handles on a failing disk.
    db?.close();
    throw openError(err, dir, label, mode);
  }
  return wrap(db, dir, dbFile, version, label);
}

function prepareFolder(dir: string, mode: 'write' | 'read', label: string): void {
  if (existsSync(dir)) {
    if (!statSync(dir).isDirectory()) throw missingError(label);
    if (mode === 'read' && !existsSync(join(dir, DATABASE_FILE))) throw noRecordsError(label);
    return;
  }
  if (mode === 'read') throw noRecordsError(label);
  try {
    mkdirSync(dir);
  } catch (err) {
    // Another process may have created it a moment ago; that is fine.
    if ((err as { code?: string }).code === 'EEXIST' && statSync(dir).isDirectory()) return;
    throw storeError(err, label);
  }
}

function guarded<T>(label: string, fn: () => T): T {
  try {
    return fn();
  } catch (err) {
    throw storeError(err, label);
  }
}

function wrap(db: Db, dir: string, dbFile: string, version: number, label: string): RecordStore {
  return {
    dir,
    dbFile,
    schemaVersion: version,
    saveRun: (run, hooks) => guarded(label, () => saveRun(db, dir, run, hooks)),
    listUnits: (filter = {}) => guarded(label, () => listUnits(db, filter.spec)),
    unitRecord: (serial) => guarded(label, () => withCalibrations(buildUnitRecord(serial, readRuns(db, { unit: serial })), serial, readCalibrations(db, serial))),
    runs: (filter) => guarded(label, () => readRuns(db, filter)),
    unitSerials: () => guarded(label, () => [...new Set([...distinct(db, 'unit'), ...calibratedSerials(db)])].sort()),
    specNames: () => guarded(label, () => distinct(db, 'spec_name')),
    specText: (sha256) => guarded(label, () => specText(db, sha256)),
    integrityCheck: () => guarded(label, () => (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check)),
    close: () => db.close(),
    captureRecorded: (key) => guarded(label, () => captureRecorded(db, key)),
    saveRunOnce: (run, hooks) => guarded(label, () => saveRunOnce(db, dir, run, hooks)),
    saveCalibration: (iteration) => guarded(label, () => saveCalibration(db, dir, iteration)),
    calibrations: (serial) => guarded(label, () => readCalibrations(db, serial)),
  };
}

/** For callers that must say which folder a failure was about without opening it. */
export function isStoreFolder(dir: string): boolean {
  return existsSync(join(dir, DATABASE_FILE));
}

