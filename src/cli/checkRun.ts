/**
 * The check pipeline shared by `check`, `watch` and the bench page: read the spec, then for each
 * planned capture read → measure → bind, decide each unit and rank its likely causes; and the run a
 * checked unit is stored as. `checkAndStore` is the whole of `benchproof check FILES --spec SPEC`
 * up to its output, used as it is by the command and by the page's drop zone, so what the page
 * stores is what the command stores. Commands import this module lazily inside their action, so the
 * stages (zod, fft.js, the CSV reader) load only when a check actually runs.
 */
import { readCapture } from '../capture/index.js';
import { measureCapture } from '../analysis/index.js';
import { SPEC_MAX_BYTES, bindCapture, decideUnits, parseSpec, planCapture } from '../design/index.js';
import type { CapturePlan, PlanOverrides, Spec } from '../design/index.js';
import { diagnoseUnit } from '../diagnose/index.js';
import { describeDiagnosis } from '../report/index.js';
import { BenchError } from '../types/index.js';
import type { CheckedCapture, ReadCaptureOptions } from '../types/index.js';
import type { CommandContext } from './context.js';
import { resolvePath } from './context.js';
import type { Progress } from './progress.js';
import type { CheckedUnit, StoreFlags } from './store.js';
import { storeCheckedUnits } from './store.js';
import { readSpecFile } from './specFile.js';
import { checkNote, companionsFromStore, describeCompanions } from './attemptCompanions.js';
import type { StoredRun } from '../types/index.js';

export { planCapture, worstStatement } from '../design/index.js';

export interface LoadedSpec {
  readonly spec: Spec;
  /** The spec file's exact text, kept with the stored runs. */
  readonly text: string;
}

export function loadSpec(ctx: CommandContext, file: string): LoadedSpec {
  const text = readSpecFile(ctx, file, SPEC_MAX_BYTES, '--spec samples/fh210-spec.yaml');
  return { spec: parseSpec(text, file), text };
}

/** Timing given on the command line, for files without a time column. */
/** Reading settings from the command line (flags and a profile); the spec's `captures.reading` lies under them. */
export type TimingOptions = Omit<ReadCaptureOptions, 'onProgress' | 'channel'>;

const quiet: Progress = { start() {}, update() {}, stop() {} };

/** A planned capture, possibly read from another place than the path it is recorded under (the archive). */
export type SourcedPlan = CapturePlan & { readonly readFrom?: string };

/**
 * Map each file to its unit and condition. With --unit, a file whose name names another unit is
 * refused unless `forceUnit` confirms it: a capture of FK-0102 must not land in FK-0103's record by a
 * slip. The file keeps its own name in the record either way.
 */
export function planFiles(spec: Spec, files: readonly string[], overrides: PlanOverrides, forceUnit = false): CapturePlan[] {
  return files.map((file) => {
    const plan = planCapture(spec, file, overrides);
    if (overrides.unit === undefined || forceUnit) return plan;
    let named: string | undefined;
    try {
      named = planCapture(spec, file, { condition: overrides.condition }).unit;
    } catch {
      named = undefined; // the name carries no unit (e.g. scope-01.csv): --unit is the only one
    }
    if (named !== undefined && named !== overrides.unit) {
      throw new BenchError({
        code: 'check.unit-mismatch',
        file,
        problem: `the file name says unit ${named}, but --unit says ${overrides.unit}`,
        expected: `captures of ${overrides.unit}, or file names without a unit`,
        fix: `leave out --unit to record it under ${named}, or add --force-unit to record it under ${overrides.unit} (the file name is kept)`,
      });
    }
    return plan;
  });
}

/**
 * Captures a long-running caller (watch) has checked before under the same spec and reading
 * settings: `reused` gives the earlier result for a plan whose bytes it knows, `checked` is told of
 * each new one. The analysis is pure, so the same bytes, plan and settings give the same result.
 */
export interface CheckedReuse {
  reused(plan: SourcedPlan): CheckedCapture | undefined;
  checked(plan: SourcedPlan, capture: CheckedCapture): void;
}

/**
 * Read, measure and bind every planned capture in order, then decide each unit and diagnose it.
 * The first capture that cannot be read stops the whole check with its BenchError.
 */
export async function checkPlans(ctx: CommandContext, spec: Spec, plans: readonly SourcedPlan[], timing: TimingOptions, progress: Progress = quiet, reuse?: CheckedReuse): Promise<CheckedUnit[]> {
  const checked: CheckedCapture[] = [];
  try {
    for (const plan of plans) {
      const earlier = reuse?.reused(plan);
      if (earlier) {
        checked.push(earlier);
        continue;
      }
      let started = false;
      const capture = await readCapture(plan.readFrom ?? resolvePath(ctx.io.cwd, plan.path), {
        ...(spec.reading ? { ...spec.reading, profile: `${spec.file} captures.reading` } : {}),
        ...timing,
        onProgress: (done, total) => {
          if (!started) progress.start(plan.path, total);
          started = true;
          progress.update(done);
        },
      });
      const named = { ...capture, path: plan.path };
      const bound = bindCapture(spec, plan, named, measureCapture(named, { plotData: true, ...(spec.harmonicSet ? { harmonicSet: spec.harmonicSet } : {}) }));
      reuse?.checked(plan, bound);
      checked.push(bound);
    }
  } finally {
    progress.stop();
  }
  return decideUnits(spec, checked).map((verdict) => ({ verdict, diagnosis: describeDiagnosis(diagnoseUnit(spec, verdict)) }));
}

/** Who stored a run and from where. */
export { runOf } from './store.js';
export type { RunAuthor } from './store.js';

/** What one `check` is asked to do: the files and the flags that shape the check and the stored run. */
export interface CheckJob {
  /** The spec file, as given to --spec. */
  readonly specFile: string;
  /** Capture files, relative to the context's working directory or absolute. */
  readonly files: readonly string[];
  readonly unit?: string;
  readonly condition?: string;
  readonly forceUnit?: boolean;
  /** What was done to the unit before these captures (--note): opens a new attempt. Checked here. */
  readonly note?: string;
  readonly newAttempt?: boolean;
  readonly timing: TimingOptions;
  /** When the check started (ISO time), stored with each run. */
  readonly startedAt: string;
}

export interface CheckOutcome {
  readonly spec: Spec;
  readonly units: CheckedUnit[];
  /** The runs as stored, one per unit; empty with --no-store. */
  readonly stored: StoredRun[];
}

export interface CheckHooks {
  readonly progress?: Progress;
  /** How the spec is read; loadSpec by default (the page keeps the last parse while the text is unchanged). */
  readonly loadSpec?: (ctx: CommandContext, file: string) => LoadedSpec;
}

/**
 * `benchproof check`: plan every file name first (a misnamed file fails before any capture is read),
 * let each unit's open attempt lend the captures the new files do not cover (unless --note,
 * --new-attempt or --no-store), read, measure, decide and diagnose, then store every checked unit
 * (one transaction each) with one notice line on stderr.
 */
export async function checkAndStore(ctx: CommandContext, flags: StoreFlags, job: CheckJob, hooks: CheckHooks = {}): Promise<CheckOutcome> {
  const { progress = quiet, loadSpec: load = loadSpec } = hooks;
  const note = checkNote(job.note);
  const { spec, text } = load(ctx, job.specFile);
  const plans = planFiles(spec, job.files, { unit: job.unit, condition: job.condition }, Boolean(job.forceUnit));
  const fresh = flags.store === false || job.newAttempt === true || note !== undefined;
  const companions = fresh ? undefined : companionsFromStore(ctx, flags, spec, plans);
  ctx.io.stderr(describeCompanions(companions));
  const units = await checkPlans(ctx, spec, [...plans, ...(companions?.plans ?? [])], job.timing, progress);
  const stored = storeCheckedUnits(ctx, flags, units, job.startedAt, text, { note, newAttempt: job.newAttempt, sources: companions?.sources, specFile: job.specFile });
  return { spec, units, stored };
}
