/**
 * State levels of a two-state waveform by the histogram-mode method of IEEE Std 181-2011 §5.2:
 * a histogram of the samples between minimum and maximum, split at its midpoint; each state level is
 * the mode of its half. Bin count 100 by default (the default of general-purpose implementations such
 * as MathWorks `statelevels`; the standard leaves it to the user, see Solomon, Larson & Paulter,
 * IMTC 2001). Ties go to the bin farthest from the midpoint.
 *
 * Refinement (ours, documented): the mode is only known to a bin, about 1 % of the range, too coarse
 * for a 0.5 % level check. Each mode is refined by a mean shift: the mean of the samples within ±2 bins
 * of the estimate, repeated until it settles. For a symmetric noise distribution about a flat state
 * this converges to the state itself. Sums are kept in a fine 4096-bin histogram so long records are
 * read only once.
 *
 * Standard uncertainty (JCGM 100:2008): s/√n of the samples in the final window (Type A) combined with
 * the refinement shift |mode − refined| taken as the half-width of a rectangular distribution (Type B,
 * GUM §4.3.7), which states how much the bin choice alone can move the level.
 */
import { standardDeviationFromSums } from '../stats.js';

export interface StateLevelsOptions {
  readonly bins?: number;
}

export interface StateLevels {
  readonly high: number;
  readonly low: number;
  readonly uHigh: number;
  readonly uLow: number;
  /** Samples within the final window of each level. */
  readonly highCount: number;
  readonly lowCount: number;
}

const FINE = 4096;
const WINDOW_BINS = 2;

interface Histograms {
  readonly min: number;
  readonly width: number;
  readonly coarse: Float64Array;
  readonly count: Float64Array;
  readonly sum: Float64Array;
  readonly sumSq: Float64Array;
}

/** Null for a flat record (no range to split). */
export function stateLevels(samples: Float64Array, options: StateLevelsOptions = {}): StateLevels | null {
  const { bins = 100 } = options;
  if (!Number.isInteger(bins) || bins < 4) throw new RangeError(`stateLevels: bins ${bins} must be an integer ≥ 4`);
  const h = histograms(samples, bins);
  if (!h) return null;
  const half = bins >> 1;
  const low = refine(h, modeCenter(h, 0, half, -1), bins);
  const high = refine(h, modeCenter(h, half, bins, 1), bins);
  return { high: high.level, low: low.level, uHigh: high.u, uLow: low.u, highCount: high.n, lowCount: low.n };
}

function histograms(x: Float64Array, bins: number): Histograms | null {
  let min = Infinity;
  let max = -Infinity;
  for (let i = 0; i < x.length; i++) {
    if (x[i] < min) min = x[i];
    if (x[i] > max) max = x[i];
  }
  if (!(max > min)) return null;
  const coarse = new Float64Array(bins);
  const count = new Float64Array(FINE);
  const sum = new Float64Array(FINE);
  const sumSq = new Float64Array(FINE);
  const range = max - min;
  for (let i = 0; i < x.length; i++) {
    const u = (x[i] - min) / range;
    coarse[Math.min(bins - 1, Math.floor(u * bins))]++;
    const f = Math.min(FINE - 1, Math.floor(u * FINE));
    count[f]++;
    sum[f] += x[i];
    sumSq[f] += x[i] * x[i];
  }
  return { min, width: range / bins, coarse, count, sum, sumSq };
}

/** Centre of the most populated coarse bin in [from, to); ties go toward the outside (sign −1: low end). */
function modeCenter(h: Histograms, from: number, to: number, sign: -1 | 1): number {
  let best = sign < 0 ? to - 1 : from;
  for (let b = from; b < to; b++) {
    const c = h.coarse[b];
    if (c > h.coarse[best] || (c === h.coarse[best] && sign * (b - best) > 0)) best = b;
  }
  return h.min + (best + 0.5) * h.width;
}

function refine(h: Histograms, start: number, bins: number): { level: number; u: number; n: number } {
  const fineWidth = (h.width * bins) / FINE;
  let level = start;
  let stats = windowStats(h, level, fineWidth);
  for (let it = 0; it < 50 && stats.n > 0; it++) {
    const next = stats.sum / stats.n;
    const moved = Math.abs(next - level);
    level = next;
    stats = windowStats(h, level, fineWidth);
    if (moved < fineWidth * 1e-3) break;
  }
  const n = stats.n;
  const typeA = n > 0 ? standardDeviationFromSums(n, stats.sum, stats.sumSq) / Math.sqrt(n) : h.width;
  const typeB = Math.abs(level - start) / Math.sqrt(3);
  return { level, u: Math.hypot(typeA, typeB), n };
}

function windowStats(h: Histograms, center: number, fineWidth: number): { n: number; sum: number; sumSq: number } {
  const lo = Math.max(0, Math.floor((center - WINDOW_BINS * h.width - h.min) / fineWidth));
  const hi = Math.min(FINE - 1, Math.floor((center + WINDOW_BINS * h.width - h.min) / fineWidth));
  let n = 0;
  let sum = 0;
  let sumSq = 0;
  for (let f = lo; f <= hi; f++) {
    n += h.count[f];
    sum += h.sum[f];
    sumSq += h.sumSq[f];
  }
  return { n, sum, sumSq };
}
