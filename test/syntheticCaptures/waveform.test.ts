import { describe, it, expect } from 'vitest';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

const base = { frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 4000 } as const;

function maxDiff(a: Float64Array, b: Float64Array, from = 0): number {
  let m = 0;
  for (let i = from; i < a.length; i++) m = Math.max(m, Math.abs(a[i] - b[i]));
  return m;
}

describe('synthesize', () => {
  it('band-limited asymmetric triangle matches the ideal ramps when the series is summed to Nyquist', () => {
    for (const r of [0.5, 0.3, 0.8]) {
      const ideal = synthesize({ ...base, shape: 'triangle', riseFraction: r });
      const series = synthesize({ ...base, shape: 'triangle', riseFraction: r, bandLimited: true });
      // Series truncated at n = 500: corner error about 2A/(π²·N·r(1−r)) (closed form of the tail).
      expect(maxDiff(ideal.values, series.values)).toBeLessThan(0.01);
    }
  });

  it('band-limited square and pulse sit on the ideal levels away from the edges', () => {
    const sq = synthesize({ ...base, shape: 'square', duty: 0.5, bandLimited: true });
    expectWithin(sq.values[250], 1, { abs: 0.01 }, 'ideal square level (Fourier series, REFERENCES §4)');
    expectWithin(sq.values[750], -1, { abs: 0.01 }, 'ideal square level');
    const p = synthesize({ ...base, shape: 'pulse', duty: 0.25, bandLimited: true });
    expectWithin(p.values[125], 2, { abs: 0.01 }, 'pulse high = 2A');
    expectWithin(p.values[600], 0, { abs: 0.01 }, 'pulse low = 0');
  });

  it('band-limited sawtooth rises from −A to +A over the period', () => {
    const ideal = synthesize({ ...base, shape: 'sawtooth' });
    const series = synthesize({ ...base, shape: 'sawtooth', bandLimited: true });
    expectWithin(series.values[500], ideal.values[500], { abs: 0.005 }, 'sawtooth mid-ramp');
  });

  it('an RC-shaped edge reaches 63.2 % of the step after one time constant', () => {
    const tau = 10e-6;
    const s = synthesize({ ...base, shape: 'square', edge: { tau } });
    // Rising edge at t = 0 from −1 to +1: v(τ) = −1 + 2(1 − e^−1) (first-order step, closed form).
    expectWithin(s.values[10], -1 + 2 * (1 - Math.exp(-1)), { abs: 1e-9 }, 'first-order step response');
  });

  it('the same seed gives the same noise and another seed does not', () => {
    const a = synthesize({ ...base, shape: 'sine', noise: 0.01, seed: 7 });
    const b = synthesize({ ...base, shape: 'sine', noise: 0.01, seed: 7 });
    const c = synthesize({ ...base, shape: 'sine', noise: 0.01, seed: 8 });
    expect(maxDiff(a.values, b.values)).toBe(0);
    expect(maxDiff(a.values, c.values)).toBeGreaterThan(0);
  });
});
