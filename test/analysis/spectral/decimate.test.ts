import { describe, expect, it } from 'vitest';
import { decimate } from '../../../src/analysis/spectrum/decimate.js';
import { expectWithin } from '../../helpers/expectWithin.js';

describe('decimate', () => {
  it('decimate passes DC with unit gain', () => {
    const d = decimate(new Float64Array(1000).fill(2.5), 1000, 7);
    for (const v of d.values) expectWithin(v, 2.5, { abs: 1e-12 }, 'unit DC gain of a normalised moving average (closed form)');
    expect(d.sampleRate).toBe(1000 / 7);
  });

  it('decimate scales a sine by its stated response, the 4th power of the moving-average Dirichlet ratio', () => {
    const fs = 10_000;
    const factor = 5;
    for (const f of [50, 400, 900]) {
      const x = Float64Array.from({ length: 20_000 }, (_, i) => Math.sin((2 * Math.PI * f * i) / fs));
      const d = decimate(x, fs, factor);
      // Amplitude over exactly 1 s of output (whole cycles), where sines of different frequency are orthogonal.
      let re = 0;
      let im = 0;
      const n = Math.round(d.sampleRate);
      for (let i = 0; i < n; i++) {
        re += d.values[i] * Math.cos((2 * Math.PI * f * i) / d.sampleRate);
        im += d.values[i] * Math.sin((2 * Math.PI * f * i) / d.sampleRate);
      }
      const amplitude = (2 * Math.hypot(re, im)) / n;
      const expected = Math.abs(Math.sin((Math.PI * f * factor) / fs) / (factor * Math.sin((Math.PI * f) / fs))) ** 4;
      expectWithin(d.response(f), expected, { rel: 1e-12 }, 'Hogenauer 1981 CIC response (closed form)');
      expectWithin(amplitude, expected, { rel: 1e-9 }, 'Hogenauer 1981 CIC response (closed form)');
    }
  });

  it('decimate refuses a factor that is not a positive integer', () => {
    expect(() => decimate(new Float64Array(10), 1, 0)).toThrow(RangeError);
    expect(() => decimate(new Float64Array(10), 1, 1.5)).toThrow(/1.5/);
  });
});
