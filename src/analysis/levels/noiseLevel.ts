/**
 * Standard deviation of the additive noise on a record, from its second differences.
 *
 * For white noise of standard deviation σ, d[i] = x[i+1] − 2x[i] + x[i−1] has variance 6σ²
 * (the coefficients 1, −2, 1 square-sum to 6), while straight ramps and flat states contribute
 * nothing and corners or edges only a few outliers. The outliers are removed by keeping the smallest
 * 80 % of |d| and correcting for the truncation: for a normal variable, E[X² | |X| ≤ z₀.₉₀σ] = 0.4377σ²
 * with z₀.₉₀ = 1.2816 (truncated-normal moment 1 − 2zφ(z)/(2Φ(z) − 1), computed). A trimmed mean
 * square is used instead of the median absolute deviation because on quantised records most second
 * differences are exactly zero and the MAD would report no noise at all.
 * On long records a fixed stride of at most 65 536 differences is used (deterministic).
 * A sine sampled coarsely has real curvature, so the estimate is an upper bound there.
 * A slow ramp on a coarse quantiser steps only now and then, so nearly all second differences are
 * zero; when more than a fifth of the first differences are exactly zero the record is taken as
 * quantised with code width q (its smallest non-zero step, if under 1/16 of the range: the only steps
 * of an ideal square are its edges) and σ is at least q/√12, the rms error of an ideal quantiser
 * (REFERENCES.md §3).
 */

const TRUNCATED_SECOND_MOMENT = 0.4377;
const KEEP = 0.8;
const MAX_TERMS = 65_536;

export function noiseLevel(samples: Float64Array): number {
  const n = samples.length;
  if (n < 3) return 0;
  const stride = Math.max(1, Math.floor((n - 2) / MAX_TERMS));
  // A typed array sorts numerically without a comparator, several times faster than number[].
  const all = new Float64Array(Math.floor((n - 3) / stride) + 1);
  let count = 0;
  for (let i = 1; i < n - 1; i += stride) {
    const v = samples[i + 1] - 2 * samples[i] + samples[i - 1];
    if (Number.isFinite(v)) all[count++] = Math.abs(v);
  }
  if (count === 0) return 0;
  const d = all.subarray(0, count).sort();
  const keep = Math.max(1, Math.floor(count * KEEP));
  let s = 0;
  for (let i = 0; i < keep; i++) s += d[i] * d[i];
  return Math.max(Math.sqrt(s / keep / (6 * TRUNCATED_SECOND_MOMENT)), quantisationFloor(samples, stride));
}

function quantisationFloor(x: Float64Array, stride: number): number {
  let zeros = 0;
  let total = 0;
  let q = Infinity;
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i + 1 < x.length; i += stride) {
    const step = Math.abs(x[i + 1] - x[i]);
    if (!Number.isFinite(step)) continue;
    total++;
    lo = Math.min(lo, x[i]);
    hi = Math.max(hi, x[i]);
    if (step === 0) zeros++;
    else if (step < q) q = step;
  }
  const quantised = total > 0 && zeros > 0.2 * total && q <= (hi - lo) / 16;
  return quantised ? q / Math.sqrt(12) : 0;
}
