/**
 * Reference-level crossings with hysteresis and sub-sample linear interpolation
 * (IEEE Std 181-2011 §5.3: reference level instants found by linear interpolation between the two
 * samples that straddle the level).
 *
 * A crossing counts only once the signal has gone from below `level − hysteresis` to above
 * `level + hysteresis` (or the reverse), so noise riding on the level cannot create false edges.
 * Its instant is the last straddle of `level` itself before the far band edge was reached, so the
 * hysteresis does not bias timing. Positions are fractional sample indices (multiply by the sample
 * interval for seconds). `steps` holds |x[j+1] − x[j]| of each straddling pair: a step of nearly the
 * whole amplitude means the edge fell between two samples and its instant is only known to ±½ sample.
 */

export interface Crossings {
  /** Fractional sample index of each rising crossing, in order. */
  readonly rising: readonly number[];
  readonly falling: readonly number[];
  /** |x[j+1] − x[j]| of the straddling pair, one per crossing (same order). */
  readonly risingSteps: readonly number[];
  readonly fallingSteps: readonly number[];
}

export function midCrossings(samples: Float64Array, level: number, hysteresis: number): Crossings {
  if (!(hysteresis >= 0)) throw new RangeError(`midCrossings: hysteresis ${hysteresis} must be ≥ 0`);
  const upper = level + hysteresis;
  const lower = level - hysteresis;
  const rising: number[] = [];
  const falling: number[] = [];
  const risingSteps: number[] = [];
  const fallingSteps: number[] = [];
  let state: 'low' | 'high' | 'none' = 'none';
  let armed = 0;
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i];
    if (v < lower) {
      if (state === 'high') record(samples, level, armed, i, -1, falling, fallingSteps);
      state = 'low';
      armed = i;
    } else if (v > upper) {
      if (state === 'low') record(samples, level, armed, i, 1, rising, risingSteps);
      state = 'high';
      armed = i;
    }
  }
  return { rising, falling, risingSteps, fallingSteps };
}

/** Interpolate the last straddle of `level` between index `from` (beyond the far band) and `to`. */
function record(
  x: Float64Array,
  level: number,
  from: number,
  to: number,
  sign: 1 | -1,
  out: number[],
  steps: number[],
): void {
  for (let j = to - 1; j >= from; j--) {
    if (sign * (x[j] - level) <= 0 && sign * (x[j + 1] - level) > 0) {
      const frac = (level - x[j]) / (x[j + 1] - x[j]);
      out.push(j + frac);
      steps.push(Math.abs(x[j + 1] - x[j]));
      return;
    }
  }
}
