/**
 * The upper bound hum gives when nothing stands above the noise must hold: a planted component at the
 * bound is found, at the least favourable frequency between DFT bins, and the bound moves with the
 * noise as an amplitude does (20 dB per decade of σ, closed form for white noise: bin power ∝ σ²).
 */
import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/synth/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectralAnalysis.js';
import { expectWithin } from '../../helpers/expectWithin.js';

const A = 3;
/** Fundamental of an ideal triangle of peak A: 8A/π² (Fourier series, REFERENCES §4). */
const A1 = (8 * A) / Math.PI ** 2;
const base = { shape: 'triangle', frequency: 261.63, amplitude: A, sampleRate: 20_000, samples: 20_000, bandLimited: true } as const;

function boundOf(noise: number, seed: number, hum: { frequency: number; amplitude: number }[] = []): { bound: number | null; level: number | null } {
  const sig = synthesize({ ...base, noise, seed, hum });
  const m = analyzeSpectrum(sig.values, sig.dt, base.frequency, 'triangle').measurements.humLevel;
  return { bound: m && !m.ok && m.bound ? m.bound.value : null, level: m?.ok ? m.value : null };
}

describe('hum upper bound', () => {
  it('hum finds a single component planted at the bound, at any offset between bins and either mains family', () => {
    const noise = 2e-3;
    const b = boundOf(noise, 11).bound;
    expect(b).not.toBeNull();
    // One component at the family bound /√2 is at the per-component detection level (definition of the bound).
    const each = (A1 * 10 ** (b! / 20)) / Math.SQRT2;
    // 20 000 samples over a 2^15-point transform: bins 0.61 Hz apart; offsets of 0, ¼ and ½ bin.
    const bin = base.sampleRate / 32768;
    for (const [k, f] of [50, 60, 100, 120].flatMap((m) => [0, 0.25, 0.5].map((o) => [m, Math.round(m / bin) * bin + o * bin]))) {
      const r = boundOf(noise, 100 + k + Math.round(f), [{ frequency: f, amplitude: each }]);
      expect(r.level, `component of ${each} V at ${f} Hz`).not.toBeNull();
    }
  });

  it('hum bound lies above the level of a component planted 10 dB under it', () => {
    const noise = 2e-3;
    const b = boundOf(noise, 12).bound!;
    const planted = A1 * 10 ** ((b - 10) / 20);
    const r = boundOf(noise, 13, [{ frequency: 50.3, amplitude: planted }]);
    const shown = r.bound ?? r.level;
    expect(shown).not.toBeNull();
    expect(shown!).toBeGreaterThan(20 * Math.log10(planted / A1));
  });

  it('hum bound rises 20 dB when the noise rises tenfold', () => {
    const low = boundOf(5e-4, 21).bound;
    const high = boundOf(5e-3, 22).bound;
    expectWithin(high! - low!, 20, { abs: 1.5 }, 'closed form: white-noise bin power ∝ σ² (Heinzel et al. 2002 §9); 1.5 dB for the scatter of a median over ~400 bins');
  });
});
