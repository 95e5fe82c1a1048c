/**
 * THD over the full harmonic series, and SINAD/ENOB of ideal quantised sines at any ratio of sample
 * rate to signal frequency, against closed forms:
 * - Fourier series sums (REFERENCES §4; Σ 1/n² over odd n = π²/8, over all n = π²/6, and
 *   Σ sin²(nπD)/n² = π²D(1 − D)/2, e.g. Gradshteyn & Ryzhik 1.443.3, from memory): THD of a square
 *   √(π²/8 − 1) = 48.34 %, a sawtooth √(π²/6 − 1) = 80.31 %, a pulse of duty D
 *   √(π²D(1 − D)/(2 sin²(πD)) − 1).
 * - An ideal N-bit quantiser's error is uniform with variance q²/12 (IEEE Std 1241-2010 §4.1.9 and
 *   the ENOB definition built on it), so a sine of peak A has SINAD = 10·log10((A²/2)/(q²/12)).
 */
import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import type { MeasureResult } from '../../../src/types/index.js';
import { expectWithin } from '../../helpers/expectWithin.js';

function value(m: MeasureResult | undefined): number {
  expect(m?.ok, JSON.stringify(m)).toBe(true);
  return m?.ok ? m.value : Number.NaN;
}

const pulseThd = (d: number): number => Math.sqrt((Math.PI ** 2 * d * (1 - d)) / (2 * Math.sin(Math.PI * d) ** 2) - 1);

describe('thd over the full series', () => {
  // 1403.7 samples per cycle: about 700 harmonics below Nyquist, 46.7 cycles in 2^16 samples.
  const f = 1000;
  const fs = 1403.7 * f;
  const cases: [string, 'square' | 'sawtooth' | 'pulse', number | undefined, number][] = [
    ['square', 'square', 0.5, Math.sqrt(Math.PI ** 2 / 8 - 1)],
    ['sawtooth', 'sawtooth', undefined, Math.sqrt(Math.PI ** 2 / 6 - 1)],
    ['10 % pulse', 'pulse', 0.1, pulseThd(0.1)],
    ['25 % pulse', 'pulse', 0.25, pulseThd(0.25)],
  ];
  for (const [name, shape, duty, expected] of cases) {
    it(`thd of an ideal ${name} sampled with about 700 harmonics below Nyquist is within 0.5 % of the Fourier-series value`, () => {
      const sig = synthesize({ shape, frequency: f, amplitude: 1, sampleRate: fs, samples: 65_536, phase: 0.137, ...(duty !== undefined ? { duty } : {}) });
      const m = analyzeSpectrum(sig.values, sig.dt, f, shape === 'pulse' ? 'pulse' : shape, duty !== undefined ? { dutyCycle: 100 * duty } : {}).measurements.thd;
      expectWithin(value(m), 100 * expected, { rel: 0.005 }, 'Fourier series sum (closed form, REFERENCES §4)');
      expect(m?.ok && m.method).toMatch(/every harmonic below Nyquist, 1–70\d/);
    });
  }
});

/**
 * ENOB by IEEE Std 1057-2017's three-parameter sine fit at the known frequency (time domain,
 * independent of the spectral method): least squares for a·cos + b·sin + c, NAD = mean residual²,
 * ENOB = (10·log10((a² + b²)/2/NAD) − 1.76)/6.02. At (near) coherent ratios the record holds only a
 * few sample phases, so its quantisation error is not q²/12; the fit gives what the record holds.
 */
function enobByThreeParameterFit(x: Float64Array, cyclesPerSample: number): number {
  const m = new Float64Array(9);
  const r = new Float64Array(3);
  for (let i = 0; i < x.length; i++) {
    const w = 2 * Math.PI * cyclesPerSample * i;
    const v = [Math.cos(w), Math.sin(w), 1];
    for (let a = 0; a < 3; a++) {
      r[a] += v[a] * x[i];
      for (let b = 0; b < 3; b++) m[3 * a + b] += v[a] * v[b];
    }
  }
  const det = (k: Float64Array): number => k[0] * (k[4] * k[8] - k[5] * k[7]) - k[1] * (k[3] * k[8] - k[5] * k[6]) + k[2] * (k[3] * k[7] - k[4] * k[6]);
  const d = det(m);
  const coef = [0, 1, 2].map((c) => {
    const k = m.slice();
    for (let a = 0; a < 3; a++) k[3 * a + c] = r[a];
    return det(k) / d;
  });
  let nad = 0;
  for (let i = 0; i < x.length; i++) {
    const w = 2 * Math.PI * cyclesPerSample * i;
    nad += (x[i] - coef[0] * Math.cos(w) - coef[1] * Math.sin(w) - coef[2]) ** 2;
  }
  nad /= x.length;
  return (10 * Math.log10((coef[0] ** 2 + coef[1] ** 2) / 2 / nad) - 1.76) / 6.02;
}

describe('enob of ideal 8- and 16-bit sines', () => {
  for (const bits of [8, 16]) {
    it(`enob of ideal ${bits}-bit sines at non-coherent, near-coherent and near-Nyquist ratios is within 0.1 bit of the IEEE 1057 time-domain fit`, () => {
      const q = 2 / 2 ** bits;
      for (const ratio of [7.3, 37.77, 64.0001, 90.00001, 301.3]) {
        const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1 - q, sampleRate: ratio * 1000, samples: 16_384, bits, fullScale: 2, phase: 0.31 });
        const enob = value(analyzeSpectrum(sig.values, sig.dt, 1000, 'sine').measurements.enob);
        expectWithin(enob, enobByThreeParameterFit(sig.values, 1 / ratio), { abs: 0.1 }, `IEEE 1057 three-parameter sine fit at ${ratio} samples per cycle`);
      }
    });
  }
});

describe('sinad and enob of ideal quantised sines', () => {
  const bits = 12;
  const fullScale = 2;
  const q = fullScale / 2 ** bits;
  const amplitude = 1 - q;
  const closedForm = (10 * Math.log10(amplitude ** 2 / 2 / ((q * q) / 12)) - 1.76) / 6.02;
  // Non-coherent, near-coherent, near-even and near-Nyquist ratios of sample rate to frequency.
  const ratios: [number, boolean][] = [
    [7.3, true],
    [13.1234567, true],
    [90.5, true],
    [2.3456, true],
    [64.0001, false],
    [90.00001, false],
    [31.99999, false],
    [4.000001, false],
    [1000.00001, false],
  ];
  for (const [ratio, manyPhases] of ratios) {
    it(`enob of an ideal 12-bit sine at ${ratio} samples per cycle is within 0.1 bit of the IEEE 1057 time-domain fit${manyPhases ? ' and of the quantiser closed form' : ''}`, () => {
      const f = 1000;
      const sig = synthesize({ shape: 'sine', frequency: f, amplitude, sampleRate: ratio * f, samples: 16_384, bits, fullScale, phase: 0.31 });
      const enob = value(analyzeSpectrum(sig.values, sig.dt, f, 'sine').measurements.enob);
      expectWithin(enob, enobByThreeParameterFit(sig.values, 1 / ratio), { abs: 0.1 }, 'IEEE 1057 three-parameter sine fit, residual as noise and distortion');
      if (manyPhases) expectWithin(enob, closedForm, { abs: 0.1 }, 'ideal quantiser, noise q²/12 (IEEE 1241 §4.1.9)');
    });
  }
});

describe('thd and sinad of a sine with known harmonics at awkward ratios', () => {
  // 2nd harmonic at −40 dBc and 3rd at −50 dBc: THD = √(0.01² + 0.0031623²) = 1.0488 % (definition, IEEE 1241).
  const harmonics = [
    { n: 2, fraction: 0.01 },
    { n: 3, fraction: 10 ** (-50 / 20) },
  ];
  for (const ratio of [7.3, 64.0001, 90.00001, 31.99999]) {
    it(`thd and sinad of a sine with −40/−50 dBc harmonics at ${ratio} samples per cycle match the definition`, () => {
      const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: ratio * 1000, samples: 16_384, harmonics, phase: 0.2 });
      const m = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine').measurements;
      expectWithin(value(m.thd), 100 * Math.hypot(0.01, 10 ** (-50 / 20)), { rel: 1e-3 }, 'THD_F definition over the planted harmonics (IEEE 1241)');
      expectWithin(value(m.sinad), -20 * Math.log10(Math.hypot(0.01, 10 ** (-50 / 20))), { abs: 0.01 }, 'SINAD: fundamental over the planted harmonics, no noise (IEEE 1241)');
    });
  }

  it('thd leaves out a harmonic that sits on Nyquist with its alias, and says so', () => {
    // 6.00001 samples per cycle: the 3rd harmonic lies 5·10⁻⁶ of f below Nyquist, inside its own alias's lobe.
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 6.00001 * 1000, samples: 16_384, harmonics, phase: 0.2 });
    const m = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine').measurements.thd;
    expectWithin(value(m), 1, { rel: 1e-3 }, 'THD_F over harmonic 2 alone: 1 % (definition)');
    expect(m?.ok && m.method).toMatch(/harmonic 3 lies within a main lobe of Nyquist/);
  });
});
