/**
 * Slope ratio |rise| / |fall| of a triangle (1 for matched charge and discharge currents; an
 * asymmetric triangle with rise share r has (1 − r)/r, REFERENCES.md §4 "Slopes").
 * Standard uncertainty by first-order propagation of the two independent slope uncertainties
 * (JCGM 100:2008 §5.1.6, relative uncertainties add in quadrature for a quotient).
 */
import type { MeasureResult } from '../../types/index.js';
import { measured, withheld } from '../measureResult.js';

export function slopeRatio(rise: MeasureResult, fall: MeasureResult): MeasureResult {
  if (!rise.ok) return rise;
  if (!fall.ok) return fall;
  if (!(fall.value > 0)) return withheld('fit-failed', 'the falling ramp has no measurable slope');
  const value = rise.value / fall.value;
  const rel = Math.hypot((rise.uncertainty ?? 0) / rise.value, (fall.uncertainty ?? 0) / fall.value);
  const u = rise.uncertainty === null || fall.uncertainty === null ? null : value * rel;
  return measured(value, u, '', 'ratio of the median rising to the median falling 20–80 % slope');
}
