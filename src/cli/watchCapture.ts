/**
 * What `watch` does with one capture that has landed and settled: the default `onCapture` strategy.
 * Each unit has one open test attempt; a landed file joins it and is checked together with the
 * attempt's captures of the other conditions (or outputs), read back from the archive. A file of a
 * condition the attempt holds already replaces that capture (a re-capture; the earlier run keeps it).
 * Until every condition has landed the unit is INCOMPLETE and never shows PASS; the line gives the
 * file's own statement, the unit's progress ("2/3, waiting for high"), and a likely cause only once
 * the attempt is complete. After that, the unit's next file opens its next attempt.
 *
 * Another mode (e.g. calibration) plugs in by giving the session another `CaptureHandlerFactory`.
 */
import { createReadStream } from 'node:fs';
import { stat } from 'node:fs/promises';
import { createHash } from 'node:crypto';
import { join, resolve } from 'node:path';
import type { CapturePlan, PlanOverrides, Spec } from '../design/index.js';
import type { RecordStore } from '../records/index.js';
import { BenchError, isBenchError, systemErrorWords, waitingConditions } from '../types/index.js';
import type { Statement, UnitVerdict, VerdictState } from '../types/index.js';
import type { CommandContext } from './context.js';
import { checkPlans, planFiles, runOf, worstStatement } from './checkRun.js';
import type { RunAuthor, TimingOptions } from './checkRun.js';
import type { CheckedUnit, DataLocation } from './store.js';
import { writeReportFile } from './store.js';
import { TOOL_VERSION } from './version.js';
import { attemptCompanions } from './attemptCompanions.js';
import { checkedCache } from './watchReuse.js';
import type { CheckedCache } from './watchReuse.js';
import { attemptFields } from './attemptNotice.js';
import type { AttemptRequest } from './attemptNotice.js';

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
  /** --note / --new-attempt: each unit's first stored file in the session opens a new attempt. */
  readonly attempt?: AttemptRequest;
  /** Units that stored a run in this session (so only their first file opens a new attempt). */
  readonly started?: Set<string>;
  /** --force-unit: record a file naming another unit than --unit under --unit. */
  readonly forceUnit?: boolean;
  /** Results of captures checked earlier in the session, for their attempt's next files (watchReuse.ts). */
  readonly earlierChecks?: CheckedCache;
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
      /** The unit's attempt after this file: complete, or waiting for the conditions named. */
      readonly state?: VerdictState;
      readonly waitingFor?: readonly string[];
      /** Conditions of the spec captured in the attempt so far, of all. */
      readonly progress?: { readonly captured: number; readonly total: number };
      /** Worst statement over the conditions captured so far. */
      readonly soFar?: Statement;
      readonly attempt?: number;
      /** The run's number among the unit's runs. */
      readonly runNumber?: number;
      /** True while the attempt waits: the cause may change once the rest lands. */
      readonly preliminaryCause?: boolean;
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

export const checkEachCapture: CaptureHandlerFactory = (env) => {
  const earlierChecks = env.earlierChecks ?? checkedCache();
  return (file) => checkOneCapture(env, earlierChecks, file);
};

async function checkOneCapture(env: WatchEnv, earlierChecks: CheckedCache, file: string): Promise<CaptureOutcome> {
  let plan: CapturePlan;
  try {
    [plan] = planFiles(env.spec, [file], env.overrides, env.forceUnit);
  } catch (err) {
    return { status: isBenchError(err) ? 'unmatched' : 'error', file, error: err as Error };
  }
  try {
    // Bytes recorded before are not read, measured or stored again (same rule as saveRunOnce).
    const sha256 = await hashLanded(resolve(env.ctx.io.cwd, file), file);
    const earlier = env.store.captureRecorded({ unit: plan.unit, condition: plan.condition, sha256 });
    if (earlier !== undefined) return { status: 'recorded-already', file, unit: plan.unit, condition: plan.condition, runId: earlier };
    const startedAt = new Date().toISOString();
    // The unit's open attempt lends its other captures; with --note or --new-attempt the session's
    // first file of each unit opens a new attempt instead, and the files after it join that one.
    const fresh = env.attempt !== undefined && !(env.started?.has(plan.unit) ?? false);
    const companions = fresh ? undefined : attemptCompanions(env.store, env.location.dir, env.spec, [plan]);
    // The companions were checked when they landed (this session): their results are reused.
    const [checked] = await checkPlans(env.ctx, env.spec, [plan, ...(companions?.plans ?? [])], env.timing, undefined, earlierChecks.forCheck(companions?.sources));
    const run = { ...runOf(env.ctx, checked, env.author, startedAt, env.specText, companions?.sources), ...(fresh ? attemptFields(env.attempt ?? {}) : {}) };
    const saved = env.store.saveRunOnce(run);
    if (!saved.stored) return { status: 'recorded-already', file, unit: plan.unit, condition: plan.condition, runId: saved.runId };
    env.started?.add(plan.unit);
    const record = await refreshRecord(env, plan.unit).catch((err: Error) => err);
    const first = checked.diagnosis.causes[0];
    const waitingFor = waitingConditions(checked.verdict);
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
      state: waitingFor.length ? 'incomplete' : 'complete',
      waitingFor,
      progress: progressOf(checked.verdict, plan.perOutput),
      soFar: checked.verdict.soFar ?? checked.verdict.statement,
      ...(saved.run.attempt !== undefined ? { attempt: saved.run.attempt } : {}),
      ...(saved.run.number !== undefined ? { runNumber: saved.run.number } : {}),
      preliminaryCause: waitingFor.length > 0,
    };
  } catch (err) {
    return { status: 'error', file, error: err as Error };
  }
}

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
    problem: `the landed file cannot be read (${/^E[A-Z]+$/.test(why) ? systemErrorWords(why) : why}); it was not recorded`,
    expected: 'a capture file saved in the watched folder',
    fix: 'save the capture as a regular file in the folder (not a link or a device), then it is checked on landing',
  });
}

/**
 * How much of the attempt has landed: conditions captured of all, or with one file per output the
 * (condition, output) pairs captured of all.
 */
function progressOf(verdict: UnitVerdict, perOutput: boolean): { captured: number; total: number } {
  if (!perOutput) return { captured: verdict.conditions.filter((c) => !c.waiting).length, total: verdict.conditions.length };
  const pairs = new Map<string, boolean>();
  for (const k of verdict.conditions.flatMap((c) => c.checks)) {
    const key = `${k.condition}\u0000${k.output}`;
    pairs.set(key, (pairs.get(key) ?? false) || !k.waiting);
  }
  return { captured: [...pairs.values()].filter(Boolean).length, total: pairs.size };
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
  // Only with --report-dir: reading the unit's whole record took a seventh of a batch's time.
  if (env.reportDir === undefined) return undefined;
  const rec = env.store.unitRecord(unit);
  if (!rec) return undefined;
  const { renderRecordHtml } = await import('../report/index.js');
  const source = { generatedAt: new Date().toISOString(), toolVersion: TOOL_VERSION, dataDir: env.location.shown, chainHead: env.store.chainHead() };
  const file = join(env.reportDir, `${unit.replace(/[^\w.-]/g, '_')}-record.html`);
  writeReportFile(env.ctx, file, renderRecordHtml({ ...rec, source }), env.location.dir, '--report-dir');
  return file;
}
