import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { linearScale, niceTicks } from '../../src/report/svgPlot.js';
import { binCounts, sturgesBins } from '../../src/report/svgHistogram.js';
import { renderWaveformSvg } from '../../src/report/svgWaveform.js';
import { expectWithin } from '../helpers/expectWithin.js';

describe('svg plot helpers', () => {
  it('niceTicks gives steps of 1, 2 or 5 × 10^k inside the range (d3-array ticks; Heckbert 1990, from memory)', () => {
    expect(niceTicks(0, 10, 5)).toEqual([0, 2, 4, 6, 8, 10]);
    expect(niceTicks(-3, 3, 6)).toEqual([-3, -2, -1, 0, 1, 2, 3]);
    fc.assert(
      // Spans down to a millionth of the offset: finer than any plot axis, coarse enough for doubles.
      fc.property(fc.double({ min: -1e6, max: 1e6, noNaN: true }), fc.double({ min: 1e-6, max: 1e6, noNaN: true }), fc.integer({ min: 2, max: 10 }), (lo, rel, count) => {
        const span = rel * Math.max(1, Math.abs(lo));
        const t = niceTicks(lo, lo + span, count);
        expect(t.length).toBeGreaterThanOrEqual(1);
        const step = t.length > 1 ? t[1] - t[0] : span;
        const mantissa = step / 10 ** Math.floor(Math.log10(step));
        expect([1, 2, 5, 10].some((m) => Math.abs(mantissa - m) < 1e-6)).toBe(true);
        for (const v of t) {
          expect(v).toBeGreaterThanOrEqual(lo - step * 1e-6);
          expect(v).toBeLessThanOrEqual(lo + span + step * 1e-6);
        }
      }),
    );
  });

  it('linearScale maps the domain ends onto the range ends', () => {
    const s = linearScale(0, 10, 100, 300);
    expectWithin(s(0), 100, { abs: 1e-12 }, 'closed form');
    expectWithin(s(10), 300, { abs: 1e-12 }, 'closed form');
    expectWithin(s(2.5), 150, { abs: 1e-12 }, 'closed form');
  });

  it('sturgesBins gives ⌈log2 n⌉ + 1 bins (Sturges 1926)', () => {
    expect([1, 4, 10, 100].map(sturgesBins)).toEqual([1, 3, 5, 8]);
  });

  it('binCounts puts every value in exactly one bin, the top edge in the last (property)', () => {
    fc.assert(
      fc.property(fc.array(fc.double({ min: 0, max: 1, noNaN: true }), { minLength: 1, maxLength: 60 }), fc.integer({ min: 1, max: 12 }), (xs, k) => {
        const c = binCounts(xs, 0, 1, k);
        expect(c.reduce((a, b) => a + b, 0)).toBe(xs.length);
      }),
      { seed: 17 },
    );
    expect(binCounts([0, 0.5, 1], 0, 1, 2)).toEqual([1, 2]);
  });

  it('renderWaveformSvg reduces a long excerpt to at most 1200 points and draws nothing for one point', () => {
    const values = Array.from({ length: 20_000 }, (_, i) => Math.sin(i / 100));
    const svg = renderWaveformSvg({ t0: 0, dt: 1e-6, values, crossings: [], slopeFits: [] }, 'w', 'V');
    const points = /<polyline points="([^"]*)"/.exec(svg)![1].split(' ');
    expect(points.length).toBeLessThanOrEqual(1200);
    expect(renderWaveformSvg({ t0: 0, dt: 1, values: [1], crossings: [], slopeFits: [] }, 'w', 'V')).toBe('');
  });
});
