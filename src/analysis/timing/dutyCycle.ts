/**
 * Duty cycle at the 50 % (mesial) reference level: pulse duration over period, per cycle, in %
 * (IEEE Std 181-2011 pulse duration and duty factor; REFERENCES.md §2). The mean over whole cycles is
 * reported. Standard uncertainty (JCGM 100:2008): s/√n over cycles (Type A), combined with the
 * sampling resolution of the two mesial instants when the edges fall between samples: δ/(√6·T), with
 * δ the mean straddle step as a fraction of the amplitude (as in periodFit.ts). It is not divided by
 * √n because for a period that is a near-multiple of the sample interval the error repeats every cycle.
 */
import type { MeasureResult } from '../../types/index.js';
import type { Transition } from './transitions.js';
import { measured, withheld } from '../measureResult.js';
import { mean, rss, uncertaintyOfMean } from '../stats.js';

export function dutyCycle(ts: readonly Transition[], amplitude: number): MeasureResult {
  const duties: number[] = [];
  const steps: number[] = [];
  for (let k = 0; k + 2 < ts.length; k++) {
    const [a, b, c] = [ts[k], ts[k + 1], ts[k + 2]];
    if (a.direction !== 1 || b.direction !== -1 || c.direction !== 1) continue;
    const period = c.mesial - a.mesial;
    duties.push((100 * (b.mesial - a.mesial)) / period);
    steps.push(Math.min(1, a.step / amplitude), Math.min(1, b.step / amplitude));
  }
  if (duties.length === 0) {
    return withheld('too-few-cycles', 'no whole cycle (rising, falling and rising edge) in the capture; lengthen the timebase');
  }
  const period = (ts[ts.length - 1].mesial - ts[0].mesial) / ((ts.length - 1) / 2);
  const resolution = (100 * mean(steps)) / (Math.sqrt(6) * period);
  const n = duties.length;
  return measured(mean(duties), rss(uncertaintyOfMean(duties), resolution), '%', `mean over ${n} cycle${n === 1 ? '' : 's'} at the 50 % reference level`);
}
