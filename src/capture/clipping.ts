/**
 * Clipping: runs of samples pinned at the record's extremes (the trace ran off the screen, or the
 * output hit a rail). Common practice (no source); the rule, stated so it can be checked:
 *
 * 1. A run is ≥ 3 consecutive samples exactly equal to the record's maximum (or minimum).
 * 2. The run must be far longer than a quantised peak would dwell there. With resolution q (the
 *    gap between the extreme and the next value inside the record), a signal that only touches
 *    the top code spends at least about a quarter as long within 2q below it on each side as at
 *    the top (a linear ramp: ≤ 1×; a parabolic peak: ≤ 2.8×, closed form). A clipped trace
 *    arrives steeply, so the run must exceed 4× the longer of the two approach dwells.
 * 3. The run must cut off a ramp: on at least one side, walking away from the run, the signal
 *    must take ≥ 4× as many samples to fall 16q below the level as to fall 2q below it. A straight
 *    ramp takes 8× (closed form); a square wave's level is reached by a jump (1×) or an RC settling
 *    curve (depth grows as e^(k/τ): at most 1 + ln 8/ln 4 ≈ 2.5×), and a smooth unclipped peak
 *    is parabolic (√8 ≈ 2.8×), so none of those is taken for clipping. A sine clipped within 1 %
 *    of its peak is parabolic there too and is not flagged; its level error is then under 1 %.
 * 4. The samples in such runs must reach 0.5 % of the valid samples, so that one stray run of
 *    three in a long record does not count.
 * A waveform whose flat levels are reached along straight ramps (a slew-limited trapezoid without
 * noise) passes the rule too: its samples cannot tell it from a clipped triangle.
 */
import type { ClipInfo } from '../types/index.js';

const MIN_RUN = 3;
const APPROACH_RATIO = 4;
const MIN_SHARE = 0.005;
const RAMP_RATIO = 4;
const MAX_WALK = 1 << 20;

export function detectClipping(x: Float64Array): ClipInfo | null {
  // One pass for the extremes and the values next to them (below: the largest value under the
  // maximum, above: the smallest over the minimum); a new maximum makes the old one `below`.
  let max = -Infinity;
  let min = Infinity;
  let below = -Infinity;
  let above = Infinity;
  let valid = 0;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    if (v !== v) continue;
    valid++;
    if (v > max) {
      below = max;
      max = v;
    } else if (v < max && v > below) below = v;
    if (v < min) {
      above = min;
      min = v;
    } else if (v > min && v < above) above = v;
  }
  if (valid === 0 || max === min) return null;
  const { high, low } = pinnedSamples(x, max, max - below, min, above - min);
  const limit = MIN_SHARE * valid;
  if (high < limit && low < limit) return null;
  return { high: high >= limit ? high : 0, low: low >= limit ? low : 0 };
}

/**
 * Samples in runs at the top (`max`, resolution qHigh) and at the bottom (`min`, qLow) that satisfy
 * rules 1 to 3, found in one pass: the two levels differ, so their runs never touch.
 */
function pinnedSamples(x: Float64Array, max: number, qHigh: number, min: number, qLow: number): { high: number; low: number } {
  let high = 0;
  let low = 0;
  let i = 0;
  while (i < x.length) {
    const level = x[i];
    if (level !== max && level !== min) {
      i++;
      continue;
    }
    const a = i;
    while (i < x.length && x[i] === level) i++;
    const run = i - a;
    if (run < MIN_RUN) continue;
    const [dir, q] = level === max ? [1, qHigh] : [-1, qLow];
    const cap = Math.floor(run / APPROACH_RATIO) + 1;
    const before = a > 0 ? approach(x, a - 1, -1, level, q, dir, cap) : -1;
    const after = i < x.length ? approach(x, i, 1, level, q, dir, cap) : -1;
    if (before < 0 && after < 0) continue;
    if (run <= APPROACH_RATIO * Math.max(before, after)) continue;
    if (!cutsRamp(x, a - 1, -1, level, q, dir) && !cutsRamp(x, i, 1, level, q, dir)) continue;
    if (dir > 0) high += run;
    else low += run;
  }
  return { high, low };
}

/** Consecutive samples from `from` (walking by `step`) within 2q of the level, counted up to `cap`. */
function approach(x: Float64Array, from: number, step: number, level: number, q: number, dir: number, cap: number): number {
  let n = 0;
  for (let j = from; j >= 0 && j < x.length && n < cap; j += step) {
    const depth = dir * (level - x[j]);
    if (!(depth > 0 && depth <= 2 * q)) break;
    n++;
  }
  return n;
}

/** Rule 3 on one side of a run: `from` is the first sample outside it, walking by `step`. */
function cutsRamp(x: Float64Array, from: number, step: number, level: number, q: number, dir: number): boolean {
  const shallow = samplesToDepth(x, from, step, level, 2 * q, dir);
  const deep = samplesToDepth(x, from, step, level, 16 * q, dir);
  return shallow > 0 && deep >= RAMP_RATIO * shallow;
}

/** Samples walked from `from` until the signal lies `depth` below the level; −1 if it never does. */
function samplesToDepth(x: Float64Array, from: number, step: number, level: number, depth: number, dir: number): number {
  for (let k = 1, j = from; k <= MAX_WALK && j >= 0 && j < x.length; k++, j += step) {
    const d = dir * (level - x[j]);
    if (d !== d) return -1;
    if (d >= depth) return k;
  }
  return -1;
}
