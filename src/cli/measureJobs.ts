/** The messages between `measure` and its worker threads (measureWorkers.ts, measureWorker.ts). */
import type { MeasureCaptureOptions } from '../analysis/index.js';
import type { Capture, MeasureReport } from '../types/index.js';

/** Measure this capture (one channel of the file's) and answer with its report. */
export interface MeasureJob {
  readonly job: number;
  readonly capture: Capture;
  readonly options: MeasureCaptureOptions;
}

export type MeasureAnswer = { readonly measured: number; readonly report: MeasureReport } | { readonly failed: number; readonly message: string };

export function isMeasureJob(m: unknown): m is MeasureJob {
  return typeof m === 'object' && m !== null && 'job' in m && 'capture' in m;
}

export function isMeasureAnswer(m: unknown): m is MeasureAnswer {
  return typeof m === 'object' && m !== null && ('measured' in m || 'failed' in m);
}
