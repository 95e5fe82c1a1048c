/**
 * The upper bound hum gives when nothing stands above the noise must hold: a component planted at the
 * bound is found or raises the bound past its own level, at any frequency between DFT bins, and the
 * bound moves with the noise as an amplitude does (20 dB per decade of σ, closed form for white noise:
 * bin power ∝ σ²).
 */
import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
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
  it('hum bound holds for a component planted at it: found, or bounded above its own level, at any offset between bins and either mains family', () => {
    const noise = 2e-3;
    const b = boundOf(noise, 11).bound;
    expect(b).not.toBeNull();
    const planted = A1 * 10 ** (b! / 20);
    // 20 000 samples over a 2^15-point transform: bins 0.61 Hz apart; offsets of 0, ¼ and ½ bin.
    const bin = base.sampleRate / 32768;
    for (const [k, f] of [50, 60, 100, 120].flatMap((m) => [0, 0.25, 0.5].map((o) => [m, Math.round(m / bin) * bin + o * bin]))) {
      const r = boundOf(noise, 100 + k + Math.round(f), [{ frequency: f, amplitude: planted }]);
      // Found (its level then carries the noise of its bins, a few dB at this level), or bounded above it.
      if (r.level === null) expect(r.bound!, `component of ${planted} V at ${f} Hz`).toBeGreaterThanOrEqual(20 * Math.log10(planted / A1));
      else expectWithin(r.level, 20 * Math.log10(planted / A1), { abs: 3 }, 'planted level; a component near the detection level reads within a few dB');
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
