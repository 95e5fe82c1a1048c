/**
 * First and second moments of a record over whole cycles. The window runs from the first to the last
 * rising mid-reference crossing, so it holds an integer number of cycles: a partial cycle would bias
 * the mean and rms by up to half the swing times the partial fraction (common practice, no source;
 * the same reason IEEE Std 1057 fits whole cycles). Each cycle takes the samples from the first sample
 * at or after its start crossing up to the one before the next, so the window is within one sample of
 * exact; the caller states that one-sample resolution as a Type B uncertainty.
 */

export interface CycleMoments {
  /** Per-cycle mean and mean square. */
  readonly means: Float64Array;
  readonly meanSquares: Float64Array;
  /** Over the whole window. */
  readonly mean: number;
  readonly meanSquare: number;
  readonly count: number;
  readonly cycles: number;
}

/** `starts`: fractional sample index of each cycle start, ascending; null with fewer than 2 starts. */
export function cycleMoments(samples: Float64Array, starts: readonly number[]): CycleMoments | null {
  const cycles = starts.length - 1;
  if (cycles < 1) return null;
  const means = new Float64Array(cycles);
  const meanSquares = new Float64Array(cycles);
  let sum = 0;
  let sumSq = 0;
  let count = 0;
  for (let c = 0; c < cycles; c++) {
    const from = Math.ceil(starts[c]);
    const to = Math.min(samples.length, Math.ceil(starts[c + 1]));
    let s = 0;
    let q = 0;
    for (let i = from; i < to; i++) {
      s += samples[i];
      q += samples[i] * samples[i];
    }
    const n = to - from;
    means[c] = n > 0 ? s / n : 0;
    meanSquares[c] = n > 0 ? q / n : 0;
    sum += s;
    sumSq += q;
    count += n;
  }
  if (count === 0) return null;
  return { means, meanSquares, mean: sum / count, meanSquare: sumSq / count, count, cycles };
}
