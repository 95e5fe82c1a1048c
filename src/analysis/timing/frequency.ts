/**
 * Frequency = 1/period (period.ts: least-squares fit of all like crossings, or the IEEE Std 1057
 * four-parameter sine fit for sines). Standard uncertainty by first-order propagation,
 * u(f) = u(T)/T² (JCGM 100:2008 §5.1.3).
 */
import type { MeasureResult } from '../../types/index.js';
import type { PeriodFit } from './periodFit.js';
import type { TimingInput } from './period.js';
import { crossingMethod, sineMethod, tooFewCycles } from './period.js';
import { measured } from '../measureResult.js';

export function frequency(input: TimingInput): MeasureResult {
  const short = tooFewCycles(input);
  if (short) return short;
  const { sine, dt } = input;
  if (sine) return measured(sine.frequency, sine.uFrequency, 'Hz', sineMethod(sine));
  const f = input.fit as PeriodFit;
  const T = f.period * dt;
  return measured(1 / T, (f.uncertainty * dt) / (T * T), 'Hz', crossingMethod(f));
}
