/**
 * What `watch` does with one capture that has landed and settled: the default `onCapture` strategy.
 * A landed file is checked together with its companions: for each other condition (or output) of
 * the same unit, the newest file in the same folder whose bytes were recorded already. The stored run
 * is exactly what `benchproof check` would store for that set of files, so once every condition of a
 * unit has landed, its record shows the unit's overall statement; conditions with nothing in the
 * folder yet are NOT MEASURED, and a unit never shows PASS from a partial set. The line printed for
 * the file gives the statement of the checks the file itself supplies, and the run's overall one.
 *
 * Another mode (e.g. calibration) plugs in by giving the session another `CaptureHandlerFactory`.
 */
import { createReadStream } from 'node:fs';
import { readdir, stat } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { basename, dirname, join, resolve } from 'node:path';
import type { CapturePlan, PlanOverrides, Spec } from '../spec/index.js';
import type { RecordStore } from '../records/index.js';
import { BenchError, isBenchError } from '../types/index.js';
import type { Statement } from '../types/index.js';
import type { CommandContext } from './context.js';
import { checkPlans, planCapture, runOf, worstStatement } from './checkRun.js';
import type { RunAuthor, TimingOptions } from './checkRun.js';
import type { CheckedUnit, DataLocation } from './store.js';
import { writeReportFile } from './store.js';
import { TOOL_VERSION } from './version.js';

/** Everything a per-file handler may use; fixed for the whole session. */
export interface WatchEnv {
  readonly ctx: CommandContext;
  readonly spec: Spec;
  readonly specText: string;
  readonly store: RecordStore;
  readonly location: DataLocation;
  readonly author: RunAuthor;
  readonly overrides: PlanOverrides;
  readonly timing: TimingOptions;
  /** Folder for each unit's refreshed HTML record, when asked for. */
  readonly reportDir?: string;
}

export type CaptureOutcome =
  | {
      readonly status: 'checked';
      readonly file: string;
      readonly unit: string;
      readonly condition: string;
      /** Statement of the checks this file supplies. */
      readonly statement: Statement;
      /** Statement of the stored run as a whole (conditions without a capture count as not measured). */
      readonly runStatement: Statement;
      readonly cause: { readonly id: string; readonly title: string } | null;
      readonly runId: number;
      readonly sha256: string;
      /** The refreshed HTML record, with --report-dir; or why it could not be written (the run is stored). */
      readonly record?: string;
      readonly recordError?: BenchError | Error;
    }
  | { readonly status: 'recorded-already'; readonly file: string; readonly unit: string; readonly condition: string; readonly runId: number }
  | {
      /** watch --calibrate: one capture placed at its calibration step; the iteration once every step is in. */
      readonly status: 'calibration-step';
      readonly file: string;
      readonly unit: string;
      readonly step: string;
      readonly statement: Statement;
      readonly cents: number | null;
      readonly missing: readonly string[];
      readonly iteration?: {
        readonly statement: Statement;
        readonly meetsLimits: boolean;
        readonly guidance: readonly string[];
        readonly calibrationId?: number;
        readonly number?: number;
      };
    }
  | { readonly status: 'unmatched' | 'error'; readonly file: string; readonly error: BenchError | Error };

/** Handles one settled file, given as the path the user would write; never throws. */
export type CaptureHandler = (file: string) => Promise<CaptureOutcome>;
export type CaptureHandlerFactory = (env: WatchEnv) => CaptureHandler;

export const checkEachCapture: CaptureHandlerFactory = (env) => async (file) => {
  let plan: CapturePlan;
  try {
    plan = planCapture(env.spec, file, env.overrides);
  } catch (err) {
    return { status: isBenchError(err) ? 'unmatched' : 'error', file, error: err as Error };
  }
  try {
    // Bytes recorded before are not read, measured or stored again (same rule as saveRunOnce).
    const sha256 = await hashLanded(resolve(env.ctx.io.cwd, file), file);
    const earlier = env.store.captureRecorded({ unit: plan.unit, condition: plan.condition, sha256 });
    if (earlier !== undefined) return { status: 'recorded-already', file, unit: plan.unit, condition: plan.condition, runId: earlier };
    const startedAt = new Date().toISOString();
    const companions = await recordedCompanions(env, plan);
    const [checked] = await checkPlans(env.ctx, env.spec, [plan, ...companions], env.timing);
    const saved = env.store.saveRunOnce(runOf(env.ctx, checked, env.author, startedAt, env.specText));
    if (!saved.stored) return { status: 'recorded-already', file, unit: plan.unit, condition: plan.condition, runId: saved.runId };
    const record = await refreshRecord(env, plan.unit).catch((err: Error) => err);
    const first = checked.diagnosis.causes[0];
    return {
      status: 'checked',
      file,
      unit: plan.unit,
      condition: plan.condition,
      statement: fileStatement(checked, plan),
      runStatement: checked.verdict.statement,
      cause: first ? { id: first.id, title: first.title } : null,
      runId: saved.run.id,
      sha256: checked.verdict.captures[0].sha256,
      ...(record instanceof Error ? { recordError: record } : record ? { record } : {}),
    };
  } catch (err) {
    return { status: 'error', file, error: err as Error };
  }
};

/**
 * SHA-256 of a landed file, streamed in pieces: a capture of any size (2 GB and more, past what one
 * Buffer holds) is hashed in constant memory, so watch handles what check handles and keeps no copy.
 * Only a regular file is read (a FIFO or device in the drop folder is refused, a link loop is an error
 * of its own), each as a BenchError naming the file.
 */
async function hashLanded(full: string, shown: string): Promise<string> {
  let st;
  try {
    st = await stat(full);
  } catch (err) {
    throw unreadableLanded(shown, (err as { code?: string }).code ?? 'error');
  }
  if (!st.isFile()) throw unreadableLanded(shown, 'not a regular file');
  const hash = createHash('sha256');
  try {
    for await (const chunk of createReadStream(full, { highWaterMark: 1 << 20 })) hash.update(chunk as Buffer);
  } catch (err) {
    throw unreadableLanded(shown, (err as { code?: string }).code ?? 'read error');
  }
  return hash.digest('hex');
}

function unreadableLanded(file: string, why: string): BenchError {
  return new BenchError({
    code: 'watch.unreadable',
    file,
    problem: `the landed file cannot be read (${why === 'ELOOP' ? 'a symbolic link that loops' : why}); it was not recorded`,
    expected: 'a capture file saved in the watched folder',
    fix: 'save the capture as a regular file in the folder (not a link or a device), then it is checked on landing',
  });
}

/** What a plan covers: its condition and outputs; one file per key goes into a run. */
const coverKey = (p: CapturePlan): string => `${p.condition}|${p.outputs.map((o) => o.output).sort().join(',')}`;

/**
 * The newest already-recorded file for each other condition/output of the same unit in the landed
 * file's folder. Only recorded bytes are taken, so a companion is a capture that was checked cleanly
 * before; with a --condition override every file is the same condition and there are none.
 */
async function recordedCompanions(env: WatchEnv, plan: CapturePlan): Promise<CapturePlan[]> {
  if (env.overrides.condition !== undefined) return [];
  const folder = dirname(plan.path);
  const names = await readdir(resolve(env.ctx.io.cwd, folder)).catch(() => [] as string[]);
  const newest = new Map<string, { plan: CapturePlan; mtime: number }>();
  for (const name of names) {
    const path = folder === '.' ? name : join(folder, name);
    if (name === basename(plan.path)) continue;
    let other: CapturePlan;
    try {
      other = planCapture(env.spec, path, env.overrides);
    } catch {
      continue; // names that miss the pattern are not companions
    }
    if (other.unit !== plan.unit || coverKey(other) === coverKey(plan)) continue;
    try {
      const full = resolve(env.ctx.io.cwd, path);
      const { mtimeMs } = await stat(full);
      const known = newest.get(coverKey(other));
      if (known && known.mtime >= mtimeMs) continue;
      const sha256 = await hashLanded(full, path);
      if (env.store.captureRecorded({ unit: other.unit, condition: other.condition, sha256 }) === undefined) continue;
      newest.set(coverKey(other), { plan: other, mtime: mtimeMs });
    } catch {
      continue; // a file that vanished or cannot be read is simply not a companion
    }
  }
  return [...newest.values()].map((c) => c.plan);
}

/** The statement of the checks this file supplies: its outputs at its condition. */
function fileStatement({ verdict }: CheckedUnit, plan: CapturePlan): Statement {
  const outputs = new Set(plan.outputs.map((o) => o.output));
  const condition = verdict.conditions.find((c) => c.condition === plan.condition);
  const checks = condition?.checks.filter((k) => outputs.has(k.output)) ?? [];
  // No check at all is not a pass.
  if (!condition || checks.length === 0) return 'not-measured';
  return plan.perOutput ? worstStatement(checks.map((k) => k.statement)) : condition.statement;
}

/** Write the unit's record as HTML into the report folder (whole, via a temporary name). */
async function refreshRecord(env: WatchEnv, unit: string): Promise<string | undefined> {
  const rec = env.store.unitRecord(unit);
  if (!rec || env.reportDir === undefined) return undefined;
  const { renderRecordHtml } = await import('../report/index.js');
  const source = { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: env.location.shown };
  const file = join(env.reportDir, `${unit.replace(/[^\w.-]/g, '_')}-record.html`);
  writeReportFile(env.ctx, file, renderRecordHtml({ ...rec, source }), env.location.dir, '--report-dir');
  return file;
}
