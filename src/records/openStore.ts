/**
 * The record store: one SQLite database (`records.db`, WAL journal, full sync) plus the capture archive
 * in a data folder. Opening applies pending migrations. A busy timeout lets several benchproof
 * processes write at once; problems with the folder become BenchErrors (exit 2).
 */
import Database from 'better-sqlite3';
import type { Database as Db } from 'better-sqlite3';
import { existsSync, linkSync, lstatSync, mkdirSync, renameSync, rmSync, statSync } from 'node:fs';
import { randomBytes } from 'node:crypto';
import { join } from 'node:path';
import type { NewCalibrationIteration, NewRun, StoredCalibrationRun, StoredRun, UnitRecord, UnitSummary } from '../types/index.js';
import { removeStaleTemps } from './archive.js';
import { LATEST_SCHEMA, applyMigrations, checkStoreSchema } from './migrations.js';
import { distinct, readRuns, specText } from './readRuns.js';
import type { RunFilter } from './readRuns.js';
import { saveRun } from './saveRun.js';
import type { SaveHooks } from './saveRun.js';
import { damagedFileError, missingError, noRecordsError, openError, storeError } from './storeErrors.js';
import { auditStore, auditUnit, judgeListing } from './auditStore.js';
import type { AuditProblem, StoreAudit } from './auditStore.js';
import { CHAIN_START, chainHead, chainRows } from './chain.js';
import { buildUnitRecord, listUnitsFromRows } from './unitSummaries.js';
import { batchRuns } from './batchRuns.js';
import { readListingArrays, readSummaryArrays, readSummaryChecks, readSummaryHeads } from './summaryReads.js';
import { numberRuns, openAttempt } from './attempts.js';
import type { OpenAttempt } from './attempts.js';
import { calibratedSerials, readCalibrationRows, readCalibrations, withCalibrations } from './calibrationRead.js';
import { saveCalibration } from './calibrationSave.js';
import type { SavedIteration } from './calibrationSave.js';
import { captureRecorded, saveRunOnce } from './captureSeen.js';
import { verifiedReads, withUnverified } from './verifiedReads.js';
import { unsentEntries } from './outboxQueue.js';
import type { OutboxEntry } from './outboxQueue.js';
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
  /**
   * What reading does when the store fails verification (auditStore.ts): 'refuse' (the default)
   * throws `records.tampered` (or `records.damaged`) naming the rows; 'mark' reads them marked
   * (`intact: false`), damaged rows left out.
   */
  readonly unverified?: 'refuse' | 'mark';
}

export interface RecordStore {
  /** 'embedded': SQLite in a data folder; 'shared': the PostgreSQL store several benches write to. */
  readonly engine: 'embedded' | 'shared';
  /** The data folder (for the shared store: the folder its captures are kept in once read). */
  readonly dir: string;
  /** records.db; for the shared store, its address without the password. */
  readonly dbFile: string;
  /** The store as messages name it: the data folder as given, or the address without the password. */
  readonly location: string;
  readonly schemaVersion: number;
  /** Store one run (captures archived, all rows in one transaction); returns it as stored. */
  saveRun(run: NewRun, hooks?: SaveHooks): StoredRun;
  /** Store several runs in the given order in one transaction (a bulk import): each placed, fingerprinted and chained as saveRun does. */
  saveRuns(runs: readonly NewRun[]): StoredRun[];
  /** Every unit with the state of its attempts, from the runs' verified summaries (no full verdict read). */
  listUnits(filter?: { readonly spec?: string }): UnitSummary[];
  /**
   * What `batch` reads, from the runs' verified summaries: every run's light head (spec, times,
   * statement, attempt, condition states) with the checks of the runs the statistics use (each unit's
   * latest complete attempt's last run); not for reports that show measurements or causes.
   */
  batchRuns(filter?: { readonly spec?: string }): StoredRun[];
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
  saveCalibration(iteration: NewCalibrationIteration, hooks?: SaveHooks): SavedIteration;
  /** The unit's calibration runs with their iterations, oldest first. */
  calibrations(serial: string): StoredCalibrationRun[];
  /** The unit's test attempt a new run under this spec name would continue, if one is open (attempts.ts). */
  openAttempt(serial: string, specName: string): OpenAttempt | undefined;
  /**
   * Verify the whole store (fingerprints, hash chain, archived captures; auditStore.ts), or with
   * 'listing' what a listing relies on: the chain, the run rows against it and the run summaries, no
   * full verdict (verifiedReads.ts). Computed once per open store; reads mark every run it names.
   */
  audit(scope?: 'full' | 'listing'): StoreAudit;
  /** The newest link of the hash chain. */
  chainHead(): string;
  /**
   * What was stored after chain entry number `after.seq`: each unit those entries name verified as
   * reading that unit verifies it (every run re-hashed in full, its verdict against its summary, its
   * archived captures). Undefined when that entry no longer holds `after.link`, or entries before it
   * are gone (the chain changed under it: verify the whole store again). The listing's checks (the
   * chain, every summary) are audit('listing')'s; followRecordStore.ts joins the two.
   */
  auditAdded(after: ChainMark): AddedAudit | undefined;
  /** Runs and iterations stored here while the shared store could not be reached, not yet confirmed sent (outbox.ts). */
  unsent(): OutboxEntry[];
}

/** A place in the hash chain: an entry's number and link (seq 0 and 64 zeros before the first). */
export interface ChainMark {
  readonly seq: number;
  readonly link: string;
}

/** The problems of the rows stored after a chain mark, and how many rows that was. */
export interface AddedAudit {
  readonly problems: readonly AuditProblem[];
  /** Runs and calibration iterations stored after the mark. */
  readonly rows: number;
  /** The units verified (those the rows belong to). */
  readonly units: readonly string[];
}

export function openStore(dir: string, options: OpenStoreOptions = {}): RecordStore {
  const { mode = 'write', busyTimeoutMs = 15_000, schemaVersion: upTo = LATEST_SCHEMA, label = dir, unverified = 'refuse' } = options;
  prepareFolder(dir, mode, label);
  const dbFile = join(dir, DATABASE_FILE);
  if (mode === 'write' && !existsSync(dbFile)) createStore(dir, dbFile, label, busyTimeoutMs, upTo);
  let db: Db | undefined;
  let version: number;
  try {
    db = new Database(dbFile, { timeout: busyTimeoutMs, fileMustExist: mode === 'read' });
    // Checked before the journal mode is set, which would rewrite the header of a file that is not ours.
    checkStoreSchema(db, label);
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
  return wrap(db, dir, dbFile, version, label, unverified);
}

/**
 * A new store is made whole under a name of its own (schema applied), then linked into place in one
 * step. So records.db is never seen empty while another process creates it (two benches starting on
 * a new data folder at once), and an empty records.db always means records lost. Whoever links
 * second finds the other's store there and uses it.
 */
function createStore(dir: string, dbFile: string, label: string, busyTimeoutMs: number, upTo: number): void {
  const temp = join(dir, `${DATABASE_FILE}.new-${process.pid}-${randomBytes(4).toString('hex')}`);
  try {
    const fresh = new Database(temp, { timeout: busyTimeoutMs });
    try {
      fresh.pragma('journal_mode = WAL');
      fresh.pragma('synchronous = FULL');
      fresh.pragma('foreign_keys = ON');
      applyMigrations(fresh, label, upTo);
    } finally {
      fresh.close();
    }
    try {
      linkSync(temp, dbFile);
    } catch (err) {
      const code = (err as { code?: string }).code;
      if (code === 'EEXIST') return;
      // A file system without hard links (some shares and USB sticks): a rename, only where none is yet.
      if (!['EPERM', 'ENOTSUP', 'EOPNOTSUPP', 'ENOSYS', 'EXDEV'].includes(code ?? '') || existsSync(dbFile)) throw err;
      renameSync(temp, dbFile);
    }
  } catch (err) {
    throw openError(err, dir, label, 'write');
  } finally {
    for (const f of [temp, `${temp}-wal`, `${temp}-shm`]) rmSync(f, { force: true });
  }
}

function prepareFolder(dir: string, mode: 'write' | 'read', label: string): void {
  if (existsSync(dir)) {
    if (!statSync(dir).isDirectory()) throw missingError(label);
    if (mode === 'read' && !existsSync(join(dir, DATABASE_FILE))) throw noRecordsError(label);
    checkDatabaseFile(join(dir, DATABASE_FILE), label);
    return;
  }
  // A link whose target is gone: neither created through nor taken for a missing folder to make.
  if (isLink(dir)) throw missingError(label);
  if (mode === 'read') throw noRecordsError(label);
  try {
    mkdirSync(dir);
  } catch (err) {
    // Another process may have created it a moment ago; that is fine.
    if ((err as { code?: string }).code === 'EEXIST' && statSync(dir).isDirectory()) return;
    throw storeError(err, label);
  }
}

function isLink(path: string): boolean {
  try {
    return lstatSync(path).isSymbolicLink();
  } catch {
    return false;
  }
}

/**
 * SQLite takes an empty file for a new, empty database; an empty records.db, or one that is not a
 * regular file, is a damaged store (records lost), never a fresh start.
 */
function checkDatabaseFile(file: string, label: string): void {
  let st;
  try {
    st = statSync(file);
  } catch {
    return; // not there yet: a new store
  }
  if (!st.isFile()) throw damagedFileError(label, 'records.db is not a regular file');
  if (st.size === 0) throw damagedFileError(label, 'records.db is empty (0 bytes): the records it held are gone');
}

function wrap(db: Db, dir: string, dbFile: string, version: number, label: string, unverified: 'refuse' | 'mark'): RecordStore {
  // Each read verifies what it reads: every fingerprint and the whole chain always (cheap: the
  // stored texts are hashed as they are), the archived captures of a unit when its runs are read.
  const reads = verifiedReads(label, unverified, {
    listing: () => {
      const summaries = readListingArrays(db);
      const digests = (ids: readonly number[]) =>
        new Map((db.prepare('SELECT id, digest FROM runs WHERE id IN (SELECT value FROM json_each(?))').all(JSON.stringify(ids)) as { id: number; digest: string }[]).map((r) => [r.id, r.digest]));
      return { audit: judgeListing(chainRows(db), summaries, readCalibrationRows(db), digests, () => readSummaryArrays(db)), summaries };
    },
    rows: () => auditStore(db, dir, { archive: false }),
    full: () => auditStore(db, dir),
    unit: (unit) => auditUnit(db, dir, unit),
  });
  const { verified, mark, markCalibrations, listingAudit } = reads;
  const guard = <T>(fn: () => T): T => reads.guarded(fn);
  return {
    engine: 'embedded',
    dir,
    dbFile,
    location: label,
    schemaVersion: version,
    saveRun: (run, hooks) => guard(() => saveRun(db, dir, run, hooks)),
    // Each saveRun's transaction nests as a savepoint inside this one: one commit (one sync) for all.
    saveRuns: (runs) => guard(() => db.transaction(() => runs.map((run) => saveRun(db, dir, run))).immediate()),
    listUnits: (filter = {}) => verified(() => withUnverified(listUnitsFromRows(reads.summaryRows(), filter.spec), listingAudit())),
    unitRecord: (serial) => verified(() => withCalibrations(buildUnitRecord(serial, mark(readRuns(db, { unit: serial }))), serial, markCalibrations(readCalibrations(db, serial))), serial),
    runs: (filter) => verified(() => mark(readRuns(db, filter)), filter?.unit ?? 'all-runs'),
    batchRuns: (filter = {}) =>
      verified(() => {
        const read = batchRuns(reads.summaryRows(), filter.spec, (ids) => readSummaryChecks(db, ids));
        reads.refuse(read.problems);
        return mark(read.runs);
      }),
    unitSerials: () => verified(() => [...new Set([...distinct(db, 'unit'), ...calibratedSerials(db)])].sort()),
    specNames: () => verified(() => distinct(db, 'spec_name')),
    specText: (sha256) => guard(() => specText(db, sha256)),
    integrityCheck: () => guard(() => (db.pragma('integrity_check') as { integrity_check: string }[]).map((r) => r.integrity_check)),
    close: () => db.close(),
    captureRecorded: (key) => verified(() => captureRecorded(db, key)),
    saveRunOnce: (run, hooks) => guard(() => saveRunOnce(db, dir, run, hooks)),
    saveCalibration: (iteration, hooks) => guard(() => saveCalibration(db, dir, iteration, hooks)),
    calibrations: (serial) => verified(() => markCalibrations(readCalibrations(db, serial)), serial),
    // Like saveRun, not behind the audit: it only chooses which archived captures a new check re-reads,
    // and archiving them again re-checks their SHA-256 (archive.ts).
    openAttempt: (serial, specName) => guard(() => openAttempt(db, numberRuns(readSummaryHeads(db, serial)), specName)),
    audit: (scope = 'full') => (scope === 'listing' ? reads.listingAudit() : reads.audit()),
    chainHead: () => guard(() => chainHead(db)),
    auditAdded: (after) =>
      guard(() => {
        const at = db.prepare('SELECT link, (SELECT COUNT(*) FROM chain WHERE seq <= ?) AS n FROM chain WHERE seq = ?').get(after.seq, after.seq) as { link: string; n: number } | undefined;
        if (after.seq === 0 ? after.link !== CHAIN_START : at?.link !== after.link || at.n !== after.seq) return undefined;
        const added = db
          .prepare(
            `SELECT r.unit AS unit FROM chain c JOIN runs r ON r.id = c.row_id WHERE c.seq > @seq AND c.kind IN ('run', 'summary')
             UNION SELECT cr.unit FROM chain c JOIN calibration_iterations i ON i.id = c.row_id JOIN calibration_runs cr ON cr.id = i.calibration_id WHERE c.seq > @seq AND c.kind = 'calibration'`,
          )
          .all({ seq: after.seq }) as { unit: string }[];
        const rows = (db.prepare("SELECT COUNT(*) AS n FROM chain WHERE seq > ? AND kind IN ('run', 'calibration')").get(after.seq) as { n: number }).n;
        const units = added.map((a) => String(a.unit));
        return { problems: units.flatMap((unit) => auditUnit(db, dir, unit)), rows, units };
      }),
    unsent: () => guard(() => unsentEntries(db)),
  };
}

/** For callers that must say which folder a failure was about without opening it. */
export function isStoreFolder(dir: string): boolean {
  return existsSync(join(dir, DATABASE_FILE));
}

