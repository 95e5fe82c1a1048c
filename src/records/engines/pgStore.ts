/**
 * The record store on PostgreSQL: the same RecordStore as the embedded one (openStore.ts), with the
 * same rules. Opening applies pending migrations (pgSchema.ts) and refuses a newer schema; every
 * read is verified first (fingerprints and the hash chain, and a unit's captures when its runs are
 * read) and refused or marked by the same rule (verifiedReads.ts); every write is one transaction
 * under the store-wide lock (pgSaveRun.ts).
 *
 * Captures live in the database as chunks (pgCaptures.ts). A bench that reads a unit's captures
 * (its record, its open attempt, a plot on the bench page) keeps a verified copy in its own data
 * folder's archive under the same name (`captures/ab/<sha256>.csv`), so every caller reads the
 * archived file as on the embedded store; a local copy that no longer hashes right is fetched again.
 * Verifying the whole store has the server hash each capture's chunks (pgReads.ts), so the archive
 * does not travel over the network for a listing.
 */
import { existsSync, mkdirSync, rmSync } from 'node:fs';
import { join } from 'node:path';
import type { RecordStore } from '../openStore.js';
import { archiveCapture } from '../archive.js';
import { hashFile, judgeListing, judgeStore, judgeUnit } from '../auditStore.js';
import type { CaptureHasher } from '../auditStore.js';
import { numberRuns, openAttemptWith } from '../attempts.js';
import { withCalibrations } from '../calibrationRead.js';
import { buildUnitRecord, listUnitsFromRows } from '../unitSummaries.js';
import { batchRuns } from '../batchRuns.js';
import { verifiedReads, withUnverified } from '../verifiedReads.js';
import { isBenchError } from '../../types/index.js';
import type { StoredCapture } from '../../types/index.js';
import { applyPgMigrations } from './pgSchema.js';
import { pgStoreError } from './pgErrors.js';
import { readCapture } from './pgCaptures.js';
import { pgCalibratedAt, pgChainHead, pgRunHeads, prepareRun, saveRunBatched, writeRun, WRITE_LOCK } from './pgSaveRun.js';
import { pgSaveCalibration } from './pgCalibration.js';
import { pgRunRows } from './pgRuns.js';
import {
  pgCalibratedSerials,
  pgCaptureHashes,
  pgCaptureRecorded,
  pgChainEntries,
  pgChainRows,
  pgDistinct,
  pgListingArrays,
  pgReadCalibrationRows,
  pgReadRunDigests,
  pgRunCaptures,
  pgSpecText,
  pgSummaryArrays,
  pgSummaryChecks,
  pgSummaryRows,
} from './pgReads.js';
import { shownStore } from './pgLocation.js';
import { CHAIN_START } from '../chain.js';
import { PgCallError, PgSyncClient } from './pgSync.js';
import type { PgSyncOptions } from './pgSync.js';

export interface PgStoreOptions extends PgSyncOptions {
  /** The bench's data folder: captures read from the shared store are kept in its archive. */
  readonly cacheDir: string;
  /** As openStore's: 'refuse' a store that fails verification (default) or read it 'mark'ed. */
  readonly unverified?: 'refuse' | 'mark';
  /**
   * Keep the connection for the next open of the same store in this process, for IDLE_MS after close
   * (the command line: a check opens the store for the open attempt, then to store the run).
   */
  readonly keepConnection?: boolean;
}

/** How long a kept connection waits for the next open before it is closed. */
export const IDLE_MS = 5_000;

export function openPgStore(url: string, options: PgStoreOptions): RecordStore {
  const { cacheDir, unverified = 'refuse', keepConnection = false, ...connect } = options;
  const shown = shownStore(url);
  const key = keepConnection ? JSON.stringify([url, connect]) : undefined;
  const reused = key === undefined ? undefined : idle.get(key);
  if (key !== undefined) idle.delete(key);
  if (reused?.open) {
    try {
      return wrapPg(reused, shown, cacheDir, applyPgMigrations(reused, shown), unverified, key);
    } catch (err) {
      const lost = err instanceof PgCallError && (err.kind !== 'server' || !reused.open);
      reused.close();
      // A kept connection the server dropped meanwhile is no answer about the store: connect afresh.
      if (!lost) throw pgStoreError(err, shown);
    }
  }
  let client: PgSyncClient;
  let version: number;
  try {
    client = new PgSyncClient(url, connect);
  } catch (err) {
    throw pgStoreError(err, shown);
  }
  try {
    version = applyPgMigrations(client, shown);
  } catch (err) {
    client.close();
    throw pgStoreError(err, shown);
  }
  return wrapPg(client, shown, cacheDir, version, unverified, key);
}

/**
 * One connection per store address kept after a store is closed, for the next open in the same
 * process: a check opens the store to read the unit's open attempt, then again to store the run, and
 * starting the connection's worker thread and loading the driver is most of what opening costs
 * (tens of ms on an idle machine, a few hundred on a busy one). A kept connection holds no
 * transaction; its worker does not keep the process alive (PgSyncClient unrefs it).
 */
const idle = new Map<string, PgSyncClient>();

/** Keep `client` for the next open under `key`, closing it after IDLE_MS unless taken; one per key. */
function keepConnection(key: string, client: PgSyncClient): void {
  const kept = idle.get(key);
  if (kept !== undefined && kept !== client) {
    client.close();
    return;
  }
  idle.set(key, client);
  const timer = setTimeout(() => {
    if (idle.get(key) !== client) return;
    idle.delete(key);
    client.close();
  }, IDLE_MS);
  timer.unref();
}

function wrapPg(client: PgSyncClient, shown: string, cacheDir: string, version: number, unverified: 'refuse' | 'mark', key: string | undefined): RecordStore {
  const keep = (c: StoredCapture): string => keepLocal(client, shown, cacheDir, c);
  // A unit's captures are fetched into the local archive, each verified on the way.
  const fetched: CaptureHasher = (c) => {
    try {
      keep(c as StoredCapture);
      return c.sha256;
    } catch (err) {
      if (isBenchError(err) && err.code === 'records.capture-missing') return null;
      if (isBenchError(err) && err.code === 'records.capture-changed') return 'changed';
      throw err;
    }
  };
  const unitProblems = (unit: string) => judgeUnit(pgReadRunDigests(client, { unit }, true), pgReadCalibrationRows(client, unit).runs, fetched);
  const everyRow = () => ({ entries: pgChainEntries(client), runs: pgReadRunDigests(client), calibrations: pgReadCalibrationRows(client), summaries: pgSummaryRows(client) });
  const reads = verifiedReads(shown, unverified, {
    listing: () => {
      const summaries = pgListingArrays(client);
      const digests = (ids: readonly number[]) =>
        new Map(client.query<{ id: number; digest: string }>('SELECT id, digest FROM runs WHERE id = ANY($1::integer[])', [ids]).rows.map((r) => [r.id, r.digest]));
      return { audit: judgeListing(pgChainRows(client), summaries, pgReadCalibrationRows(client), digests, () => pgSummaryArrays(client)), summaries };
    },
    rows: () => judgeStore(everyRow()),
    full: () => {
      const hashes = pgCaptureHashes(client);
      return judgeStore(everyRow(), (c) => hashes.get(c.sha256) ?? null);
    },
    unit: (unit) => unitProblems(unit),
    wrapError: (err) => pgStoreError(err, shown),
  });
  const { verified, mark, markCalibrations, listingAudit, guarded } = reads;
  const origin = (hooks?: { uid?: string; originDigest?: string }) => ({ ...(hooks?.uid !== undefined ? { uid: hooks.uid } : {}), ...(hooks?.originDigest !== undefined ? { digest: hooks.originDigest } : {}) });
  return {
    engine: 'shared',
    dir: cacheDir,
    dbFile: shown,
    location: shown,
    schemaVersion: version,
    saveRun: (run, hooks) => {
      const prepared = prepareRun(run);
      return guarded(() => saveRunBatched(client, prepared, origin(hooks)));
    },
    saveRuns: (runs) => {
      const prepared = runs.map(prepareRun);
      return guarded(() => client.transaction(() => {
        client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
        return prepared.map((p) => writeRun(client, p));
      }));
    },
    listUnits: (filter = {}) => verified(() => withUnverified(listUnitsFromRows(reads.summaryRows(), filter.spec), listingAudit())),
    batchRuns: (filter = {}) =>
      verified(() => {
        const read = batchRuns(reads.summaryRows(), filter.spec, (ids) => pgSummaryChecks(client, ids));
        reads.refuse(read.problems);
        return mark(read.runs);
      }),
    unitRecord: (serial) =>
      verified(() => withCalibrations(buildUnitRecord(serial, mark(pgRunRows(client, { unit: serial }))), serial, markCalibrations(pgReadCalibrationRows(client, serial).runs)), serial),
    runs: (filter) => verified(() => mark(pgRunRows(client, filter)), filter?.unit ?? 'all-runs'),
    unitSerials: () => verified(() => [...new Set([...pgDistinct(client, 'unit'), ...pgCalibratedSerials(client)])].sort()),
    specNames: () => verified(() => pgDistinct(client, 'spec_name')),
    specText: (sha256) => guarded(() => pgSpecText(client, sha256)),
    // PostgreSQL keeps its own pages consistent; what can disagree is the schema, checked on opening.
    integrityCheck: () => guarded(() => (applyPgMigrations(client, shown) === version ? ['ok'] : [`schema changed from ${version} while open`])),
    close: () => (key !== undefined && client.open ? keepConnection(key, client) : client.close()),
    captureRecorded: (key) => verified(() => pgCaptureRecorded(client, key)),
    saveRunOnce: (run, hooks) => {
      if (run.captures.length === 0) throw new RangeError(`saveRunOnce: run of ${run.unit} has no captures to decide on`);
      const prepared = prepareRun(run);
      return guarded(() => client.transaction(() => {
        client.query('SELECT pg_advisory_xact_lock($1)', [WRITE_LOCK]);
        const earlier = run.captures.map((c) => pgCaptureRecorded(client, { unit: run.unit, condition: c.condition, sha256: c.sha256, kind: run.kind }));
        if (earlier.every((id) => id !== undefined)) return { stored: false as const, runId: Math.min(...(earlier as number[])) };
        return { stored: true as const, run: writeRun(client, prepared, origin(hooks)) };
      }));
    },
    saveCalibration: (iteration, hooks) => guarded(() => pgSaveCalibration(client, iteration, origin(hooks))),
    calibrations: (serial) => verified(() => markCalibrations(pgReadCalibrationRows(client, serial).runs), serial),
    openAttempt: (serial, specName) =>
      guarded(() => {
        const open = openAttemptWith((unit) => pgCalibratedAt(client, unit), numberRuns(pgRunHeads(client, serial)), specName, (id) => pgRunCaptures(client, id));
        // The check re-reads them from the data folder's archive, as on the embedded store.
        open?.captures.forEach(keep);
        return open;
      }),
    audit: (scope = 'full') => (scope === 'listing' ? listingAudit() : reads.audit()),
    chainHead: () => guarded(() => pgChainHead(client)),
    auditAdded: (after) =>
      guarded(() => {
        const at = client.query<{ link: string; n: number }>('SELECT link, (SELECT COUNT(*)::integer FROM chain WHERE seq <= $1) AS n FROM chain WHERE seq = $1', [after.seq]).rows[0];
        if (after.seq === 0 ? after.link !== CHAIN_START : at?.link !== after.link || at.n !== after.seq) return undefined;
        const added = client.query<{ unit: string }>(
          `SELECT r.unit AS unit FROM chain c JOIN runs r ON r.id = c.row_id WHERE c.seq > $1 AND c.kind IN ('run', 'summary')
           UNION SELECT cr.unit FROM chain c JOIN calibration_iterations i ON i.id = c.row_id JOIN calibration_runs cr ON cr.id = i.calibration_id WHERE c.seq > $1 AND c.kind = 'calibration'`,
          [after.seq],
        ).rows;
        const rows = client.query<{ n: number }>("SELECT COUNT(*)::integer AS n FROM chain WHERE seq > $1 AND kind IN ('run', 'calibration')", [after.seq]).rows[0].n;
        const units = added.map((a) => String(a.unit));
        return { problems: units.flatMap((unit) => unitProblems(unit)), rows, units };
      }),
    unsent: () => [],
  };
}

/**
 * The capture's bytes in the bench's archive, verified: a local copy that hashes right is used, any
 * other is replaced by the shared store's bytes (which readCapture verifies). Returns the local path.
 */
function keepLocal(client: PgSyncClient, shown: string, cacheDir: string, c: StoredCapture): string {
  const file = join(cacheDir, ...c.archivePath.split('/'));
  if (existsSync(file)) {
    if (hashFile(cacheDir, c.archivePath) === c.sha256) return file;
    rmSync(file, { force: true });
  }
  const bytes = readCapture(client, c.sha256, shown);
  mkdirSync(cacheDir, { recursive: true });
  archiveCapture(cacheDir, { path: c.path, sha256: c.sha256, size: bytes.length, layout: c.layout, condition: c.condition, bytes });
  return file;
}
