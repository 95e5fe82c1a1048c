/**
 * Level measurements of one channel: raw maximum, minimum and peak-to-peak; state levels and amplitude
 * (histogram mode of IEEE Std 181-2011 for two-state shapes, median per-cycle peaks otherwise); DC
 * offset, rms and ac rms over whole cycles. The methods and their sources are in the files named.
 * Raw extremes are single samples, so their standard uncertainty is the noise σ (JCGM 100:2008
 * §4.3, Type B), √2·σ for their difference.
 */
import type { MeasureResult, MeasurementId, Shape } from '../../types/index.js';
import { acRms } from './acRms.js';
import { cycleMoments } from './cycleMoments.js';
import { dcOffset } from './dcOffset.js';
import { measured, withheld } from '../measureResult.js';
import { peakLevels } from './peakLevels.js';
import type { Range } from './quantiles.js';
import { rms } from './rms.js';
import { stateLevels } from './stateLevels.js';
import { unitFor } from '../measurementUnits.js';

export type Results = Partial<Record<MeasurementId, MeasureResult>>;

export interface Levels {
  readonly high: number;
  readonly low: number;
  readonly uHigh: number;
  readonly uLow: number;
  readonly method: string;
}

export function isTwoState(shape: Shape): boolean {
  return shape === 'square' || shape === 'pulse';
}

/** State levels for two-state shapes, peak levels (over the cycles between `starts`) otherwise. */
export function levelsOf(samples: Float64Array, shape: Shape, starts: readonly number[], noise: number): Levels | null {
  if (isTwoState(shape)) {
    const s = stateLevels(samples);
    return s && { high: s.high, low: s.low, uHigh: s.uHigh, uLow: s.uLow, method: 'IEEE 181 histogram mode (100 bins), refined by mean shift' };
  }
  const p = peakLevels(samples, starts, noise);
  return p && { high: p.high, low: p.low, uHigh: p.uHigh, uLow: p.uLow, method: `median of the per-cycle extremes over ${p.cycles} whole cycle${p.cycles === 1 ? '' : 's'}` };
}

export function levelResults(range: Range, levels: Levels | null, noise: number, unit: string): Results {
  const u = (id: MeasurementId): string => unitFor(id, unit);
  const none = withheld('too-few-cycles', 'the capture holds less than one whole cycle; lengthen the timebase to hold at least 2 cycles');
  return {
    maximum: measured(range.max, noise, u('maximum'), 'largest sample'),
    minimum: measured(range.min, noise, u('minimum'), 'smallest sample'),
    peakToPeak: measured(range.max - range.min, Math.SQRT2 * noise, u('peakToPeak'), 'largest minus smallest sample'),
    highLevel: levels ? measured(levels.high, levels.uHigh, u('highLevel'), levels.method) : none,
    lowLevel: levels ? measured(levels.low, levels.uLow, u('lowLevel'), levels.method) : none,
    amplitude: levels ? measured(levels.high - levels.low, Math.hypot(levels.uHigh, levels.uLow), u('amplitude'), `high level minus low level (${levels.method})`) : none,
  };
}

/** DC offset, rms and ac rms over the whole cycles between `starts`. */
export function momentResults(samples: Float64Array, starts: readonly number[], noise: number, span: number, unit: string): Results {
  const m = cycleMoments(samples, starts);
  if (!m) {
    const w = withheld('too-few-cycles', 'the capture holds less than one whole cycle, and a partial cycle would bias it; lengthen the timebase to hold at least 2 cycles');
    return { dcOffset: w, rms: w, acRms: w };
  }
  const options = { noise, span, unit: unitFor('rms', unit) };
  return { dcOffset: dcOffset(m, options), rms: rms(m, options), acRms: acRms(m, options) };
}
