/**
 * Approximate quantiles of a record from a fine histogram (4096 bins between its minimum and
 * maximum, linear within a bin), so long records need no sort. Resolution is (max − min)/4096,
 * plenty for choosing reference levels. Common practice (no source).
 */

const BINS = 4096;

export interface Range {
  readonly min: number;
  readonly max: number;
}

export function extremes(samples: Float64Array): Range {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < samples.length; i++) {
    const v = samples[i];
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { min, max };
}

/** Quantiles of the samples at the given probabilities (each in 0…1); `range` saves a pass when the caller has it. */
export function quantiles(samples: Float64Array, probabilities: readonly number[], range: Range = extremes(samples)): number[] {
  const { min, max } = range;
  if (!(max > min)) return probabilities.map(() => min);
  const counts = new Float64Array(BINS);
  const scale = BINS / (max - min);
  for (let i = 0; i < samples.length; i++) {
    counts[Math.min(BINS - 1, Math.floor((samples[i] - min) * scale))]++;
  }
  return probabilities.map((p) => {
    const target = p * samples.length;
    let acc = 0;
    for (let b = 0; b < BINS; b++) {
      if (acc + counts[b] >= target) {
        const frac = counts[b] > 0 ? (target - acc) / counts[b] : 0;
        return min + (b + frac) / scale;
      }
      acc += counts[b];
    }
    return max;
  });
}
