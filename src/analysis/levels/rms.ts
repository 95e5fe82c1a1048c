/**
 * RMS over whole cycles, √(mean of x²), DC included (see cycleMoments.ts for the window).
 * Standard uncertainty as for dcOffset: per-cycle rms scatter s/√n (or noise/√N for one cycle),
 * combined with the one-sample window resolution (JCGM 100:2008 §4.2.3, §4.3.7).
 */
import type { MeasureResult } from '../../types/index.js';
import type { CycleMoments } from './cycleMoments.js';
import type { MomentOptions } from './dcOffset.js';
import { cyclesText } from './dcOffset.js';
import { measured } from '../measureResult.js';
import { rss, uncertaintyOfMean } from '../stats.js';

export function rms(m: CycleMoments, options: MomentOptions): MeasureResult {
  const { noise, span, unit } = options;
  const value = Math.sqrt(m.meanSquare);
  const perCycle = Array.from(m.meanSquares, Math.sqrt);
  const typeA = m.cycles >= 2 ? uncertaintyOfMean(perCycle) : noise / Math.sqrt(m.count);
  const window = span / 2 / m.count / Math.sqrt(3);
  return measured(value, rss(typeA, window), unit, `root mean square over ${cyclesText(m)}`);
}
