/**
 * Slope of the rising or the falling ramps: the median over ramps of the magnitude of each ramp's
 * 20–80 % least-squares slope (rampFits.ts), in units per second.
 * Standard uncertainty (JCGM 100:2008): the larger of √(π/2)·s/√n from the scatter between ramps and
 * the regression standard error of one ramp divided by √n (which stands in when there are too few ramps
 * for a scatter). A median of magnitudes is used so that one ramp cut by a glitch cannot move it.
 */
import type { MeasureResult } from '../../types/index.js';
import type { RampFit } from './rampFits.js';
import { measured, withheld } from '../measureResult.js';
import { median, uncertaintyOfMedian } from '../stats.js';

export function rampSlope(fits: readonly RampFit[], dt: number, unit: string, direction: 'rising' | 'falling'): MeasureResult {
  if (fits.length === 0) {
    return withheld('too-few-cycles', `no complete ${direction} ramp in the capture; lengthen the timebase to hold at least one whole cycle`);
  }
  const slopes = fits.map((f) => Math.abs(f.slope) / dt);
  const regression = median(fits.map((f) => f.slopeError / dt)) / Math.sqrt(fits.length);
  const u = Math.max(uncertaintyOfMedian(slopes), regression);
  const n = fits.length;
  return measured(median(slopes), u, unit, `median of ${n} least-squares line${n === 1 ? '' : 's'} over the 20–80 % part of each ${direction} ramp`);
}
