import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum, MAX_SPAN } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import { expectWithin } from '../../helpers/expectWithin.js';

const CASE13 = 'REFERENCES test case 13';

describe('hum', () => {
  for (const mains of [50, 60] as const) {
    it(`hum finds ${mains} Hz pickup on a 1 kHz sine and levels it at −40.0 dBc`, () => {
      const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 10_000, samples: 10_000, hum: [{ frequency: mains, amplitude: 0.01 }], noise: 1e-4, seed: 2 });
      const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine');
      expectWithin(r.measurements.humFrequency?.ok ? r.measurements.humFrequency.value : undefined, mains, { abs: 0.1 }, CASE13);
      expectWithin(r.measurements.humLevel?.ok ? r.measurements.humLevel.value : undefined, -40.0, { abs: 0.1 }, CASE13);
      expect(r.hum?.mains).toBe(mains);
    });
  }

  it('hum reports 100 Hz beside 50 Hz as the 2nd mains harmonic and levels the family as their rss', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 10_000, samples: 10_000, hum: [{ frequency: 50, amplitude: 0.01 }, { frequency: 100, amplitude: 0.005 }], noise: 1e-4 });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine');
    expect(r.hum?.components.map((c) => c.order)).toEqual([1, 2]);
    expectWithin(r.hum?.components[1].frequency, 100, { abs: 0.1 }, CASE13);
    expectWithin(r.hum?.components[1].amplitude, 0.005, { rel: 0.01 }, 'synthesised level');
    expectWithin(r.measurements.humLevel?.ok ? r.measurements.humLevel.value : undefined, 20 * Math.log10(Math.hypot(0.01, 0.005)), { abs: 0.1 }, 'rss of the components (definition)');
    expect(r.measurements.humLevel?.ok && r.measurements.humLevel.method).toMatch(/2nd mains harmonic/);
  });

  it('hum gives an upper bound on its level, no value, when no mains component rises above the noise', () => {
    const sig = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 20_000, samples: 20_000, bandLimited: true, noise: 1e-3, seed: 4 });
    const r = analyzeSpectrum(sig.values, sig.dt, 261.63, 'triangle');
    expect(r.measurements.humFrequency).toMatchObject({ ok: false, reason: 'below-noise' });
    expect(r.measurements.humLevel).toMatchObject({ ok: false, reason: 'below-noise', bound: { kind: 'upper' } });
    expect(r.hum).toBeUndefined();
  });

  it('hum never reports a harmonic of the fundamental, even one at 100 Hz', () => {
    const sig = synthesize({ shape: 'square', frequency: 50.2, amplitude: 5, sampleRate: 20_000, samples: 40_000, bandLimited: true, noise: 1e-3, duty: 0.45 });
    const r = analyzeSpectrum(sig.values, sig.dt, 50.2, 'square');
    expect(r.hum).toBeUndefined();
  });

  it('hum is withheld when the record is too short to tell 50 Hz from 60 Hz', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 100_000, samples: 10_000, hum: [{ frequency: 50, amplitude: 0.01 }] });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'sine');
    expect(r.measurements.humFrequency).toMatchObject({ ok: false, reason: 'too-few-cycles' });
  });

  it('hum in a record longer than one transform is found from the decimated whole record', () => {
    const sig = synthesize({ shape: 'triangle', frequency: 2093, amplitude: 3, sampleRate: 2_000_000, samples: MAX_SPAN + 500_000, hum: [{ frequency: 60, amplitude: 0.02 }], noise: 1e-3, seed: 9 });
    const r = analyzeSpectrum(sig.values, sig.dt, 2093, 'triangle');
    const a1 = (8 * 3) / Math.PI ** 2;
    expectWithin(r.measurements.humFrequency?.ok ? r.measurements.humFrequency.value : undefined, 60, { abs: 0.1 }, 'synthesised hum');
    expectWithin(r.measurements.humLevel?.ok ? r.measurements.humLevel.value : undefined, 20 * Math.log10(0.02 / a1), { abs: 0.1 }, 'closed form: 8A/π² fundamental (REFERENCES §4)');
  });

  it('hum is found without a fundamental, its level withheld for want of a reference', () => {
    const sig = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 10_000, samples: 10_000, hum: [{ frequency: 60, amplitude: 0.01 }], noise: 1e-4 });
    const r = analyzeSpectrum(sig.values, sig.dt, null, 'unknown');
    expectWithin(r.measurements.humFrequency?.ok ? r.measurements.humFrequency.value : undefined, 60, { abs: 0.1 }, 'synthesised hum');
    expect(r.measurements.humLevel).toMatchObject({ ok: false, reason: 'too-few-cycles' });
  });
});
