/**
 * The records store for every command that touches it: opening it in the data folder, storing the
 * units a `check` run decided, writing report files whole, and naming an unknown spec. The data
 * folder (`--data DIR`, else BENCHPROOF_DATA, else ./benchproof-data under the working directory),
 * the operator, the station and the one-line notices are in dataOptions.ts, re-exported here; that
 * file loads no records code, so commands can register their options without loading SQLite.
 */
import { resolve } from 'node:path';
import type { CommandContext } from './context.js';
import { describeProblems, isStoreFolder, nearestNames, openStore, sha256Hex, unverifiedError } from '../records/index.js';
import type { RecordStore, StoreAudit } from '../records/index.js';
import { randomUUID } from 'node:crypto';
import { checkStoreUrl, openPgStore, pushOutbox } from '../records/index.js';
import type { OutboxEntry, SaveHooks } from '../records/index.js';
import { isBenchError } from '../types/index.js';
import type { Diagnosis, NewRun, StoredRun, UnitVerdict } from '../types/index.js';
import { BenchError } from '../types/index.js';
import { TOOL_VERSION } from './version.js';
import { attemptFields, describeStoredRun, nextStep } from './attemptNotice.js';
import type { AttemptRequest } from './attemptNotice.js';
import { writeOutputFile } from './outputFile.js';
import { folderOf, notice, quoteArg, resolveDataDir, resolveOperator, stationName } from './dataOptions.js';
import type { DataLocation, StoreFlags } from './dataOptions.js';

// The option helpers live in dataOptions.ts, which loads no records code; re-exported for callers.
export { DEFAULT_DATA_FOLDER, addDataOption, addRecordingOptions, notice, quoteArg, resolveDataDir, resolveOperator, stationName } from './dataOptions.js';
export type { DataLocation, StoreFlags } from './dataOptions.js';

/**
 * The records: the embedded store in the data folder, or the shared store when one is set
 * (sharedStore.ts: pushing this bench's outbox first, and writing to the outbox while the shared
 * store cannot be reached).
 */
export function openDataStore(ctx: CommandContext, flags: StoreFlags, mode: 'read' | 'write'): { store: RecordStore; location: DataLocation } {
  const location = resolveDataDir(ctx, flags);
  const unverified = flags.allowUnverified ? 'mark' : 'refuse';
  if (location.shared) return { store: openSharedStore(ctx, location, mode, unverified), location };
  return { store: openStore(location.dir, { mode, label: location.shown, unverified }), location };
}

/** Whether there are records to read a unit's open attempt from: a shared store is set, or the data folder has a store. */
export function hasRecords(ctx: CommandContext, flags: StoreFlags): boolean {
  const location = resolveDataDir(ctx, flags);
  return location.shared !== undefined || isStoreFolder(location.dir);
}

/**
 * Open the store and verify all of it (fingerprints, hash chain, archived captures) before anything
 * is read from it; with `scope` 'listing' (units, batch), what a listing relies on: the hash chain,
 * every run row against it and every run's summary, without re-hashing the full verdicts or the
 * archive, which a listing does not read (the store verifies those whenever a unit is read in full). Runs that fail are named in a `records.tampered` error (`records.damaged` when
 * every problem is a row that no longer parses), exit 2; with --allow-unverified they are named in
 * a warning on stderr instead, and the reports mark them. (The store itself refuses any read of an
 * unverified store unless opened with `unverified: 'mark'`, so every other reader is covered too.)
 */
export function openVerifiedStore(ctx: CommandContext, flags: StoreFlags, mode: 'read' | 'write', scope: 'full' | 'listing' = 'full'): { store: RecordStore; location: DataLocation; audit: StoreAudit } {
  const { store, location } = openDataStore(ctx, flags, mode);
  try {
    const audit = store.audit(scope);
    if (audit.problems.length === 0) return { store, location, audit };
    if (!flags.allowUnverified) throw unverifiedError(location.shown, audit);
    ctx.io.stderr(`benchproof: warning: ${describeProblems(audit)}; these are marked and left out of yields and statistics (--allow-unverified)\n`);
    return { store, location, audit };
  } catch (err) {
    store.close();
    throw err;
  }
}

/**
 * The shared store, with this bench's outbox around it. Opening pushes the runs waiting on this
 * bench first (each once: the shared store keeps the bench's id for each). When the shared store
 * cannot be reached, a command that writes stores into the embedded store in the data folder, each
 * run listed in its outbox; so does a save that finds the server gone part way through a command.
 * A command that only reads needs the shared store and says so (`store.unreachable`).
 */
function openSharedStore(ctx: CommandContext, location: DataLocation, mode: 'read' | 'write', unverified: 'refuse' | 'mark'): RecordStore {
  const shared = location.shared as NonNullable<DataLocation['shared']>;
  checkStoreUrl(shared.url, shared.source);
  const openLocal = (): RecordStore => openStore(location.dir, { mode: 'write', label: folderOf(location), unverified });
  let store: RecordStore;
  try {
    // The connection is kept a moment after close: a check opens the store twice (attempt, then store).
    store = openPgStore(shared.url, { cacheDir: location.dir, unverified, keepConnection: true });
  } catch (err) {
    if (mode === 'read' || !isUnreachableError(err)) throw err;
    ctx.io.stderr(`benchproof: the shared store ${shared.shown} did not answer; runs are kept on this bench in ${folderOf(location)} and sent at the next command or with benchproof sync\n`);
    return asOutbox(openLocal());
  }
  sendWaiting(ctx, location, store);
  let local: RecordStore | undefined;
  const fallback = <T>(save: (s: RecordStore, hooks: SaveHooks) => T, hooks: SaveHooks = {}): T => {
    const uid = hooks.uid ?? randomUUID();
    try {
      return save(store, { ...hooks, uid });
    } catch (err) {
      if (!isUnreachableError(err)) throw err;
      ctx.io.stderr(`benchproof: the shared store ${shared.shown} stopped answering; this run is kept on this bench in ${folderOf(location)} and sent at the next command or with benchproof sync\n`);
      local ??= openLocal();
      return save(local, { ...hooks, uid, outbox: true });
    }
  };
  return {
    ...store,
    saveRun: (run, hooks) => fallback((s, h) => s.saveRun(run, h), hooks),
    saveRunOnce: (run, hooks) => fallback((s, h) => s.saveRunOnce(run, h), hooks),
    saveCalibration: (it, hooks) => fallback((s, h) => s.saveCalibration(it, h), hooks),
    close: () => {
      store.close();
      local?.close();
    },
  };
}

/** The embedded store as the outbox: every save listed as waiting for the shared store. */
function asOutbox(local: RecordStore): RecordStore {
  const queued = (hooks: SaveHooks = {}): SaveHooks => ({ ...hooks, uid: hooks.uid ?? randomUUID(), outbox: true });
  return {
    ...local,
    saveRun: (run, hooks) => local.saveRun(run, queued(hooks)),
    saveRunOnce: (run, hooks) => local.saveRunOnce(run, queued(hooks)),
    // A bulk import is not a bench's check: it needs the shared store itself.
    saveRuns: () => {
      throw new RangeError('saveRuns: the shared store is out of reach; a bulk import is not kept in the outbox');
    },
    saveCalibration: (it, hooks) => local.saveCalibration(it, queued(hooks)),
  };
}

function isUnreachableError(err: unknown): boolean {
  return isBenchError(err) && err.code === 'store.unreachable';
}

/** The runs waiting on this bench for the shared store (none without a shared store or a local store). */
export function waitingRuns(ctx: CommandContext, flags: StoreFlags): OutboxEntry[] {
  const location = resolveDataDir(ctx, flags);
  if (!location.shared || !isStoreFolder(location.dir)) return [];
  const local = openStore(location.dir, { mode: 'write', label: folderOf(location) });
  try {
    return local.unsent();
  } finally {
    local.close();
  }
}

/** Open with `open`; a shared store out of reach is named with the runs still waiting on this bench. */
export function describeWaiting<T>(ctx: CommandContext, flags: StoreFlags, open: () => T): T {
  try {
    return open();
  } catch (err) {
    if (!isUnreachableError(err)) throw err;
    const waiting = waitingRuns(ctx, flags);
    if (waiting.length === 0) throw err;
    const e = err as BenchError;
    throw new BenchError({ ...e.toJSON(), problem: `${e.problem}; ${waiting.length} run(s) wait on this bench to be sent: ${waiting.map((u) => `${u.unit} (${u.kind} #${u.rowId})`).join(', ')}` });
  }
}

/**
 * Push the runs waiting on this bench (automatically when a command opens the shared store, and by
 * `benchproof sync`). Returns how many were sent; a failure is thrown when `strict`, else a warning.
 */
export function sendWaiting(ctx: CommandContext, location: DataLocation, shared: RecordStore, strict = false): { sent: number; waiting: number } {
  const waiting = waitingRuns(ctx, { data: location.dir, store: location.shared?.url });
  if (waiting.length === 0) return { sent: 0, waiting: 0 };
  const tty = ctx.io.stderrIsTTY && !ctx.json;
  let sent = 0;
  try {
    sent = pushOutbox(location.dir, folderOf(location), shared, (done, total) => {
      sent = done;
      if (tty) ctx.io.stderr(`\rbenchproof: sending waiting runs ${done}/${total}`);
    }).pushed.length;
  } catch (err) {
    if (tty) ctx.io.stderr('\n');
    if (strict || !isBenchError(err)) throw err;
    ctx.io.stderr(`benchproof: warning: ${waiting.length - sent} run(s) waiting on this bench were not sent (${err.problem}); benchproof sync tries again\n`);
    return { sent, waiting: waiting.length - sent };
  }
  if (tty) ctx.io.stderr('\n');
  ctx.io.stderr(`benchproof: sent ${sent} run(s) waiting on this bench (${folderOf(location)}) to the shared store ${shared.location}\n`);
  return { sent, waiting: 0 };
}

export interface CheckedUnit {
  readonly verdict: UnitVerdict;
  readonly diagnosis: Diagnosis;
}

/**
 * Store every checked unit of one `check` run (one transaction per unit) and print one notice line.
 * `specText` is kept only when it is exactly the text the spec's SHA-256 was taken of.
 */
export function storeCheckedUnits(ctx: CommandContext, flags: StoreFlags, units: readonly CheckedUnit[], startedAt: string, specText?: string, request: AttemptRequest = {}): StoredRun[] {
  if (flags.store === false || units.length === 0) return [];
  const { store, location } = openDataStore(ctx, flags, 'write');
  const operator = resolveOperator(ctx, flags);
  const station = stationName();
  const stored: StoredRun[] = [];
  try {
    for (const unit of units) {
      const run = { ...runOf(ctx, unit, { operator, station }, startedAt, specText, request.sources), ...attemptFields(request) };
      stored.push(store.saveRun(run));
    }
  } finally {
    store.close();
  }
  const where =
    store.engine === 'embedded' && location.shared
      ? `${folderOf(location)}, waiting to be sent to ${location.shown} (benchproof sync sends it)`
      : `${location.shown}${location.source === 'default' ? ' (BENCHPROOF_DATA or --data chooses another folder)' : ` (from ${location.source})`}`;
  if (stored.length === 1) {
    const r = stored[0];
    notice(ctx, `stored ${describeStoredRun(r)} in ${where}`, nextStep(r, units[0].diagnosis, request.specFile));
  } else {
    notice(ctx, `stored ${stored.length} runs (${stored.map((r) => r.unit).join(', ')}) in ${where}`, 'benchproof units');
  }
  return stored;
}

/**
 * Write a report file whole by the rules every output follows (outputFile.ts): a regular file or a
 * new name, never a link, never inside the data folder, replaced only through a temporary name.
 */
export function writeReportFile(ctx: CommandContext, file: string, text: string, dataDir: string, option = '--out'): string {
  return writeOutputFile(ctx, file, text, { option, replace: true, dataDir });
}

/** A --spec name with no stored runs, with the nearest stored names. */
export function unknownSpec(name: string, known: readonly string[], location: DataLocation): BenchError {
  const near = nearestNames(name, known);
  return new BenchError({
    code: 'records.unknown-spec',
    file: location.shown,
    problem: `no runs checked against a spec named "${name}"`,
    expected: known.length ? `one of: ${known.map((k) => `"${k}"`).join(', ')}` : 'a spec that `benchproof check` has stored runs for',
    fix: near.length ? `did you mean --spec ${quoteArg(near[0])}?` : 'leave out --spec to report every spec',
  });
}

export interface RunAuthor {
  readonly operator: string;
  readonly station: string;
}

/**
 * The run one checked unit is stored as. `specText` is kept only when it is exactly the text the
 * spec's SHA-256 was taken of; capture bytes are read again from their files for the archive.
 */
export function runOf(ctx: CommandContext, { verdict, diagnosis }: CheckedUnit, author: RunAuthor, startedAt: string, specText?: string, sources?: ReadonlyMap<string, string>): NewRun {
  const text = specText !== undefined && sha256Hex(specText) === verdict.spec.sha256 ? specText : undefined;
  return {
    unit: verdict.unit,
    startedAt,
    operator: author.operator,
    station: author.station,
    spec: { name: verdict.spec.name, revision: verdict.spec.revision, sha256: verdict.spec.sha256, ...(text ? { text } : {}) },
    toolVersion: TOOL_VERSION,
    verdict,
    diagnosis,
    captures: verdict.captures.map((c) => ({ path: c.path, sha256: c.sha256, size: c.size, layout: c.layout, condition: c.condition, sourcePath: sources?.get(c.sha256) ?? resolve(ctx.io.cwd, c.path) })),
  };
}
