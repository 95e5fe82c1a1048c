/**
 * expectAllWithin is the one assertion behind several per-bin comparisons (spectrum, solver, plot
 * decimation): it must fail on any single element outside its tolerance, name that element, and
 * pass a series that is inside everywhere. Project rule (no source).
 */
import { describe, expect, it } from 'vitest';
import { expectAllWithin } from './expectAllWithin.js';

const ramp = Float64Array.from({ length: 1000 }, (_, i) => i);

describe('expectAllWithin', () => {
  it('expectAllWithin fails on one element outside an absolute tolerance and names it', () => {
    const a = ramp.slice();
    a[617] += 0.01;
    expect(() => expectAllWithin(a, ramp, { abs: 1e-3 }, 'probe')).toThrow(/element 617 of 1000/);
  });

  it('expectAllWithin fails on a NaN or an infinity anywhere', () => {
    for (const bad of [Number.NaN, Infinity]) {
      const a = ramp.slice();
      a[3] = bad;
      expect(() => expectAllWithin(a, ramp, { abs: 1 }, 'probe')).toThrow(/element 3 /);
    }
  });

  it('expectAllWithin judges a relative tolerance element by element, so a zero expected value allows no error', () => {
    const a = ramp.slice();
    a[500] *= 1 + 5e-7;
    expectAllWithin(a, ramp, { rel: 1e-6 }, 'probe');
    a[0] = 1e-30;
    expect(() => expectAllWithin(a, ramp, { rel: 1e-6 }, 'probe')).toThrow(/element 0 /);
  });

  it('expectAllWithin refuses series of different lengths', () => {
    expect(() => expectAllWithin(ramp.subarray(1), ramp, { abs: 1 }, 'probe')).toThrow(/lengths/);
  });
});
