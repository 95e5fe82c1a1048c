/**
 * Every numeric assertion states its tolerance with its kind (absolute or relative) and where the
 * expected value comes from, so a failure says what was compared against what.
 */
import { expect } from 'vitest';

export type Tolerance = { readonly abs: number } | { readonly rel: number };

export function expectWithin(actual: number | null | undefined, expected: number, tol: Tolerance, source: string): void {
  const label = `expected ${expected} (${source}) within ${'abs' in tol ? `±${tol.abs} absolute` : `±${tol.rel * 100}% relative`}`;
  expect(actual, `${label}; got ${actual}`).toBeTypeOf('number');
  const a = actual as number;
  expect(Number.isFinite(a), `${label}; got ${a}`).toBe(true);
  const limit = 'abs' in tol ? tol.abs : Math.abs(expected) * tol.rel;
  const err = Math.abs(a - expected);
  expect(err <= limit, `${label}; got ${a} (off by ${err})`).toBe(true);
}
