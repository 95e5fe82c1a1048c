import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import type { MeasureResult } from '../../../src/types/index.js';
import { expectWithin } from '../../helpers/expectWithin.js';
import { truncatedThd } from './fourierSeries.js';

function value(m: MeasureResult | undefined): number | undefined {
  expect(m?.ok, JSON.stringify(m)).toBe(true);
  return m?.ok ? m.value : undefined;
}

describe('thd', () => {
  const published: [('triangle' | 'square' | 'sawtooth'), number, number][] = [
    ['triangle', 12.12, 12.048],
    ['square', 48.34, 42.88],
    ['sawtooth', 80.31, 74.15],
  ];
  for (const [shape, all, toTenth] of published) {
    it(`thd of an ideal ${shape} sums every harmonic below Nyquist by default, and gives the truncated series over 2–50 and ${toTenth} % over 2–10 when asked`, () => {
      const sig = synthesize({ shape, frequency: 1013.7, amplitude: 2.5, sampleRate: 500_000, samples: 50_000, bandLimited: true, phase: 0.2 });
      // 246 harmonics of 1013.7 Hz lie below 250 kHz, the last 0.6 kHz clear of Nyquist (beyond the 4-bin lobe).
      const all246 = analyzeSpectrum(sig.values, sig.dt, 1013.7, shape);
      expectWithin(value(all246.measurements.thd), 100 * truncatedThd(shape, 246), { abs: 0.05 }, `REFERENCES §4 series summed to Nyquist, H = 246 (all harmonics: ${all} %)`);
      expect(all246.measurements.thd?.ok && all246.measurements.thd.method).toMatch(/every harmonic below Nyquist, 1–246/);
      const r50 = analyzeSpectrum(sig.values, sig.dt, 1013.7, shape, { harmonicSet: { harmonics: 50 } });
      expectWithin(value(r50.measurements.thd), 100 * truncatedThd(shape, 50), { abs: 0.05 }, 'REFERENCES §4 truncated THD, H = 50');
      const r10 = analyzeSpectrum(sig.values, sig.dt, 1013.7, shape, { harmonicSet: { harmonics: 10 } });
      expectWithin(value(r10.measurements.thd), toTenth, { abs: 0.05 }, 'REFERENCES test cases 4–6, THD 2–10');
      expect(r10.measurements.thd?.ok && r10.measurements.thd.method).toMatch(/harmonics 2–10/);
    });
  }

  it('thd of a triangle approaches the all-harmonics value 12.12 % within 0.05 points', () => {
    const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 200_000, samples: 30_000, bandLimited: true });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'triangle');
    expectWithin(value(r.measurements.thd), 100 * Math.sqrt(Math.PI ** 4 / 96 - 1), { abs: 0.05 }, 'closed form √(π⁴/96 − 1), REFERENCES §4');
  });

  it('thd of a sawtooth through a first-order low-pass at the fundamental is 36.95 %', () => {
    // |H(n)| = 1/√(1 + n²); 200 harmonics synthesised (REFERENCES test case 7).
    const harmonics = Array.from({ length: 199 }, (_, i) => {
      const n = i + 2;
      return { n, fraction: (1 / n / Math.sqrt(1 + n * n)) * Math.SQRT2, phase: 0.3 * n };
    });
    const sig = synthesize({ shape: 'sine', frequency: 100, amplitude: 1, sampleRate: 100_000, samples: 123_457, harmonics });
    const r = analyzeSpectrum(sig.values, sig.dt, 100, 'sawtooth');
    expectWithin(value(r.measurements.thd), 36.949, { abs: 0.05 }, 'Blagouchine & Moreau 2011 via OEIS A300714, √(π²/3 − π·coth π)');
  });
});

describe('thd and sfdr with known harmonics', () => {
  it('a 1 V sine with 10 mV 2nd and 1 mV 3rd harmonic gives THD 1.00499 %, SFDR 40.00 dBc, H2 −40 and H3 −60 dBc', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 100_000, samples: 100_000, harmonics: [{ n: 2, fraction: 0.01 }, { n: 3, fraction: 0.001, phase: 1 }] });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine');
    const thd = value(r.measurements.thd) as number;
    expectWithin(thd, 1.00499, { rel: 1e-4 }, 'REFERENCES test case 12');
    expectWithin(20 * Math.log10(thd / 100), -39.957, { abs: 0.01 }, 'REFERENCES test case 12');
    expectWithin(value(r.measurements.sfdr), 40.0, { abs: 0.01 }, 'REFERENCES test case 12');
    expectWithin(r.harmonics[1].dbc, -40.0, { abs: 0.01 }, 'REFERENCES test case 12');
    expectWithin(r.harmonics[2].dbc, -60.0, { abs: 0.01 }, 'REFERENCES test case 12');
    expect(r.measurements.sfdr?.ok && r.measurements.sfdr.method).toMatch(/harmonic 2/);
  });

  it('sfdr names a non-harmonic spur when it is the largest', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 100_000, samples: 100_000, harmonics: [{ n: 2, fraction: 1e-4 }], hum: [{ frequency: 7321, amplitude: 3e-3 }] });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine');
    // Read from its peak bin: low by at most the 4-term Blackman-Harris scallop loss, 0.83 dB (Harris 1978).
    expectWithin(value(r.measurements.sfdr), -20 * Math.log10(3e-3), { abs: 0.85 }, 'closed form 20·log10(1/0.003), Harris 1978 scallop loss');
    expect(r.measurements.sfdr?.ok && r.measurements.sfdr.method).toMatch(/non-harmonic component at 732\d/);
  });

  it('thd does not change with amplitude scale or DC offset', () => {
    const base = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 40_000, samples: 9000, bandLimited: true, riseFraction: 0.46 });
    const ref = value(analyzeSpectrum(base.values, base.dt, 261.63, 'triangle').measurements.thd) as number;
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e3, noNaN: true }), fc.double({ min: -12, max: 12, noNaN: true }), (k, dc) => {
        const r = analyzeSpectrum(base.values.map((v) => k * v + dc), base.dt, 261.63, 'triangle');
        expectWithin(value(r.measurements.thd), ref, { rel: 1e-7 }, 'THD is a ratio of amplitudes (definition)');
      }),
      { seed: 60, numRuns: 10 },
    );
  });
});

describe('sinad, enob and snr', () => {
  for (const [bits, sinadDb, tol] of [[12, 74.0, 0.3], [8, 50.0, 0.3]] as const) {
    it(`an ideal ${bits}-bit quantised full-scale sine gives SINAD ${sinadDb} dB and ENOB ${bits} bits`, () => {
      const q = 2 / 2 ** bits;
      const sig = synthesize({ shape: 'sine', frequency: (1e6 * 1021) / 16384, amplitude: 1 - q, sampleRate: 1e6, samples: 16384, bits, fullScale: 2 });
      const r = analyzeSpectrum(sig.values, sig.dt, (1e6 * 1021) / 16384, 'sine');
      expectWithin(value(r.measurements.sinad), 6.02 * bits + 1.76, { abs: tol }, 'IEEE 1241 ideal quantisation, REFERENCES test case 11');
      expectWithin(value(r.measurements.enob), bits, { abs: 0.05 }, 'IEEE 1241 ENOB = (SINAD − 1.76)/6.02, REFERENCES test case 11');
    });
  }

  it('a 1 V sine with 1 mV rms white noise gives SNR 56.99 dB and ENOB 9.17 bits', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1234.5, amplitude: 1, sampleRate: 100_000, samples: 400_000, noise: 1e-3, seed: 11 });
    const r = analyzeSpectrum(sig.values, sig.dt, 1234.5, 'sine');
    expectWithin(value(r.measurements.snr), 56.99, { abs: 0.2 }, 'REFERENCES test case 11: 10·log10(0.5/1e-6)');
    expectWithin(value(r.measurements.enob), 9.17, { abs: 0.04 }, 'REFERENCES test case 11');
  });

  it('snr of a noisy triangle counts its harmonics as signal, not noise', () => {
    const sig = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 200_000, samples: 200_000, bandLimited: true, noise: 1e-3, seed: 5 });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'triangle');
    // Signal power A²/3 (triangle rms A/√3, REFERENCES §4) over σ² = 1e-6.
    expectWithin(value(r.measurements.snr), 10 * Math.log10(1 / 3 / 1e-6), { abs: 0.2 }, 'closed form from the triangle rms A/√3 (REFERENCES §4)');
    expect(r.measurements.sinad).toBeUndefined();
    expect(r.measurements.enob).toBeUndefined();
  });
});
