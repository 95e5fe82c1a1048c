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
 * Speed: this runs on every capture read, so long records are scanned in three passes at every
 * STRIDE-th sample, each find placed exactly among the samples skipped.
 */

export const SPLICE_RATIO = 6;
/** Share of a period's samples that must disagree with the period before, and the most elsewhere. */
const BLOCK_SHARE = 0.6;
const ELSEWHERE_SHARE = 0.03;
/** Records longer than this are scanned at every STRIDE-th sample where the period allows. */
const LONG = 1 << 16;
const STRIDE = 16;
/** Samples whose disagreement with the period before sets the typical level. */
const PROBES = 1024;

export interface Splice {
  /** Index of the first sample after the break. */
  readonly at: number;
  readonly channel: number;
  /** The step, or the disagreement with the period before, in the channel's unit. */
  readonly step: number;
  /** A step between two samples, or a record that stops repeating itself one period on. */
  readonly kind: 'step' | 'period';
}

/**
 * The first splice found over the channels, or null. A splice breaks every channel at the same row,
 * so the search stops at the first channel that repeats itself cleanly (a square wave, whose edges
 * never line up exactly one period on, cannot tell, and the next channel is asked).
 */
export function findSplice(channels: readonly Float64Array[]): Splice | null {
  for (let c = 0; c < channels.length; c++) {
    const s = spliceIn(channels[c]);
    if (s === CLEAN) return null;
    if (s) return { ...s, channel: c };
  }
  return null;
}

/** A channel that repeats itself everywhere: no splice, and no need to look at the others. */
const CLEAN = 'clean';
type Found = Omit<Splice, 'channel'> | typeof CLEAN | null;

function spliceIn(x: Float64Array): Found {
  const n = x.length;
  if (n < 64) return null;
  // Long records: the range from every STRIDE-th sample, and no step search of its own, since a
  // step also stops the record repeating itself and the period search finds it.
  const long = n > LONG;
  const stride = long ? STRIDE : 1;
  let lo = Infinity;
  let hi = -Infinity;
  let big = 0;
  let second = 0;
  let at = -1;
  for (let i = 0; i < n; i += stride) {
    const v = x[i];
    if (v < lo) lo = v;
    if (v > hi) hi = v;
    if (long) continue;
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

function periodSplice(x: Float64Array, period: number, lo: number, hi: number): Found {
  const n = x.length;
  if (period < 8 || 3 * period > n) return null;
  const from = Math.ceil(period) + 1;
  // x(i − P) between the samples c = ⌈P⌉ and c − 1 back, at the same fraction w for every i.
  const c = Math.ceil(period);
  const w = c - period;
  const miss = (i: number): number => Math.abs(x[i] - (x[i - c] + (x[i - c + 1] - x[i - c]) * w));
  // The typical disagreement from a thousand evenly spread samples: a median needs no more.
  const spread = Math.max(1, Math.floor((n - from) / PROBES));
  const probe = new Float64Array(Math.ceil((n - from) / spread));
  for (let i = from, k = 0; i < n; i += spread) probe[k++] = miss(i);
  probe.sort();
  const limit = Math.max(8 * probe[probe.length >> 1], 0.05 * (hi - lo));
  if (!(limit > 0)) return null;
  // Long records are looked at some 32 times a period: a block of one period still shows plainly.
  const stride = n > LONG ? Math.max(1, Math.floor(period / 32)) : 1;
  const len = Math.round(period);
  // Only the disagreeing samples are kept; more than a block and the allowance elsewhere means no splice.
  const most = Math.ceil((ELSEWHERE_SHARE * n + len) / stride) + 1;
  const hits = new Int32Array(most);
  let count = 0;
  for (let i = from; i < n; i += stride) {
    if (!(Math.abs(x[i] - (x[i - c] + (x[i - c + 1] - x[i - c]) * w)) > limit)) continue;
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
  return CLEAN;
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
