import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import type { MeasureResult } from '../../../src/types/index.js';
import { expectWithin } from '../../helpers/expectWithin.js';
import { numericAmplitude, seriesAmplitude } from './fourierSeries.js';

function value(m: MeasureResult | undefined): number | undefined {
  expect(m?.ok, JSON.stringify(m)).toBe(true);
  return m?.ok ? m.value : undefined;
}

/** One period of the ideal asymmetric triangle (rise share r), straight from its definition. */
const asymmetricTriangle = (r: number) => (p: number) => (p < r ? -1 + (2 * p) / r : 1 - (2 * (p - r)) / (1 - r));

describe('shapeError', () => {
  for (const shape of ['triangle', 'square', 'sawtooth'] as const) {
    it(`shapeError of an ideal ${shape} is below 0.01 %`, () => {
      const sig = synthesize({ shape, frequency: 1000, amplitude: 3, sampleRate: 200_000, samples: 21_111, bandLimited: true });
      const r = analyzeSpectrum(sig.values, sig.dt, 1000, shape);
      expect(value(r.measurements.shapeError)).toBeLessThan(0.01);
    });
  }

  it('shapeError of a triangle rising over 55 % of the period matches the definition on its Fourier amplitudes', () => {
    const rise = 0.55;
    const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 1, riseFraction: rise, sampleRate: 200_000, samples: 20_000, bandLimited: true });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'triangle');
    const m = Array.from({ length: 51 }, (_, n) => (n === 0 ? 0 : numericAmplitude(asymmetricTriangle(rise), n)));
    const ideal = (n: number) => seriesAmplitude('triangle', n) / seriesAmplitude('triangle', 1);
    let diff = 0;
    let norm = 0;
    for (let n = 1; n <= 50; n++) {
      diff += (m[n] / m[1] - ideal(n)) ** 2;
      norm += ideal(n) ** 2;
    }
    expectWithin(value(r.measurements.shapeError), 100 * Math.sqrt(diff / norm), { rel: 0.01 }, 'definition applied to a plain DFT of the ideal waveform (independent implementation)');
    const h2 = r.harmonics[1];
    expectWithin(h2.amplitude, m[2], { rel: 1e-3 }, 'plain DFT of the ideal asymmetric triangle');
    expect(h2.idealDbc).toBeUndefined();
  });

  it('shapeError of a pulse compares with the pulse series at the duty measured or, failing that, estimated', () => {
    const sig = synthesize({ shape: 'pulse', frequency: 2093, amplitude: 5, duty: 0.3, sampleRate: 500_000, samples: 50_000, bandLimited: true });
    const given = analyzeSpectrum(sig.values, sig.dt, 2093, 'pulse', { dutyCycle: 30 });
    expect(value(given.measurements.shapeError)).toBeLessThan(0.01);
    const estimated = analyzeSpectrum(sig.values, sig.dt, 2093, 'pulse');
    expect(value(estimated.measurements.shapeError)).toBeLessThan(0.01);
    expect(estimated.measurements.shapeError?.ok && estimated.measurements.shapeError.method).toMatch(/duty 30\.0 %.*cos\(πD\)/);
  });

  it('shapeError of a sine equals its THD, and is not given for an unknown shape', () => {
    const sig = synthesize({ shape: 'sine', frequency: 440, amplitude: 1, sampleRate: 44_100, samples: 44_100, harmonics: [{ n: 3, fraction: 0.02 }] });
    const r = analyzeSpectrum(sig.values, sig.dt, 440, 'sine');
    expectWithin(value(r.measurements.shapeError), value(r.measurements.thd) as number, { rel: 1e-9 }, 'definition: ideal sine series is the fundamental alone');
    expect(analyzeSpectrum(sig.values, sig.dt, 440, 'unknown').measurements.shapeError).toBeUndefined();
  });
});

describe('evenOddRatio', () => {
  it('evenOddRatio of an asymmetric triangle is the even-to-odd harmonic power ratio of its Fourier series', () => {
    const rise = 0.6;
    const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 1, riseFraction: rise, sampleRate: 200_000, samples: 20_000, bandLimited: true, noise: 1e-4 });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'triangle');
    let even = 0;
    let odd = 0;
    for (let n = 2; n <= 50; n++) {
      const a = numericAmplitude(asymmetricTriangle(rise), n) ** 2;
      if (n % 2 === 0) even += a;
      else odd += a;
    }
    expectWithin(value(r.measurements.evenOddRatio), 10 * Math.log10(even / odd), { abs: 0.05 }, 'plain DFT of the ideal waveform (independent implementation)');
  });

  it('evenOddRatio of a symmetric triangle is withheld below the noise, with the bound stated', () => {
    const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 200_000, samples: 20_000, bandLimited: true, noise: 1e-3, seed: 8 });
    const m = analyzeSpectrum(sig.values, sig.dt, 1000, 'triangle').measurements.evenOddRatio;
    expect(m).toMatchObject({ ok: false, reason: 'below-noise' });
    expect(m?.ok === false && m.detail).toMatch(/below -\d+\.\d dB/);
  });

  it('evenOddRatio of a square at 40 % duty is the even-to-odd power ratio of the pulse series', () => {
    const sig = synthesize({ shape: 'square', frequency: 1000, amplitude: 1, duty: 0.4, sampleRate: 200_000, samples: 20_000, bandLimited: true });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'square', { harmonicSet: { harmonics: 50 } });
    let even = 0;
    let odd = 0;
    for (let n = 2; n <= 50; n++) {
      const a = Math.abs(Math.sin(n * Math.PI * 0.4)) ** 2 / (n * n);
      if (n % 2 === 0) even += a;
      else odd += a;
    }
    expectWithin(value(r.measurements.evenOddRatio), 10 * Math.log10(even / odd), { abs: 0.01 }, 'pulse series (2h/(πn))|sin(nπD)|, REFERENCES §4');
  });
});
