/**
 * Period from the least-squares fit of all like crossings (periodFit.ts), or from the IEEE Std 1057
 * four-parameter sine fit when the caller has one (sines). Withheld with fewer than two whole cycles:
 * one cycle gives no scatter to judge the timing by (common practice, no source).
 */
import type { MeasureResult } from '../../types/index.js';
import type { PeriodFit } from './periodFit.js';
import type { SineFit } from '../fits/sineFit.js';
import { measured, withheld } from '../measureResult.js';

export const MIN_CYCLES = 2;

export interface TimingInput {
  readonly fit: PeriodFit | null;
  readonly sine: SineFit | null;
  /** Samples in the record measured, to say how many cycles it holds. */
  readonly length: number;
  readonly dt: number;
}

export function period(input: TimingInput): MeasureResult {
  const { fit, sine, dt } = input;
  const short = tooFewCycles(input);
  if (short) return short;
  if (sine) return measured(1 / sine.frequency, sine.uFrequency / sine.frequency ** 2, 's', sineMethod(sine));
  const f = fit as PeriodFit;
  return measured(f.period * dt, f.uncertainty * dt, 's', crossingMethod(f));
}

/** The withheld result when the record holds fewer than MIN_CYCLES whole cycles, else null. */
export function tooFewCycles({ fit, length }: TimingInput): MeasureResult | null {
  if (fit && fit.cycles >= MIN_CYCLES) return null;
  if (!fit) {
    return withheld('too-few-cycles', 'the capture holds less than one whole cycle; lengthen the timebase to hold at least 2 cycles');
  }
  const held = length / fit.period;
  if (held < MIN_CYCLES) {
    return withheld('too-few-cycles', `the capture holds ${held.toFixed(1)} cycles; lengthen the timebase to at least ${MIN_CYCLES}`);
  }
  // Enough cycles in all, but the record's ends cut them so only one period lies between like crossings.
  return withheld('too-few-cycles', `the capture holds ${held.toFixed(1)} cycles, but only 1 whole period lies between like crossings; lengthen the timebase to at least ${MIN_CYCLES + 1} cycles`);
}

export function crossingMethod(f: PeriodFit): string {
  const parts = [f.risingCount > 0 ? `${f.risingCount} rising` : '', f.fallingCount > 0 ? `${f.fallingCount} falling` : ''];
  return `least-squares fit of ${parts.filter(Boolean).join(' and ')} mid-reference crossings against cycle number`;
}

export function sineMethod(s: SineFit): string {
  return `IEEE 1057 four-parameter sine fit (${s.iterations} iterations), started from the crossing fit`;
}
