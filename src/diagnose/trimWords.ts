/** The words of trim guidance: one sentence per adjustment, the action and amount first. */
import type { TrimAdjustment, TrimAdvice } from '../types/index.js';

/** "+1.3" / "−15.6": a signed number with a true minus sign. */
export function signed(x: number, digits: number): string {
  const t = Math.abs(x).toFixed(digits);
  return Number(t) === 0 ? t : `${x < 0 ? '−' : '+'}${t}`;
}

const NAMES: Readonly<Record<TrimAdjustment, string>> = { scale: 'scale', offset: 'offset', 'high-frequency': 'high-frequency compensation' };

/** Change the scale by `percent` (positive = raise). */
export function scaleAdvice(percent: number, why: string): TrimAdvice {
  const action = percent > 0 ? 'raise' : 'lower';
  const amount = Math.abs(percent);
  return { adjustment: 'scale', action, amount, unit: '%', text: `scale: ${action} by ${amount.toFixed(amount < 0.1 ? 2 : 1)} % (${why})` };
}

/** Move every step by `change` (positive = raise) in cents or Hz. */
export function offsetAdvice(change: number, unit: 'cents' | 'Hz', where: string): TrimAdvice {
  const action = change > 0 ? 'raise' : 'lower';
  const amount = Math.abs(change);
  const inFrequency = unit === 'cents' ? `, ${signed(100 * (2 ** (change / 1200) - 1), 2)} % in frequency` : '';
  return { adjustment: 'offset', action, amount, unit, text: `offset: ${action} by ${amount.toFixed(1)} ${unit} (${where}${inFrequency})` };
}

export function leave(adjustment: TrimAdjustment, why: string): TrimAdvice {
  return { adjustment, action: 'leave', amount: null, unit: adjustment === 'scale' ? '%' : 'cents', text: `${NAMES[adjustment]}: leave as is (${why})` };
}
