/**
 * The longest contiguous run of finite samples. A capture with a few invalid samples (blank cells,
 * overflow markers, stored as NaN by the reader) is measured on that run when it is most of the
 * record; interpolating across the gap would be a guess (common practice, no source).
 */

export interface ValidRun {
  /** Index of the first sample of the run in the channel. */
  readonly start: number;
  readonly length: number;
}

export function validRun(samples: Float64Array): ValidRun {
  let best: ValidRun = { start: 0, length: 0 };
  let start = 0;
  for (let i = 0; i <= samples.length; i++) {
    if (i === samples.length || !Number.isFinite(samples[i])) {
      if (i - start > best.length) best = { start, length: i - start };
      start = i + 1;
    }
  }
  return best;
}
