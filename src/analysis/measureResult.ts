/** Builders for the MeasureResult union (src/types/measurement.ts): a value with its reason, never NaN. */
import type { MeasureResult, MeasurementBound, WithheldReason } from '../types/index.js';

/**
 * A measured value. A non-finite value is a bug in the caller's method (it should have withheld),
 * so it throws at once; a non-finite uncertainty becomes null (none could be estimated).
 */
export function measured(value: number, uncertainty: number | null, unit: string, method: string): MeasureResult {
  if (!Number.isFinite(value)) throw new RangeError(`measured: value ${value} is not finite (${method})`);
  const u = uncertainty !== null && Number.isFinite(uncertainty) ? Math.abs(uncertainty) : null;
  return { ok: true, value, uncertainty: u, unit, method };
}

export function withheld(reason: WithheldReason, detail: string): MeasureResult {
  return { ok: false, reason, detail };
}

/**
 * Nothing detected beyond a level: withheld as below the noise, with the one-sided bound and how it
 * was set. A non-finite bound is a bug in the caller's method, as for `measured`.
 */
export function bounded(kind: MeasurementBound['kind'], value: number, detail: string, method: string): MeasureResult {
  if (!Number.isFinite(value)) throw new RangeError(`bounded: bound ${value} is not finite (${method})`);
  return { ok: false, reason: 'below-noise', detail, bound: { kind, value }, method };
}
