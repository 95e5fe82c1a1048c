/**
 * What `watch` does with one capture that has landed and settled: the default `onCapture` strategy.
 * Each file is one check of its unit at the condition(s) it covers — exactly the run that
 * `benchproof check FILE --spec SPEC` would store, so conditions without a capture in the file are
 * NOT MEASURED in the stored run and a unit's record never shows PASS from a partial set. The line
 * printed for the file gives the statement of the checks the file itself supplies.
 *
 * Another mode (e.g. calibration) plugs in by giving the session another `CaptureHandlerFactory`.
 */
import { readFile } from 'node:fs/promises';
import { join, resolve } from 'node:path';
import type { CapturePlan, PlanOverrides, Spec } from '../spec/index.js';
import type { RecordStore } from '../records/index.js';
import { sha256Hex } from '../records/index.js';
import { isBenchError } from '../types/index.js';
import type { BenchError, Statement } from '../types/index.js';
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
    const sha256 = sha256Hex(await readFile(resolve(env.ctx.io.cwd, file)));
    const earlier = env.store.captureRecorded({ unit: plan.unit, condition: plan.condition, sha256 });
    if (earlier !== undefined) return { status: 'recorded-already', file, unit: plan.unit, condition: plan.condition, runId: earlier };
    const startedAt = new Date().toISOString();
    const [checked] = await checkPlans(env.ctx, env.spec, [plan], env.timing);
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
  writeReportFile(env.ctx, file, renderRecordHtml({ ...rec, source }));
  return file;
}
