/**
 * Where a record was spliced from two: the longer continuous part is kept by assemble.ts.
 *
 * A step between neighbouring samples is a splice when it is larger than SPLICE_RATIO times every
 * other step of the channel (so square and pulse edges, which recur, never qualify, and a one-sample
 * spike, whose return step is as large, does not either) and the longer side holds a couple of
 * periods of a periodic waveform rather than a single step response.
 *
 * A splice can also join without a step (a tail with another offset or phase that happens to start
 * near the last level). A periodic signal repeats itself one period later, x[i] ≈ x(i − P); across a
 * splice it does not, for exactly one period, and agrees again once both samples lie in the tail.
 * So a block of about one period where most samples disagree with the period before, while nearly
 * every other sample agrees, marks a splice at the block's first sample. The period is the median
 * spacing of rising mid-level crossings. Common practice (no source) for all the constants: a sine
 * or triangle at 8 or more points per period, with noise, hum, 8-bit steps or clipping, shows none
 * of these on its own (test/capture/splice.test.ts).
 *
 * Speed: this runs on every capture read, so long records are scanned in three passes, the last two
 * at every STRIDE-th sample with the exact place refined locally.
 */

export const SPLICE_RATIO = 6;
/** Share of a period's samples that must disagree with the period before, and the most elsewhere. */
const BLOCK_SHARE = 0.6;
const ELSEWHERE_SHARE = 0.03;
/** Records longer than this are scanned at every STRIDE-th sample where the period allows. */
const LONG = 1 << 16;
const STRIDE = 4;

export interface Splice {
  /** Index of the first sample after the break. */
  readonly at: number;
  readonly channel: number;
  /** The step, or the disagreement with the period before, in the channel's unit. */
  readonly step: number;
  /** A step between two samples, or a record that stops repeating itself one period on. */
  readonly kind: 'step' | 'period';
}

/** The first splice found over the channels, or null. */
export function findSplice(channels: readonly Float64Array[]): Splice | null {
  for (let c = 0; c < channels.length; c++) {
    const s = spliceIn(channels[c]);
    if (s) return { ...s, channel: c };
  }
  return null;
}

function spliceIn(x: Float64Array): Omit<Splice, 'channel'> | null {
  const n = x.length;
  if (n < 64) return null;
  let lo = Infinity;
  let hi = -Infinity;
  let big = 0;
  let second = 0;
  let at = -1;
  for (let i = 0; i < n; i++) {
    const v = x[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
    const d = i > 0 ? Math.abs(v - x[i - 1]) : 0;
    if (d > big) {
      second = big;
      big = d;
      at = i;
    } else if (d > second) second = d;
  }
  if (!(hi > lo)) return null;
  const period = medianPeriod(x, lo, hi);
  if (period === null) return null;
  if (at > 0 && second > 0 && big > SPLICE_RATIO * second && Math.max(at, n - at) >= 2 * period) return { at, step: big, kind: 'step' };
  return periodSplice(x, period, lo, hi);
}

function periodSplice(x: Float64Array, period: number, lo: number, hi: number): Omit<Splice, 'channel'> | null {
  const n = x.length;
  if (period < 8 || 3 * period > n) return null;
  const from = Math.ceil(period) + 1;
  const miss = (i: number): number => {
    const back = i - period;
    const j = Math.floor(back);
    return Math.abs(x[i] - (x[j] + (x[j + 1] - x[j]) * (back - j)));
  };
  // The typical disagreement from a few thousand evenly spread samples: a median needs no more.
  const spread = Math.max(1, Math.floor((n - from) / 4096));
  const probe: number[] = [];
  for (let i = from; i < n; i += spread) probe.push(miss(i));
  probe.sort((a, b) => a - b);
  const limit = Math.max(8 * probe[probe.length >> 1], 0.05 * (hi - lo));
  if (!(limit > 0)) return null;
  const stride = n > LONG && period >= 8 * STRIDE ? STRIDE : 1;
  const len = Math.round(period);
  // Only the disagreeing samples are kept; more than a block and the allowance elsewhere means no splice.
  const most = Math.ceil((ELSEWHERE_SHARE * n + len) / stride) + 1;
  const hits = new Int32Array(most);
  let count = 0;
  for (let i = from; i < n; i += stride) {
    if (!(miss(i) > limit)) continue;
    if (count === most) return null;
    hits[count++] = i;
  }
  for (let a = 0, b = 0; a < count; a++) {
    const k = hits[a];
    const end = Math.min(n, k + len);
    while (b < count && hits[b] < end) b++;
    const looked = Math.ceil((end - k) / stride);
    if (end - k < len / 4 || b - a < BLOCK_SHARE * looked) continue;
    if (count - (b - a) > ELSEWHERE_SHARE * ((n - from - (end - k)) / stride)) return null;
    let first = k;
    while (first - 1 >= Math.max(from, k - stride + 1) && miss(first - 1) > limit) first--;
    return { at: first, step: miss(first), kind: 'period' };
  }
  return null;
}

/**
 * Median distance between rising crossings of the mid-level, interpolated; null with fewer than
 * four. Long records are searched at every STRIDE-th sample and each crossing found is placed
 * exactly among the samples it skipped; a period too short for that is searched again sample by sample.
 */
function medianPeriod(x: Float64Array, lo: number, hi: number): number | null {
  const coarse = x.length > LONG ? crossingPeriod(x, lo, hi, STRIDE) : null;
  return coarse !== null && coarse >= 8 * STRIDE ? coarse : crossingPeriod(x, lo, hi, 1);
}

function crossingPeriod(x: Float64Array, lo: number, hi: number, stride: number): number | null {
  const mid = (lo + hi) / 2;
  // A little hysteresis (a tenth of the range) so that noise on a slow edge counts one crossing.
  const band = (hi - lo) / 10;
  const at: number[] = [];
  let armed = x[0] < mid - band;
  for (let i = stride; i < x.length; i += stride) {
    if (x[i] < mid - band) armed = true;
    else if (armed && x[i] >= mid) {
      let j = i;
      while (j - 1 > i - stride && !(x[j - 1] < mid)) j--;
      if (x[j - 1] < mid) at.push(j - 1 + (mid - x[j - 1]) / (x[j] - x[j - 1]));
      armed = false;
    }
  }
  if (at.length < 4) return null;
  const gaps = at.slice(1).map((a, k) => a - at[k]).sort((a, b) => a - b);
  return gaps[gaps.length >> 1];
}
