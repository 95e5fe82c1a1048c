/** Trim suggestions as data: the adjustment, the action and amount, and what it reads; report words them. */
import type { TrimAdjustment, TrimAdvice, TrimBasis } from '../types/index.js';

/** Change the scale by `percent` (positive = raise). */
export function scaleAdvice(percent: number, basis: TrimBasis): TrimAdvice {
  return { adjustment: 'scale', action: percent > 0 ? 'raise' : 'lower', amount: Math.abs(percent), unit: '%', text: '', basis };
}

/** Move every step by `change` (positive = raise) in cents or Hz. */
export function offsetAdvice(change: number, unit: 'cents' | 'Hz', basis: TrimBasis): TrimAdvice {
  return { adjustment: 'offset', action: change > 0 ? 'raise' : 'lower', amount: Math.abs(change), unit, text: '', basis };
}

export function leave(adjustment: TrimAdjustment, basis: TrimBasis): TrimAdvice {
  return { adjustment, action: 'leave', amount: null, unit: adjustment === 'scale' ? '%' : 'cents', text: '', basis };
}
