/**
 * The calibration pipeline shared by `calibrate` and `watch --calibrate`: one capture at a time is
 * read, measured and placed at its step (`calibrateCapture`, for a watcher that sees files arrive), or
 * a whole capture set is measured in step order (`measureCalibrationSteps`); a complete set is decided
 * against the spec's calibration limits, given its trim guidance and stored as one iteration of the
 * unit's calibration run (`finishIteration`). Loaded lazily by the commands.
 */
import { resolve } from 'node:path';
import { readCapture } from '../capture/index.js';
import { measureCapture } from '../analysis/index.js';
import { calibrationOf, calibrationReading, decideCalibration, describeLayout, matchCalibrationName } from '../design/index.js';
import type { CalibrationPlanEntry, Spec, StepReading } from '../design/index.js';
import { guideTrim } from '../diagnose/index.js';
import { sha256Hex } from '../records/index.js';
import type { IterationPlace } from '../report/index.js';
import { describeIteration } from '../report/index.js';
import { BenchError } from '../types/index.js';
import type { CalibrationIteration, CalibrationStepResult, NewCapture } from '../types/index.js';
import type { TimingOptions } from './checkRun.js';
import type { CommandContext } from './context.js';
import type { Progress } from './progress.js';
import { notice, openDataStore, quoteArg, resolveOperator, stationName } from './store.js';
import type { StoreFlags } from './store.js';
import { TOOL_VERSION } from './version.js';

export interface CalibrationFlags extends StoreFlags {
  /** Start a new calibration run even when the unit's latest one is still open. */
  newRun?: boolean;
}

export interface CalibrationSession {
  readonly spec: Spec;
  /** The spec file's exact text, kept with the stored iterations. */
  readonly specText: string;
  readonly unit: string;
  readonly label?: string;
  /** What was done before this iteration (`--note`), stored with it. */
  readonly note?: string;
  readonly timing: TimingOptions;
  readonly flags: CalibrationFlags;
  /** Measured steps of the capture set in progress, by step index; a later capture of a step replaces the earlier. */
  readonly steps: Map<number, MeasuredStep>;
}

export interface MeasuredStep {
  readonly reading: StepReading;
  readonly capture: NewCapture;
}

export interface CaptureOutcome {
  /** The step this capture filled, decided on its own (error in cents, statement). */
  readonly step: CalibrationStepResult;
  /** Steps still missing from the capture set. */
  readonly missing: readonly string[];
  /** Present once the capture completed the set: the decided iteration and, when stored, where it went. */
  readonly iteration?: CalibrationIteration;
  readonly place?: IterationPlace;
}

const quiet: Progress = { start() {}, update() {}, stop() {} };

/** Read and measure one capture for a known step. */
export async function measureStep(ctx: CommandContext, session: CalibrationSession, entry: CalibrationPlanEntry, progress: Progress = quiet): Promise<MeasuredStep> {
  let started = false;
  try {
    const capture = await readCapture(resolve(ctx.io.cwd, entry.path), {
      ...(session.spec.reading ? { ...session.spec.reading, profile: `${session.spec.file} captures.reading` } : {}),
      ...session.timing,
      onProgress: (done, total) => {
        if (!started) progress.start(entry.path, total);
        started = true;
        progress.update(done);
      },
    });
    const named = { ...capture, path: entry.path };
    const reading = calibrationReading(calibrationOf(session.spec), entry.step, measureCapture(named));
    const stored: NewCapture = { path: entry.path, sha256: capture.sha256, size: capture.size, layout: describeLayout(capture), condition: entry.step.label, sourcePath: resolve(ctx.io.cwd, entry.path) };
    return { reading, capture: stored };
  } finally {
    progress.stop();
  }
}

/** The per-capture step for a watcher: place the file at its step by name, measure it, and finish the set when complete. */
export async function calibrateCapture(ctx: CommandContext, session: CalibrationSession, path: string): Promise<CaptureOutcome> {
  const section = calibrationOf(session.spec);
  const match = matchCalibrationName(section, path);
  if (!match || (match.unit !== undefined && match.unit.toLowerCase() !== session.unit.toLowerCase())) {
    throw new BenchError({
      code: 'calibration.name-unmatched',
      file: path,
      problem: `the file name does not fit the calibration pattern "${section.pattern}" for unit ${session.unit}`,
      expected: `names like ${section.pattern.replace('{unit}', session.unit).replace('{step}', section.steps[0].label)}`,
      fix: 'save the capture under the pattern’s name, with the step label in place of {step}',
    });
  }
  const measured = await measureStep(ctx, session, { step: match.step, path });
  session.steps.set(match.step.index, measured);
  const step = decideCalibration(session.spec, session.unit, [measured.reading]).steps[0];
  const missing = section.steps.filter((s) => !session.steps.has(s.index)).map((s) => s.label);
  if (missing.length > 0) return { step, missing };
  const ordered = section.steps.map((s) => session.steps.get(s.index)!);
  session.steps.clear();
  const { iteration, place } = finishIteration(ctx, session, ordered, new Date().toISOString());
  return { step, missing, iteration, ...(place ? { place } : {}) };
}

/** Decide a complete capture set (in step order), add the trim guidance, and store it unless --no-store. */
export function finishIteration(ctx: CommandContext, session: CalibrationSession, steps: readonly MeasuredStep[], startedAt: string): { iteration: CalibrationIteration; place?: IterationPlace } {
  const decision = decideCalibration(session.spec, session.unit, steps.map((s) => s.reading), session.label ? { label: session.label } : {});
  const iteration = { ...describeIteration(guideTrim(session.spec, decision)), ...(session.note !== undefined ? { note: session.note } : {}) };
  if (session.flags.store === false) return { iteration };
  return { iteration, place: storeIteration(ctx, session, iteration, steps, startedAt) };
}

function storeIteration(ctx: CommandContext, session: CalibrationSession, iteration: CalibrationIteration, steps: readonly MeasuredStep[], startedAt: string): IterationPlace {
  const { store, location } = openDataStore(ctx, session.flags, 'write');
  const { spec } = session;
  const text = sha256Hex(session.specText) === spec.sha256 ? session.specText : undefined;
  let saved;
  try {
    saved = store.saveCalibration({
      unit: session.unit,
      startedAt,
      operator: resolveOperator(ctx, session.flags),
      station: stationName(),
      spec: { name: spec.name, revision: spec.revision, sha256: spec.sha256, ...(text ? { text } : {}) },
      toolVersion: TOOL_VERSION,
      result: iteration,
      captures: steps.map((s) => s.capture),
      ...(session.flags.newRun ? { newRun: true } : {}),
    });
  } finally {
    store.close();
  }
  const place = { calibrationId: saved.calibrationId, number: saved.iteration.number, startedRun: saved.startedRun };
  const what = `stored iteration ${place.number} of calibration run #${place.calibrationId} of ${session.unit}${place.startedRun ? ' (a new run)' : ''} in ${location.shown}`;
  const next = iteration.meetsLimits ? recheckHint(session.spec, session.unit) : 'trim as guided, re-capture every step and run calibrate again';
  notice(ctx, what, next);
  return place;
}

/**
 * After a calibration the unit's earlier checks predate the trim: the next step is to capture every
 * condition again and check them (a new test attempt opens for it).
 */
export function recheckHint(spec: Spec, unit: string): string {
  const names = spec.conditions.map((c) => spec.pattern.replace('{unit}', unit).replace('{condition}', c.name).replace('{output}', '*'));
  return `re-check the unit: capture it at every condition, then benchproof check ${names.map(quoteArg).join(' ')} --spec ${quoteArg(spec.file)}`;
}
