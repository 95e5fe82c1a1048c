/**
 * Non-uniform samples (a simulator's adaptive steps, a logger's jitter) onto a uniform grid by
 * linear interpolation between the neighbouring samples (the first-order hold, e.g. Oppenheim &
 * Schafer, Discrete-Time Signal Processing, 3rd ed., §4.6). The grid runs from the first time in
 * steps of the median step (or the step the user gave); a grid point between an invalid (NaN)
 * sample and its neighbour stays NaN.
 */

export interface Resampled {
  readonly t0: number;
  readonly step: number;
  readonly channels: Float64Array[];
}

/** Median of the steps between consecutive times. */
export function medianStep(times: Float64Array): number {
  const steps = new Float64Array(times.length - 1);
  for (let i = 1; i < times.length; i++) steps[i - 1] = times[i] - times[i - 1];
  steps.sort();
  const m = steps.length >> 1;
  return steps.length % 2 === 1 ? steps[m] : (steps[m - 1] + steps[m]) / 2;
}

/** Number of grid points from times[0] to the last time with this step. */
export function gridLength(times: Float64Array, step: number): number {
  return Math.floor((times[times.length - 1] - times[0]) / step + 1e-9) + 1;
}

export function resampleUniform(times: Float64Array, channels: readonly Float64Array[], step: number): Resampled {
  if (!(step > 0)) throw new RangeError(`resampleUniform: step must be positive, got ${step}`);
  const t0 = times[0];
  const n = gridLength(times, step);
  const out = channels.map(() => new Float64Array(n));
  let j = 0;
  for (let g = 0; g < n; g++) {
    const t = t0 + g * step;
    while (j < times.length - 2 && times[j + 1] <= t) j++;
    const span = times[j + 1] - times[j];
    const w = span > 0 ? Math.min(1, Math.max(0, (t - times[j]) / span)) : 0;
    for (let c = 0; c < channels.length; c++) {
      const a = channels[c][j];
      const b = channels[c][j + 1];
      out[c][g] = w === 0 ? a : w === 1 ? b : a + (b - a) * w;
    }
  }
  return { t0, step, channels: out };
}
