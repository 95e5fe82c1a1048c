/**
 * plotDecimate against its definition: each column holds the smallest and largest sample of its run
 * of consecutive samples (min/max decimation for plotting; common practice, no source), computed
 * here independently by a plain scan of each column's slice.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { plotDecimate, plotDecimateSeries } from '../../src/analysis/index.js';
import { createRandom } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { expectAllWithin } from '../helpers/expectAllWithin.js';

function noisy(n: number, seed: number): Float64Array {
  const rnd = createRandom(seed);
  return Float64Array.from({ length: n }, (_, i) => Math.sin(i / 37) + 0.1 * (rnd.uniform() - 0.5));
}

function expectDefinition(samples: Float64Array, cols: ReturnType<typeof plotDecimate>): void {
  for (let c = 0; c < cols.t.length; c++) {
    const slice = Array.from(samples.subarray(cols.first + c * cols.step, Math.min(cols.end, cols.first + (c + 1) * cols.step)));
    expect(cols.min[c]).toBe(Math.min(...slice));
    expect(cols.max[c]).toBe(Math.max(...slice));
  }
}

describe('plotDecimate', () => {
  it('plotDecimate keeps the min and max of each column of a long record', () => {
    const s = noisy(100_000, 7);
    const cols = plotDecimate(s, 0, 1e-6, 0, 0.1, 800);
    expect(cols.t.length).toBeLessThanOrEqual(800);
    expect(cols.end - cols.first).toBe(100_000);
    expectDefinition(s, cols);
    expect(Math.max(...cols.max)).toBe(Math.max(...s));
    expect(Math.min(...cols.min)).toBe(Math.min(...s));
  });

  it('plotDecimate covers only the samples inside the window and times each column by its first sample', () => {
    const s = noisy(10_000, 3);
    const cols = plotDecimate(s, 0.5, 1e-3, 2.5, 3.5, 50);
    expect(cols.first).toBe(2000);
    expect(cols.end).toBe(3001);
    expectDefinition(s, cols);
    expectWithin(cols.t[1], 0.5 + (2000 + cols.step) * 1e-3, { rel: 1e-12 }, 't0 + index · dt');
  });

  it('plotDecimate returns each sample when the window holds fewer samples than columns', () => {
    const s = noisy(1000, 5);
    const cols = plotDecimate(s, 0, 1, 10, 19, 400);
    expect(cols.step).toBe(1);
    expect(Array.from(cols.min)).toEqual(Array.from(s.subarray(10, 20)));
    expect(Array.from(cols.max)).toEqual(Array.from(s.subarray(10, 20)));
  });

  it('plotDecimate skips invalid samples and leaves a column of only invalid samples empty', () => {
    const s = Float64Array.from([1, NaN, 3, NaN, NaN, NaN, 2, 5]);
    const cols = plotDecimate(s, 0, 1, 0, 7, 4);
    expect(cols.step).toBe(2);
    expect(Array.from(cols.min)).toEqual([1, 3, NaN, 2]);
    expect(Array.from(cols.max)).toEqual([1, 3, NaN, 5]);
  });

  it('plotDecimate leaves its input unchanged and throws on a caller bug', () => {
    const s = noisy(500, 9);
    const copy = Float64Array.from(s);
    plotDecimate(s, 0, 1, 0, 499, 10);
    expect(s).toEqual(copy);
    expect(() => plotDecimate(s, 0, 0, 0, 1, 10)).toThrow(RangeError);
    expect(() => plotDecimate(s, 0, 1, 5, 1, 10)).toThrow(RangeError);
    expect(() => plotDecimate(s, 0, 1, 0, 1, 0)).toThrow(RangeError);
  });

  it('plotDecimateSeries reduces an evenly spaced series by the same definition', () => {
    const levels = Array.from({ length: 2000 }, (_, k) => -100 + (k % 97));
    const cols = plotDecimateSeries(levels, 5, 0, 9995, 100);
    expectDefinition(Float64Array.from(levels), cols);
  });

  it('plotDecimate moves every column with a DC shift of the samples (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 3000 }), fc.integer({ min: 1, max: 300 }), fc.double({ min: -100, max: 100, noNaN: true }), (n, width, shift) => {
        const s = noisy(n, n);
        const a = plotDecimate(s, 0, 1, 0, n - 1, width);
        const b = plotDecimate(s.map((v) => v + shift), 0, 1, 0, n - 1, width);
        expect(b.t.length).toBe(a.t.length);
        expect(a.t.length).toBeLessThanOrEqual(width);
        expectAllWithin(b.max, Float64Array.from(a.max, (v) => v + shift), { abs: 1e-12 }, 'max(x + d) = max(x) + d');
      }),
      { numRuns: 50, seed: 19 },
    );
  });
});
