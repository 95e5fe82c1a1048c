/**
 * Ramp linearity: the worst deviation of the ramps from their fitted straight lines, in % of the
 * amplitude (common practice for ramp generators, no source). Residuals are averaged per position
 * along the ramp over all ramps of a direction (rampFits.ts), so the figure shows a systematic bow,
 * such as the exponential charge of a resistor-fed integrator, rather than noise.
 * Standard uncertainty: the noise standard deviation over √(samples in the sparsest bin), as a % of
 * the amplitude (JCGM 100:2008 §4.2.3).
 */
import type { MeasureResult } from '../../types/index.js';
import type { RampProfile } from './rampFits.js';
import { measured, withheld } from '../measureResult.js';

export function linearity(profiles: readonly RampProfile[], amplitude: number, noise: number): MeasureResult {
  let worst = 0;
  let fewest = Infinity;
  let used = 0;
  for (const p of profiles) {
    if (p.count.every((n) => n === 0)) continue;
    used++;
    for (let b = 0; b < p.sum.length; b++) {
      if (p.count[b] === 0) continue;
      worst = Math.max(worst, Math.abs(p.sum[b] / p.count[b]));
      fewest = Math.min(fewest, p.count[b]);
    }
  }
  if (used === 0) return withheld('too-few-cycles', 'no complete ramp in the capture; lengthen the timebase to hold at least one whole cycle');
  if (!(amplitude > 0)) return withheld('no-signal', 'the ramp has no amplitude to compare deviations with');
  const u = (100 * noise) / Math.sqrt(fewest) / amplitude;
  return measured((100 * worst) / amplitude, u, '%', 'worst mean deviation from the 20–80 % fitted line, 16 positions along the ramp, % of amplitude');
}
