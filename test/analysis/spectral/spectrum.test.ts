import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import FFT from 'fft.js';
import { isPowerOfTwo, nextPowerOfTwo, realSpectrum, spectrumInPlace } from '../../../src/analysis/spectrum/spectrum.js';
import { expectWithin } from '../../helpers/expectWithin.js';
import { expectAllWithin } from '../../helpers/expectAllWithin.js';

/** Plain O(M²) DFT, X[k] = Σ x[i]·e^(−2πik·i/M): the textbook definition, independent of fft.js. */
function plainDft(x: readonly number[]): { re: number[]; im: number[] } {
  const m = x.length;
  const re: number[] = [];
  const im: number[] = [];
  for (let k = 0; k <= m / 2; k++) {
    let r = 0;
    let i = 0;
    for (let t = 0; t < m; t++) {
      r += x[t] * Math.cos((2 * Math.PI * k * t) / m);
      i -= x[t] * Math.sin((2 * Math.PI * k * t) / m);
    }
    re.push(r);
    im.push(i);
  }
  return { re, im };
}

/** The bins of a spectrum as two arrays, for one comparison over all of them. */
function binsOf(s: { bins: number; re(k: number): number; im(k: number): number }): { re: Float64Array; im: Float64Array } {
  return { re: Float64Array.from({ length: s.bins }, (_, k) => s.re(k)), im: Float64Array.from({ length: s.bins }, (_, k) => s.im(k)) };
}

const sizedRecord = fc
  .constantFrom(2, 4, 8, 16, 32, 64, 128, 256)
  .chain((m) => fc.array(fc.double({ min: -1000, max: 1000, noNaN: true }), { minLength: m, maxLength: m }));

describe('realSpectrum', () => {
  it('realSpectrum matches a plain DFT bin by bin on seeded random records of every size to 256', () => {
    fc.assert(
      fc.property(sizedRecord, (x) => {
        const s = realSpectrum(Float64Array.from(x));
        const ref = plainDft(x);
        const scale = x.reduce((a, v) => a + Math.abs(v), 0) + 1;
        const { re, im } = binsOf(s);
        expectAllWithin(re, ref.re, { abs: 1e-11 * scale }, 'plain DFT definition, real parts');
        expectAllWithin(im, ref.im, { abs: 1e-11 * scale }, 'plain DFT definition, imaginary parts');
      }),
      { seed: 1241, numRuns: 60 },
    );
  });

  it('realSpectrum matches fft.js, an independent FFT library, bin by bin at 2^10 to 2^18 points', () => {
    for (const m of [2 ** 10, 2 ** 13, 2 ** 16, 2 ** 18]) {
      let seed = 20_201;
      const x = Float64Array.from({ length: m }, (_, i) => {
        seed = (seed * 16_807) % 2_147_483_647;
        return seed / 2_147_483_647 - 0.5 + Math.sin(0.37 * i) + 3 * Math.cos((2 * Math.PI * 17.25 * i) / m);
      });
      const reference = new FFT(m);
      const out = new Float64Array(2 * m);
      reference.realTransform(out, x);
      const s = realSpectrum(x);
      let peak = 0;
      for (let k = 0; k < s.bins; k++) peak = Math.max(peak, Math.hypot(out[2 * k], out[2 * k + 1]));
      // Both are O(ε·log M) accurate; 1e-13 of the largest bin is far above either's rounding.
      // Every bin is compared; the worst one is asserted.
      const { re, im } = binsOf(s);
      const refRe = Float64Array.from({ length: s.bins }, (_, k) => out[2 * k]);
      const refIm = Float64Array.from({ length: s.bins }, (_, k) => out[2 * k + 1]);
      expectAllWithin(re, refRe, { abs: 1e-13 * peak }, `fft.js 4.0.4 realTransform, real parts at M = ${m}`);
      expectAllWithin(im, refIm, { abs: 1e-13 * peak }, `fft.js 4.0.4 realTransform, imaginary parts at M = ${m}`);
    }
  });

  it('spectrumInPlace gives the same bins as realSpectrum and refuses a buffer of the wrong length', () => {
    const x = Float64Array.from({ length: 256 }, (_, i) => Math.sin(i / 3) + (i % 7));
    const buffer = new Float64Array(258);
    buffer.set(x);
    const a = spectrumInPlace(buffer, 256);
    const b = realSpectrum(x);
    for (let k = 0; k < b.bins; k++) expect([a.re(k), a.im(k)]).toEqual([b.re(k), b.im(k)]);
    expect(() => spectrumInPlace(new Float64Array(256), 256)).toThrow(/258/);
  });

  it('realSpectrum puts a unit cosine at bin k with magnitude M/2 and phase 0', () => {
    const m = 64;
    const x = Float64Array.from({ length: m }, (_, i) => Math.cos((2 * Math.PI * 5 * i) / m));
    const s = realSpectrum(x);
    expectWithin(s.magnitude(5), m / 2, { rel: 1e-12 }, 'DFT of a bin-centred cosine (closed form)');
    expectWithin(s.phase(5), 0, { abs: 1e-12 }, 'closed form');
    expectWithin(s.magnitude(4), 0, { abs: 1e-12 }, 'orthogonality of DFT bins (closed form)');
  });

  it('realSpectrum leaves its input unmodified', () => {
    const x = Float64Array.from({ length: 32 }, (_, i) => Math.sin(i) + i / 7);
    const copy = Float64Array.from(x);
    realSpectrum(x);
    expect(Array.from(x)).toEqual(Array.from(copy));
  });

  it('realSpectrum refuses a length that is not a power of two, quoting it', () => {
    expect(() => realSpectrum(new Float64Array(10))).toThrow(RangeError);
    expect(() => realSpectrum(new Float64Array(10))).toThrow(/10/);
    expect(() => realSpectrum(new Float64Array(1))).toThrow(RangeError);
  });

  it('nextPowerOfTwo gives the smallest power of two at or above n', () => {
    expect([1, 2, 3, 1000, 1024, 1025].map(nextPowerOfTwo)).toEqual([2, 2, 4, 1024, 1024, 2048]);
    expect(isPowerOfTwo(4096)).toBe(true);
    expect(isPowerOfTwo(4095)).toBe(false);
    expect(() => nextPowerOfTwo(Number.NaN)).toThrow(RangeError);
  });
});
