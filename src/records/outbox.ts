/**
 * Pushing a bench's outbox to the shared store. Each waiting run (or calibration iteration) is
 * rebuilt from the bench's embedded store as it was checked (verdict, causes, captures read back
 * from the bench's archive and re-hashed, spec text) and saved in the shared store under the id the
 * bench made for it; then the bench marks it sent. The shared store stores an id once (a unique
 * column, checked under its write lock), so a push cut off between the server's commit and the
 * bench's mark stores nothing twice when repeated: the run is found there and only marked.
 *
 * On the shared store a pushed run is placed in its unit's attempts, fingerprinted and chained in
 * the order it arrives, like any run stored there; the fingerprint it had on the bench is kept
 * beside it (`origin_digest`), and the bench's own store keeps the run, its fingerprint and its
 * chain entry unchanged.
 */
import Database from 'better-sqlite3';
import { join } from 'node:path';
import { BenchError } from '../types/index.js';
import type { NewCalibrationIteration, NewRun, StoredCalibrationRun, StoredRun } from '../types/index.js';
import type { RecordStore } from './openStore.js';
import { DATABASE_FILE } from './openStore.js';
import { readRuns, specText } from './readRuns.js';
import { readCalibrationRows } from './calibrationRead.js';
import { markSent, unsentEntries } from './outboxQueue.js';
import type { OutboxEntry } from './outboxQueue.js';
import { storeError } from './storeErrors.js';

export interface PushResult {
  /** Rows the shared store stored now. */
  readonly pushed: readonly { readonly entry: OutboxEntry; readonly serverId: number }[];
}

/**
 * Push every unsent row of the bench's outbox in the order it was stored. A failure of the shared
 * store stops the push (the rest wait for the next one) and is thrown after what was pushed is marked.
 */
export function pushOutbox(dataDir: string, label: string, shared: RecordStore, onEach?: (done: number, total: number) => void): PushResult {
  let db: Database.Database;
  try {
    db = new Database(join(dataDir, DATABASE_FILE), { fileMustExist: true, timeout: 15_000 });
  } catch (err) {
    throw storeError(err, label);
  }
  try {
    const entries = unsentEntries(db);
    const pushed: { entry: OutboxEntry; serverId: number }[] = [];
    for (const entry of entries) {
      const serverId = entry.kind === 'run' ? pushRun(db, dataDir, entry, shared) : pushIteration(db, dataDir, entry, shared);
      markSent(db, entry.kind, entry.rowId, serverId);
      pushed.push({ entry, serverId });
      onEach?.(pushed.length, entries.length);
    }
    return { pushed };
  } finally {
    db.close();
  }
}

function pushRun(db: Database.Database, dataDir: string, entry: OutboxEntry, shared: RecordStore): number {
  const run = readRuns(db, { unit: entry.unit }).find((r) => r.id === entry.rowId);
  if (!run) throw new RangeError(`outbox: run #${entry.rowId} of ${entry.unit} is listed but does not read back`);
  if (!run.intact) throw changedWaiting(dataDir, entry);
  return shared.saveRun(newRunOf(db, dataDir, run), { uid: entry.uid, originDigest: run.digest }).id;
}

/** The run as the bench checked it, to be placed anew in the shared store. */
export function newRunOf(db: Database.Database, dataDir: string, run: StoredRun): NewRun {
  const text = specText(db, run.spec.sha256);
  return {
    unit: run.unit,
    kind: run.kind,
    startedAt: run.startedAt,
    operator: run.operator,
    station: run.station,
    spec: { ...run.spec, ...(text !== undefined ? { text } : {}) },
    toolVersion: run.toolVersion,
    verdict: run.verdict,
    diagnosis: run.diagnosis,
    captures: run.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition, sourcePath: join(dataDir, ...c.archivePath.split('/')) })),
    ...(run.attemptReason === 'requested' ? { newAttempt: true } : {}),
    ...(run.note !== undefined ? { note: run.note } : {}),
  };
}

function pushIteration(db: Database.Database, dataDir: string, entry: OutboxEntry, shared: RecordStore): number {
  const runs = readCalibrationRows(db, entry.unit).runs;
  for (const [index, c] of runs.entries()) {
    const it = c.iterations.find((i) => i.id === entry.rowId);
    if (!it) continue;
    if (!it.intact) throw changedWaiting(dataDir, entry);
    const text = specText(db, c.spec.sha256);
    const iteration: NewCalibrationIteration = {
      unit: c.unit,
      startedAt: it.startedAt,
      operator: it.operator,
      station: it.station,
      spec: { ...c.spec, ...(text !== undefined ? { text } : {}) },
      toolVersion: it.toolVersion,
      result: it.result,
      captures: it.captures.map((k) => ({ path: k.path, sha256: k.sha256, size: k.size, layout: k.layout, condition: k.condition, sourcePath: join(dataDir, ...k.archivePath.split('/')) })),
      // Grouping on the shared store follows its own rule (continue the unit's open run under the
      // same spec), so a session begun online and continued offline stays one run there. Only a new
      // run the operator asked for is asked for again.
      ...(it.number === 1 && startedOnRequest(runs[index - 1], c) ? { newRun: true } : {}),
    };
    return shared.saveCalibration(iteration, { uid: entry.uid, originDigest: it.digest }).iteration.id;
  }
  throw new RangeError(`outbox: calibration iteration #${entry.rowId} of ${entry.unit} is listed but does not read back`);
}

/**
 * Whether a calibration run on this bench was started at the operator's request (`--new-run`): the
 * bench's grouping (calibrationSave.ts) would otherwise have continued the run before it, since that
 * run was open (no iteration met the limits) under the same spec text. Runs follow one another per
 * unit, so the earlier run's state now is its state when this one began.
 */
function startedOnRequest(before: StoredCalibrationRun | undefined, run: StoredCalibrationRun): boolean {
  if (!before || before.spec.sha256 !== run.spec.sha256) return false;
  return before.iterations.length > 0 && !before.complete;
}

function changedWaiting(dataDir: string, entry: OutboxEntry): BenchError {
  return new BenchError({
    code: 'records.tampered',
    file: dataDir,
    problem: `${entry.kind} #${entry.rowId} of ${entry.unit}, waiting to be sent, no longer matches the fingerprint taken when it was stored here; nothing after it was sent`,
    expected: 'waiting runs exactly as they were stored on this bench',
    fix: 'restore records.db of this data folder from a backup, then run benchproof sync again',
  });
}
