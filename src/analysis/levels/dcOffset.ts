/**
 * DC offset: the mean over whole cycles (see cycleMoments.ts for the window).
 * Standard uncertainty (JCGM 100:2008): Type A from the scatter of the per-cycle means, s/√n
 * (GUM §4.2.3), or from the noise σ/√N when only one cycle is available; combined with a Type B term
 * for the one-sample window resolution, half the swing over N samples, rectangular (GUM §4.3.7).
 */
import type { MeasureResult } from '../../types/index.js';
import type { CycleMoments } from './cycleMoments.js';
import { measured } from '../measureResult.js';
import { rss, uncertaintyOfMean } from '../stats.js';

export interface MomentOptions {
  /** Noise standard deviation of the samples (noiseLevel). */
  readonly noise: number;
  /** Peak-to-peak swing, for the window-resolution term. */
  readonly span: number;
  readonly unit: string;
}

export function dcOffset(m: CycleMoments, options: MomentOptions): MeasureResult {
  const { noise, span, unit } = options;
  const typeA = m.cycles >= 2 ? uncertaintyOfMean(m.means) : noise / Math.sqrt(m.count);
  const window = span / 2 / m.count / Math.sqrt(3);
  return measured(m.mean, rss(typeA, window), unit, `mean over ${cyclesText(m)}`);
}

export function cyclesText(m: CycleMoments): string {
  return `${m.cycles} whole cycle${m.cycles === 1 ? '' : 's'} (${m.count} samples)`;
}
