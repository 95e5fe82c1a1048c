import type { Cause } from '../types/index.js';
import type { UnitFacts } from './unitFacts.js';

/** A likely-cause rule: reads the unit's facts, returns a cause with its evidence, or null when silent. */
export type CauseRule = (facts: UnitFacts) => Cause | null;

/** Score from how far a deviation goes past its threshold, 0.5 at the threshold up to 1 at `full`. */
export function scoreFrom(deviation: number, threshold: number, full: number): number {
  const x = (Math.abs(deviation) - threshold) / Math.max(full - threshold, 1e-12);
  return Math.round((0.5 + 0.5 * Math.min(1, Math.max(0, x))) * 100) / 100;
}
