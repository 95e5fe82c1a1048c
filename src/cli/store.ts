/**
 * The records store for every command that touches it: opening it in the data folder, storing the
 * units a `check` run decided, writing report files whole, and naming an unknown spec. The data
 * folder (`--data DIR`, else BENCHPROOF_DATA, else ./benchproof-data under the working directory),
 * the operator, the station and the one-line notices are in dataOptions.ts, re-exported here; that
 * file loads no records code, so commands can register their options without loading SQLite.
 */
import { resolve } from 'node:path';
import type { CommandContext } from './context.js';
import { describeProblems, nearestNames, openStore, sha256Hex, unverifiedError } from '../records/index.js';
import type { RecordStore, StoreAudit } from '../records/index.js';
import type { Diagnosis, NewRun, StoredRun, UnitVerdict } from '../types/index.js';
import { BenchError } from '../types/index.js';
import { TOOL_VERSION } from './version.js';
import { attemptFields, describeStoredRun, nextStep } from './attemptNotice.js';
import type { AttemptRequest } from './attemptNotice.js';
import { writeOutputFile } from './outputFile.js';
import { notice, quoteArg, resolveDataDir, resolveOperator, stationName } from './dataOptions.js';
import type { DataLocation, StoreFlags } from './dataOptions.js';

// The option helpers live in dataOptions.ts, which loads no records code; re-exported for callers.
export { DEFAULT_DATA_FOLDER, addDataOption, addRecordingOptions, notice, quoteArg, resolveDataDir, resolveOperator, stationName } from './dataOptions.js';
export type { DataLocation, StoreFlags } from './dataOptions.js';

export function openDataStore(ctx: CommandContext, flags: StoreFlags, mode: 'read' | 'write'): { store: RecordStore; location: DataLocation } {
  const location = resolveDataDir(ctx, flags);
  return { store: openStore(location.dir, { mode, label: location.shown, unverified: flags.allowUnverified ? 'mark' : 'refuse' }), location };
}

/**
 * Open the store and verify all of it (fingerprints, hash chain, archived captures) before anything
 * is read from it. Runs that fail are named in a `records.tampered` error (`records.damaged` when
 * every problem is a row that no longer parses), exit 2; with --allow-unverified they are named in
 * a warning on stderr instead, and the reports mark them. (The store itself refuses any read of an
 * unverified store unless opened with `unverified: 'mark'`, so every other reader is covered too.)
 */
export function openVerifiedStore(ctx: CommandContext, flags: StoreFlags, mode: 'read' | 'write'): { store: RecordStore; location: DataLocation; audit: StoreAudit } {
  const { store, location } = openDataStore(ctx, flags, mode);
  try {
    const audit = store.audit();
    if (audit.problems.length === 0) return { store, location, audit };
    if (!flags.allowUnverified) throw unverifiedError(location.shown, audit);
    ctx.io.stderr(`benchproof: warning: ${describeProblems(audit)}; these are marked and left out of yields and statistics (--allow-unverified)\n`);
    return { store, location, audit };
  } catch (err) {
    store.close();
    throw err;
  }
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
  const where = `${location.shown}${location.source === 'default' ? ' (BENCHPROOF_DATA or --data chooses another folder)' : ` (from ${location.source})`}`;
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
