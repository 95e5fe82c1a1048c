/**
 * Symmetry: the rising share of the period in %, taken from the fitted slopes. A straight-ramp
 * triangle spends swing/|rise| rising and swing/|fall| falling, so the rising share is
 * |fall| / (|rise| + |fall|) = 1 / (1 + ratio) (elementary; REFERENCES.md §4 "Slopes").
 * Using the slopes, not the instants of the peaks, keeps noise at the rounded corners out of it.
 * Standard uncertainty by first-order propagation from the slope ratio (JCGM 100:2008 §5.1.2):
 * |d/dρ 100/(1 + ρ)| = 100/(1 + ρ)².
 */
import type { MeasureResult } from '../../types/index.js';
import { measured } from '../measureResult.js';

export function symmetry(ratio: MeasureResult): MeasureResult {
  if (!ratio.ok) return ratio;
  const value = 100 / (1 + ratio.value);
  const u = ratio.uncertainty === null ? null : (100 / (1 + ratio.value) ** 2) * ratio.uncertainty;
  return measured(value, u, '%', 'rising share of the period from the fitted slopes, 100/(1 + slope ratio)');
}
