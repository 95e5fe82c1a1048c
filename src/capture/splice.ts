/**
 * Where a record was spliced: one step between neighbouring samples that no slew of the signal
 * explains. A step is a splice when it is larger than SPLICE_RATIO times every other step of the
 * channel (so square and pulse edges, which recur, never qualify, and a one-sample spike, whose
 * return step is as large, does not either), and the signal on the longer side crosses its middle
 * often enough to be a periodic waveform rather than a single step response. Common practice
 * (no source): the ratio is chosen so that a sine or triangle sampled at 20 points per period or
 * more, with noise, never shows such a step on its own.
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

function crossings(x: Float64Array, from: number, to: number): number {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = from; i < to; i++) {
    if (x[i] < lo) lo = x[i];
    if (x[i] > hi) hi = x[i];
  }
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
