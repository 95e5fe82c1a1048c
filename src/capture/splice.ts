/**
 * Where a record was spliced: one step between neighbouring samples that no slew of the signal
 * explains. A step is a splice when it is larger than SPLICE_RATIO times every other step of the
 * channel (so square and pulse edges, which recur, never qualify, and a one-sample spike, whose
 * return step is as large, does not either), and the signal on the longer side crosses its middle
 * often enough to be a periodic waveform rather than a single step response. Common practice
 * (no source): the ratio is chosen so that a sine or triangle sampled at 20 points per period or
 * more, with noise, never shows such a step on its own.
 *
 * A splice can also join without a step (a tail with another offset or phase that happens to start
 * near the last level). A periodic signal repeats itself one period later, x[i] ≈ x(i − P); across a
 * splice it does not, for exactly one period, and agrees again once both samples lie in the tail.
 * So a block of about one period where most samples disagree with the period before, while nearly
 * every other sample agrees, marks a splice at the block's first sample (common practice, no source;
 * the period comes from the median spacing of rising mid-level crossings).
 */

export const SPLICE_RATIO = 6;
/** Mid-level crossings the longer side must show: a few cycles of an oscillator's output. */
const MIN_CROSSINGS = 4;

export interface Splice {
  /** Index of the first sample after the break. */
  readonly at: number;
  readonly channel: number;
  /** The step, in the channel's unit. */
  readonly step: number;
}

/** The first splice found over the channels, or null. */
export function findSplice(channels: readonly Float64Array[]): Splice | null {
  for (let c = 0; c < channels.length; c++) {
    const s = spliceIn(channels[c]);
    if (s) return { ...s, channel: c };
  }
  return null;
}

function spliceIn(x: Float64Array): { at: number; step: number } | null {
  return stepSplice(x) ?? periodSplice(x);
}

/** Share of a period's samples that must disagree with the period before, and the most elsewhere. */
const BLOCK_SHARE = 0.6;
const ELSEWHERE_SHARE = 0.03;

function periodSplice(x: Float64Array): { at: number; step: number } | null {
  const n = x.length;
  const period = medianPeriod(x);
  if (period === null || period < 8 || 3 * period > n) return null;
  const from = Math.ceil(period) + 1;
  const r = new Float64Array(n);
  const [lo, hi] = range(x, 0, n);
  for (let i = from; i < n; i++) {
    const back = i - period;
    const j = Math.floor(back);
    const w = back - j;
    r[i] = Math.abs(x[i] - (x[j] + (x[j + 1] - x[j]) * w));
  }
  const sorted = Float64Array.from(r.subarray(from)).sort();
  const typical = sorted[sorted.length >> 1];
  const limit = Math.max(8 * typical, 0.05 * (hi - lo));
  if (!(limit > 0)) return null;
  const above = new Int32Array(n + 1);
  for (let i = 0; i < n; i++) above[i + 1] = above[i] + (i >= from && r[i] > limit ? 1 : 0);
  const len = Math.round(period);
  for (let k = from; k < n; k++) {
    if (!(r[k] > limit)) continue;
    const end = Math.min(n, k + len);
    if (end - k < len / 4 || above[end] - above[k] < BLOCK_SHARE * (end - k)) continue;
    const elsewhere = above[n] - (above[end] - above[k]);
    const rest = n - from - (end - k);
    if (elsewhere > ELSEWHERE_SHARE * rest) return null;
    return { at: k, step: r[k] };
  }
  return null;
}

/** Median distance between rising crossings of the mid-level, interpolated; null with fewer than four. */
function medianPeriod(x: Float64Array): number | null {
  const [lo, hi] = range(x, 0, x.length);
  if (!(hi > lo)) return null;
  const mid = (lo + hi) / 2;
  // A little hysteresis (a tenth of the range) so that noise on a slow edge counts one crossing.
  const band = (hi - lo) / 10;
  const at: number[] = [];
  let armed = x[0] < mid - band;
  for (let i = 1; i < x.length; i++) {
    if (x[i] < mid - band) armed = true;
    else if (armed && x[i] >= mid && x[i - 1] < mid) {
      at.push(i - 1 + (mid - x[i - 1]) / (x[i] - x[i - 1]));
      armed = false;
    }
  }
  if (at.length < 4) return null;
  const gaps = at.slice(1).map((a, k) => a - at[k]).sort((a, b) => a - b);
  return gaps[gaps.length >> 1];
}

function stepSplice(x: Float64Array): { at: number; step: number } | null {
  const n = x.length;
  if (n < 64) return null;
  let big = 0;
  let at = -1;
  let second = 0;
  for (let i = 1; i < n; i++) {
    const d = Math.abs(x[i] - x[i - 1]);
    if (!(d >= 0)) continue;
    if (d > big) {
      second = big;
      big = d;
      at = i;
    } else if (d > second) second = d;
  }
  if (at < 0 || !(big > SPLICE_RATIO * second) || second === 0) return null;
  const [from, to] = at >= n - at ? [0, at] : [at, n];
  return crossings(x, from, to) >= MIN_CROSSINGS ? { at, step: big } : null;
}

/** Smallest and largest finite sample in [from, to). */
function range(x: Float64Array, from: number, to: number): [number, number] {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = from; i < to; i++) {
    if (x[i] < lo) lo = x[i];
    if (x[i] > hi) hi = x[i];
  }
  return [lo, hi];
}

function crossings(x: Float64Array, from: number, to: number): number {
  const [lo, hi] = range(x, from, to);
  const mid = (lo + hi) / 2;
  let count = 0;
  let above = x[from] > mid;
  for (let i = from + 1; i < to; i++) {
    const now = x[i] > mid;
    if (now !== above) count++;
    above = now;
  }
  return count;
}
