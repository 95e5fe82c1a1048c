/**
 * Transition duration (rise time, fall time): distal minus proximal instant, 10 % → 90 % of the
 * amplitude for a rising edge and 90 % → 10 % for a falling one (IEEE Std 181-2011 §5.3; REFERENCES.md
 * §2). A first-order RC edge gives τ·ln 9 (REFERENCES.md §5). The median over transitions is reported.
 *
 * Withheld when the median transition spans fewer than 5 sample intervals: linear interpolation of
 * the 10 % and 90 % instants then depends more on where the samples fell than on the edge (common
 * practice, no source). Standard uncertainty (JCGM 100:2008): √(π/2)·s/√n from the scatter over
 * transitions, combined with the interpolation resolution of the two instants, a tenth of a sample
 * each, rectangular (Type B; our estimate for edges of 5 samples or more).
 */
import type { MeasureResult } from '../../types/index.js';
import type { Transition } from './transitions.js';
import { measured, withheld } from '../measureResult.js';
import { median, rss, uncertaintyOfMedian } from '../stats.js';

export const MIN_EDGE_SAMPLES = 5;

export function transitionDuration(ts: readonly Transition[], direction: 1 | -1, dt: number): MeasureResult {
  const word = direction > 0 ? 'rising' : 'falling';
  const d = ts.filter((t) => t.direction === direction).map((t) => t.distal - t.proximal);
  if (d.length === 0) {
    return withheld('too-few-cycles', `no complete ${word} edge in the capture; lengthen the timebase to hold a whole cycle`);
  }
  const span = median(d);
  if (span < MIN_EDGE_SAMPLES) {
    return withheld(
      'edge-too-fast',
      `sample rate too low for this edge: its 10–90 % part spans ${span.toFixed(1)} samples, at least ${MIN_EDGE_SAMPLES} are needed; raise the sample rate or shorten the timebase`,
    );
  }
  const resolution = (0.1 / Math.sqrt(3)) * Math.SQRT2;
  const u = rss(uncertaintyOfMedian(d), resolution) * dt;
  return measured(span * dt, u, 's', `median 10–90 % duration of ${d.length} ${word} edge${d.length === 1 ? '' : 's'} (IEEE 181 reference levels from histogram state levels)`);
}
