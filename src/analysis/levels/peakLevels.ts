/**
 * Peak levels of a waveform without flat states (sine, triangle, sawtooth): the median over whole
 * cycles of each cycle's maximum and minimum. IEEE Std 181-2011 allows peak (magnitude-reference)
 * levels where the histogram has no state modes (from memory, REFERENCES.md §2); the median keeps
 * one glitch or one noisy cycle from moving them, unlike the raw record extremes.
 *
 * Standard uncertainty (JCGM 100:2008): √(π/2)·s/√n of the per-cycle extremes (Type A, median of n),
 * combined with the noise standard deviation as a Type B term, because the largest of the noisy samples
 * near a peak sits about one to three σ above the noise-free peak.
 */
import { median, rss, uncertaintyOfMedian } from '../stats.js';

export interface PeakLevels {
  readonly high: number;
  readonly low: number;
  readonly uHigh: number;
  readonly uLow: number;
  readonly cycles: number;
}

/** `starts`: fractional sample index of each cycle start; null with fewer than one whole cycle. */
export function peakLevels(samples: Float64Array, starts: readonly number[], noise: number): PeakLevels | null {
  const cycles = starts.length - 1;
  if (cycles < 1) return null;
  const maxima = new Float64Array(cycles);
  const minima = new Float64Array(cycles);
  for (let c = 0; c < cycles; c++) {
    let hi = -Infinity;
    let lo = Infinity;
    const to = Math.min(samples.length, Math.ceil(starts[c + 1]));
    for (let i = Math.ceil(starts[c]); i < to; i++) {
      if (samples[i] > hi) hi = samples[i];
      if (samples[i] < lo) lo = samples[i];
    }
    maxima[c] = hi;
    minima[c] = lo;
  }
  return {
    high: median(maxima),
    low: median(minima),
    uHigh: rss(uncertaintyOfMedian(maxima), noise),
    uLow: rss(uncertaintyOfMedian(minima), noise),
    cycles,
  };
}
