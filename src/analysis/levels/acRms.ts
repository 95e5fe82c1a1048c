/**
 * AC rms over whole cycles: √(mean of x² − mean²), the rms with the DC offset removed (the standard
 * deviation of the waveform over whole cycles). Uncertainty as for rms (JCGM 100:2008 §4.2.3, §4.3.7).
 */
import type { MeasureResult } from '../../types/index.js';
import type { CycleMoments } from './cycleMoments.js';
import type { MomentOptions } from './dcOffset.js';
import { cyclesText } from './dcOffset.js';
import { measured } from '../measureResult.js';
import { rss, uncertaintyOfMean } from '../stats.js';

export function acRms(m: CycleMoments, options: MomentOptions): MeasureResult {
  const { noise, span, unit } = options;
  const value = Math.sqrt(Math.max(0, m.meanSquare - m.mean * m.mean));
  const perCycle = Array.from(m.meanSquares, (q, c) => Math.sqrt(Math.max(0, q - m.means[c] ** 2)));
  const typeA = m.cycles >= 2 ? uncertaintyOfMean(perCycle) : noise / Math.sqrt(m.count);
  const window = span / 2 / m.count / Math.sqrt(3);
  return measured(value, rss(typeA, window), unit, `rms about the mean over ${cyclesText(m)}`);
}
