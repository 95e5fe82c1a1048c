import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { windowFigures } from '../../../src/analysis/spectrum/windowFigures.js';
import { windowKernel, windowSamples, type WindowKind } from '../../../src/analysis/spectrum/windows.js';
import { realSpectrum } from '../../../src/analysis/spectrum/spectrum.js';
import { expectWithin } from '../../helpers/expectWithin.js';

const HARRIS = 'Harris 1978, Table I (REFERENCES §1, test case 1)';
const FLAT = 'scipy flattop definition, Heinzel et al. 2002 (REFERENCES §1, test case 1, computed)';

describe('windowFigures', () => {
  const rows: [WindowKind, number, number, number, number | null, string][] = [
    ['rectangular', 1, 1.0, 3.922, -13.26, HARRIS],
    ['hann', 0.5, 1.5, 1.424, -31.47, HARRIS],
    ['blackman-harris-4', 0.35875, 2.004, 0.826, -92.0, HARRIS],
    ['flat-top', 0.2156, 3.77, 0.0098, null, FLAT],
  ];
  for (const [kind, cg, enbw, sl, hsl, source] of rows) {
    it(`windowFigures gives the published coherent gain, ENBW, scallop loss and sidelobe of the ${kind} window at N = 4096`, () => {
      const f = windowFigures(kind, 4096);
      expectWithin(f.coherentGain, cg, { abs: 1e-4 }, source);
      expectWithin(f.enbw, enbw, { abs: 1e-3 }, source);
      expectWithin(f.scallopLossDb, sl, { abs: 0.005 }, source);
      if (hsl !== null) expectWithin(f.highestSidelobeDb, hsl, { abs: kind === 'blackman-harris-4' ? 0.2 : 0.1 }, source);
    });
  }
});

describe('window half-bin response', () => {
  const rows: [WindowKind, number, number][] = [
    ['rectangular', 0.6366, 0.001],
    ['hann', 0.8488, 0.001],
    ['blackman-harris-4', 0.9093, 0.001],
    ['flat-top', 0.9989, 0.002],
  ];
  for (const [kind, expected, tol] of rows) {
    it(`a unit sine half a bin off centre reads ${expected} through the ${kind} window (coherent-gain corrected)`, () => {
      // Bin 1000.5, far from DC, so the negative-frequency image adds under 2e-4 (rectangular sidelobe 1/(π·2001)).
      const m = 4096;
      const w = windowSamples(kind, m);
      const x = Float64Array.from(w, (wi, i) => wi * Math.sin((2 * Math.PI * 1000.5 * i) / m));
      const s = realSpectrum(x);
      const sum = w.reduce((a, v) => a + v, 0);
      const read = (2 * Math.max(s.magnitude(1000), s.magnitude(1001))) / sum;
      expectWithin(read, expected, { abs: tol }, 'REFERENCES test case 2 (computed, Harris 1978 scallop loss)');
    });
  }
});

describe('windowKernel', () => {
  it('windowKernel equals the direct sum Σ w[i]·e^(−iθi) at arbitrary θ for every window', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<WindowKind>('rectangular', 'hann', 'blackman-harris-4', 'flat-top'),
        fc.integer({ min: 8, max: 300 }),
        fc.double({ min: -Math.PI, max: Math.PI, noNaN: true }),
        (kind, length, theta) => {
          const w = windowSamples(kind, length);
          let re = 0;
          let im = 0;
          for (let i = 0; i < length; i++) {
            re += w[i] * Math.cos(theta * i);
            im -= w[i] * Math.sin(theta * i);
          }
          const k = windowKernel(kind, length, theta);
          expectWithin(k.re, re, { abs: 1e-9 * length }, 'DTFT definition (direct sum)');
          expectWithin(k.im, im, { abs: 1e-9 * length }, 'DTFT definition (direct sum)');
        },
      ),
      { seed: 1978, numRuns: 200 },
    );
  });

  it('windowKernel is exact on the bin grid, where shifted kernels sit on their peaks', () => {
    const k0 = windowKernel('hann', 64, 0);
    const k1 = windowKernel('hann', 64, (2 * Math.PI) / 64);
    const k2 = windowKernel('hann', 64, (4 * Math.PI) / 64);
    expectWithin(k0.re, 32, { abs: 1e-12 }, 'Σw = a₀·L (closed form)');
    expectWithin(Math.hypot(k1.re, k1.im), 16, { abs: 1e-12 }, 'a₁·L/2 (closed form)');
    expectWithin(Math.hypot(k2.re, k2.im), 0, { abs: 1e-12 }, 'first null of Hann at 2 bins (Harris 1978)');
  });

  it('windowSamples refuses a length that is not a positive integer', () => {
    expect(() => windowSamples('hann', 0)).toThrow(RangeError);
    expect(() => windowSamples('hann', 2.5)).toThrow(/2.5/);
  });
});
