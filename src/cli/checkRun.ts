/**
 * The check pipeline shared by `check` and `watch`: read the spec, then for each planned capture
 * read → measure → bind, decide each unit and rank its likely causes; and the run a checked unit is
 * stored as. Commands import this module lazily inside their action, so the stages (zod, fft.js,
 * the CSV reader) load only when a check actually runs.
 */
import { readCapture } from '../capture/index.js';
import { measureCapture } from '../analysis/index.js';
import { SPEC_MAX_BYTES, bindCapture, decideUnits, parseSpec } from '../spec/index.js';
import type { CapturePlan, Spec } from '../spec/index.js';
import { diagnoseUnit } from '../diagnose/index.js';
import type { CheckedCapture, ReadCaptureOptions } from '../types/index.js';
import type { CommandContext } from './context.js';
import { resolvePath } from './context.js';
import type { Progress } from './progress.js';
import type { CheckedUnit } from './store.js';
import { readSpecFile } from './specFile.js';

export { planCapture, worstStatement } from '../spec/index.js';

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
export type TimingOptions = Pick<ReadCaptureOptions, 'sampleRate' | 'interval'>;

const quiet: Progress = { start() {}, update() {}, stop() {} };

/**
 * Read, measure and bind every planned capture in order, then decide each unit and diagnose it.
 * The first capture that cannot be read stops the whole check with its BenchError.
 */
export async function checkPlans(ctx: CommandContext, spec: Spec, plans: readonly CapturePlan[], timing: TimingOptions, progress: Progress = quiet): Promise<CheckedUnit[]> {
  const checked: CheckedCapture[] = [];
  try {
    for (const plan of plans) {
      let started = false;
      const capture = await readCapture(resolvePath(ctx.io.cwd, plan.path), {
        ...timing,
        onProgress: (done, total) => {
          if (!started) progress.start(plan.path, total);
          started = true;
          progress.update(done);
        },
      });
      const named = { ...capture, path: plan.path };
      checked.push(bindCapture(spec, plan, named, measureCapture(named, { plotData: true })));
    }
  } finally {
    progress.stop();
  }
  return decideUnits(spec, checked).map((verdict) => ({ verdict, diagnosis: diagnoseUnit(spec, verdict) }));
}

/** Who stored a run and from where. */
export { runOf } from './store.js';
export type { RunAuthor } from './store.js';
