/**
 * expectWithin over a whole series at once: every element is compared with the same tolerance, and
 * the one furthest outside (or closest to) its limit is asserted, so one failing bin still fails the
 * test and names its index, without one `expect()` per element (which costs seconds on long series).
 */
import { expect } from 'vitest';
import { expectWithin, type Tolerance } from './expectWithin.js';

export function expectAllWithin(actual: ArrayLike<number>, expected: ArrayLike<number>, tol: Tolerance, source: string): void {
  expect(actual.length, `series lengths (${source})`).toBe(expected.length);
  let worst = -1;
  let worstRatio = -Infinity;
  for (let i = 0; i < actual.length; i++) {
    const a = actual[i];
    const e = expected[i];
    const limit = 'abs' in tol ? tol.abs : Math.abs(e) * tol.rel;
    const err = Math.abs(a - e);
    // NaN, ±∞ or an error over a zero limit rank above any finite ratio.
    const ratio = Number.isFinite(a) ? (limit > 0 ? err / limit : err > 0 ? Infinity : 0) : Infinity;
    if (ratio > worstRatio || Number.isNaN(ratio)) {
      worst = i;
      worstRatio = Number.isNaN(ratio) ? Infinity : ratio;
    }
  }
  if (worst < 0) return;
  expectWithin(actual[worst], expected[worst], tol, `${source}; element ${worst} of ${actual.length}, the worst`);
}
