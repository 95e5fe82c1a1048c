/**
 * The check pipeline shared by `check` and `watch`: read the spec, then for each planned capture
 * read → measure → bind, decide each unit and rank its likely causes; and the run a checked unit is
 * stored as. Commands import this module lazily inside their action, so the stages (zod, fft.js,
 * the CSV reader) load only when a check actually runs.
 */
import { readCapture } from '../capture/index.js';
import { measureCapture } from '../analysis/index.js';
import { SPEC_MAX_BYTES, bindCapture, decideUnits, parseSpec, planCapture } from '../design/index.js';
import type { CapturePlan, PlanOverrides, Spec } from '../design/index.js';
import { diagnoseUnit } from '../diagnose/index.js';
import { BenchError } from '../types/index.js';
import type { CheckedCapture, ReadCaptureOptions } from '../types/index.js';
import type { CommandContext } from './context.js';
import { resolvePath } from './context.js';
import type { Progress } from './progress.js';
import type { CheckedUnit } from './store.js';
import { readSpecFile } from './specFile.js';

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
 * Read, measure and bind every planned capture in order, then decide each unit and diagnose it.
 * The first capture that cannot be read stops the whole check with its BenchError.
 */
export async function checkPlans(ctx: CommandContext, spec: Spec, plans: readonly SourcedPlan[], timing: TimingOptions, progress: Progress = quiet): Promise<CheckedUnit[]> {
  const checked: CheckedCapture[] = [];
  try {
    for (const plan of plans) {
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
      checked.push(bindCapture(spec, plan, named, measureCapture(named, { plotData: true, ...(spec.harmonicSet ? { harmonicSet: spec.harmonicSet } : {}) })));
    }
  } finally {
    progress.stop();
  }
  return decideUnits(spec, checked).map((verdict) => ({ verdict, diagnosis: diagnoseUnit(spec, verdict) }));
}

/** Who stored a run and from where. */
export { runOf } from './store.js';
export type { RunAuthor } from './store.js';
