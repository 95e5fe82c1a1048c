import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { decideCheck, worstStatement } from '../../src/design/index.js';
import type { Statement } from '../../src/types/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

// Worked example: REFERENCES.md test case 15 (ILAC-G8:09/2019 §4.2.1–4.2.3, JCGM 106:2012):
// upper tolerance limit 1.000 V, expanded uncertainty U = 0.020 V (k = 2), guard band w = U.
const upper = { lower: null, upper: 1.0 };
const U = 0.02;

describe('decideCheck with guarded acceptance (ILAC-G8 §4.2.3, non-binary)', () => {
  it('gives pass, conditional pass, conditional fail and fail for the worked example', () => {
    expect(decideCheck(0.975, U, upper, 'guarded').statement).toBe('pass');
    expect(decideCheck(0.99, U, upper, 'guarded').statement).toBe('conditional-pass');
    expect(decideCheck(1.01, U, upper, 'guarded').statement).toBe('conditional-fail');
    expect(decideCheck(1.025, U, upper, 'guarded').statement).toBe('fail');
  });

  it('follows the table intervals at and around each boundary: [TL − w, TL] conditional pass, (TL, TL + w] conditional fail', () => {
    const cases: [number, Statement][] = [
      [0.9799, 'pass'],
      [0.98, 'conditional-pass'], // TL − w, closed on the left in ILAC-G8's table
      [0.9801, 'conditional-pass'],
      [1.0, 'conditional-pass'], // at the limit: still within tolerance
      [1.0001, 'conditional-fail'],
      [1.02, 'conditional-fail'], // TL + w
      [1.0201, 'fail'],
    ];
    for (const [v, s] of cases) expect(decideCheck(v, U, upper, 'guarded').statement, `${v} V`).toBe(s);
  });

  it('reports the guard band and the signed margin to the limit, positive inside', () => {
    const d = decideCheck(0.975, U, upper, 'guarded');
    expectWithin(d.guard, 0.02, { abs: 0 }, 'w = U (ILAC-G8 §4.1)');
    expectWithin(d.margin, 0.025, { abs: 1e-15 }, 'TL − x, closed form (REFERENCES test case 15)');
    expectWithin(decideCheck(1.025, U, upper, 'guarded').margin, -0.025, { abs: 1e-15 }, 'TL − x, closed form');
  });

  it('decides a lower limit as the mirror image of an upper one', () => {
    const lower = { lower: 1.0, upper: null };
    expect(decideCheck(1.025, U, lower, 'guarded').statement).toBe('pass');
    expect(decideCheck(1.01, U, lower, 'guarded').statement).toBe('conditional-pass');
    expect(decideCheck(0.99, U, lower, 'guarded').statement).toBe('conditional-fail');
    expect(decideCheck(0.975, U, lower, 'guarded').statement).toBe('fail');
  });

  it('decides two-sided limits on the nearer side, symmetric about the nominal', () => {
    const band = { lower: 257.71, upper: 265.55 };
    expect(decideCheck(261.63, 0.5, band, 'guarded').statement).toBe('pass');
    expect(decideCheck(265.3, 0.5, band, 'guarded').statement).toBe('conditional-pass');
    expect(decideCheck(257.9, 0.5, band, 'guarded').statement).toBe('conditional-pass');
    expect(decideCheck(257.5, 0.5, band, 'guarded').statement).toBe('conditional-fail');
    expect(decideCheck(256.0, 0.5, band, 'guarded').statement).toBe('fail');
    expectWithin(decideCheck(257.9, 0.5, band, 'guarded').margin, 0.19, { abs: 1e-9 }, 'x − TL_lower, closed form');
  });

  it('never passes when the guard band covers the whole tolerance interval', () => {
    const narrow = { lower: 0.99, upper: 1.01 };
    expect(decideCheck(1.0, 0.02, narrow, 'guarded').statement).toBe('conditional-pass');
  });

  it('never gets better as the value moves further outside the limit (property)', () => {
    const rank: Statement[] = ['pass', 'conditional-pass', 'conditional-fail', 'fail'];
    fc.assert(
      fc.property(fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: 0, max: 2, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), (x, step, u) => {
        const a = rank.indexOf(decideCheck(x, u, upper, 'guarded').statement);
        const b = rank.indexOf(decideCheck(x + step, u, upper, 'guarded').statement);
        expect(b).toBeGreaterThanOrEqual(a);
      }),
    );
  });
});

describe('decideCheck with binary rules (ILAC-G8 §4.2.1 and §4.2.2)', () => {
  it('fails 0.990 V with a guard band (acceptance limit 0.980 V) and passes it with simple acceptance', () => {
    expect(decideCheck(0.99, U, upper, 'guarded-binary').statement).toBe('fail');
    expect(decideCheck(0.975, U, upper, 'guarded-binary').statement).toBe('pass');
    expect(decideCheck(0.99, U, upper, 'simple').statement).toBe('pass');
    expect(decideCheck(1.01, U, upper, 'simple').statement).toBe('fail');
  });

  it('uses no guard band with simple acceptance and includes the limits themselves', () => {
    expect(decideCheck(1.0, U, upper, 'simple')).toEqual({ statement: 'pass', guard: 0, margin: 0 });
    expect(decideCheck(0.98, U, upper, 'guarded-binary').statement).toBe('pass');
  });

  it('gives only pass or fail (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -5, max: 5, noNaN: true }), fc.double({ min: 0, max: 1, noNaN: true }), fc.constantFrom('simple' as const, 'guarded-binary' as const), (x, u, rule) => {
        expect(['pass', 'fail']).toContain(decideCheck(x, u, { lower: -1, upper: 1 }, rule).statement);
      }),
    );
  });
});

describe('decideCheck refuses caller bugs', () => {
  it('throws RangeError for a non-finite value, a negative U or a limit with no side', () => {
    expect(() => decideCheck(Number.NaN, U, upper, 'guarded')).toThrow(RangeError);
    expect(() => decideCheck(1, -0.1, upper, 'guarded')).toThrow(RangeError);
    expect(() => decideCheck(1, U, { lower: null, upper: null }, 'guarded')).toThrow(RangeError);
  });
});

describe('worstStatement', () => {
  it('ranks fail over conditional fail over not measured over conditional pass over pass', () => {
    expect(worstStatement(['pass', 'conditional-pass'])).toBe('conditional-pass');
    expect(worstStatement(['conditional-pass', 'not-measured'])).toBe('not-measured');
    expect(worstStatement(['not-measured', 'conditional-fail'])).toBe('conditional-fail');
    expect(worstStatement(['conditional-fail', 'fail', 'pass'])).toBe('fail');
    expect(worstStatement([])).toBe('pass');
  });
});
