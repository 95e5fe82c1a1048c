/**
 * Min/max per pixel column for interactive plots: the samples of a time window are split into
 * `columns` runs of consecutive samples, and each column keeps the smallest and largest sample it
 * holds, so every peak, edge and glitch in the window stays visible at any zoom (the usual
 * "min/max" or envelope decimation for plotting long records: common practice, no source). Windows
 * holding no more samples than columns are returned sample by sample (min = max = the sample).
 * The cost is one pass over the samples inside the window only, never the whole record.
 */
export interface PlotColumns {
  /** Time of each column's first sample, in seconds. */
  readonly t: Float64Array;
  readonly min: Float64Array;
  readonly max: Float64Array;
  /** Index of the first sample in the window, and one past the last. */
  readonly first: number;
  readonly end: number;
  /** Samples per column (1 when the window is shown sample by sample). */
  readonly step: number;
}

/**
 * `samples` start at time `t0` with interval `dt`; the window is [from, to] in seconds (clamped to
 * the record). Non-finite samples are skipped; a column with none keeps NaN.
 */
export function plotDecimate(samples: Float64Array, t0: number, dt: number, from: number, to: number, columns: number): PlotColumns {
  if (!(dt > 0) || !Number.isFinite(dt)) throw new RangeError(`plotDecimate: dt ${dt} is not a positive interval`);
  if (!Number.isInteger(columns) || columns < 1) throw new RangeError(`plotDecimate: columns ${columns} is not a positive integer`);
  if (!(to >= from)) throw new RangeError(`plotDecimate: window [${from}, ${to}] is empty or reversed`);
  const n = samples.length;
  const first = Math.min(n, Math.max(0, Math.floor((from - t0) / dt)));
  const end = Math.min(n, Math.max(first, Math.ceil((to - t0) / dt) + 1));
  const count = end - first;
  const step = Math.max(1, Math.ceil(count / columns));
  const out = Math.ceil(count / step);
  const t = new Float64Array(out);
  const min = new Float64Array(out).fill(NaN);
  const max = new Float64Array(out).fill(NaN);
  for (let c = 0; c < out; c++) {
    const a = first + c * step;
    const b = Math.min(end, a + step);
    let lo = Infinity;
    let hi = -Infinity;
    for (let i = a; i < b; i++) {
      const v = samples[i];
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
    t[c] = t0 + a * dt;
    if (lo <= hi) {
      min[c] = lo;
      max[c] = hi;
    }
  }
  return { t, min, max, first, end, step };
}

/**
 * The same per-column reduction over an evenly spaced series that is already small (a stored
 * spectrum: levels at k·binWidth): the window [from, to] in the series' own x unit.
 */
export function plotDecimateSeries(values: ArrayLike<number>, binWidth: number, from: number, to: number, columns: number): PlotColumns {
  const samples = values instanceof Float64Array ? values : Float64Array.from(values);
  return plotDecimate(samples, 0, binWidth, from, to, columns);
}
