import { describe, expect, it } from 'vitest';
import { measureCapture, measureChannel } from '../../src/analysis/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { createRandom, synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf } from './captureOf.js';

function measure(spec: SynthSpec) {
  return measureCapture(captureOf([synthesize(spec)])).channels[0];
}

/**
 * The frequency alone, from the time-domain stage that measureCapture takes it from (the spectrum
 * never changes it), for the coverage trials that measure hundreds of captures.
 */
function frequencyOf(spec: SynthSpec): { value: number; uncertainty: number } | null {
  const s = synthesize(spec);
  const f = measureChannel(s.values, s.dt, { unit: 'V' }).results.frequency;
  return f?.ok && f.uncertainty !== null ? { value: f.value, uncertainty: f.uncertainty } : null;
}

// 261.63 Hz at 100 kS/s: 382.2 samples per period, not a whole number, so crossings fall anywhere
// between samples. 20 000 samples hold 52 cycles.
const clean = { frequency: 261.63, amplitude: 3, sampleRate: 100_000, samples: 20_000, phase: 0.137 } as const;

describe('frequency and period', () => {
  for (const shape of ['sine', 'triangle', 'square'] as const) {
    it(`frequency of a clean ${shape} of 52 cycles is within 10 ppm of the synthesized value`, () => {
      const ch = measure({ ...clean, shape });
      expect(ch.shape).toBe(shape);
      expectWithin(ch.measurements.frequency?.value, 261.63, { rel: 10e-6 }, 'synthesized frequency (issue: 10 ppm on clean captures)');
      expectWithin(ch.measurements.period?.value, 1 / 261.63, { rel: 10e-6 }, 'period = 1/f (closed form)');
    });
  }

  it('frequency of a clean square of 20 cycles is within 10 ppm when its edges span a few samples', () => {
    // A scope's bandwidth rounds every real edge; τ = 2 samples lets interpolation place the crossing.
    const spec = { shape: 'square', frequency: 1234.5, amplitude: 1, sampleRate: 1_000_000, samples: Math.ceil(20.2e6 / 1234.5), phase: 0.3, edge: { tau: 2e-6 } } as const;
    const ch = measure(spec);
    expectWithin(ch.measurements.frequency?.value, 1234.5, { rel: 10e-6 }, 'synthesized frequency (issue: 10 ppm on clean captures of 20+ cycles)');
  });

  it('frequency of a square with edges faster than one sample stays within its stated k = 2 interval', () => {
    // 810.04 samples per period: every edge lands on the sample grid, so 20 cycles resolve the period
    // only to about one sample in 16 200 (the ±1 count of a counter, common practice).
    const spec = { shape: 'square', frequency: 1234.5, amplitude: 1, sampleRate: 1_000_000, samples: Math.ceil(20.2e6 / 1234.5), phase: 0.3 } as const;
    const m = measure(spec).measurements.frequency;
    expectWithin(m?.value, 1234.5, { abs: 2 * (m?.uncertainty ?? 0) }, 'synthesized frequency, within U = 2u (JCGM 100 §6.2)');
  });

  it('frequency of clean squares with sub-sample edges stays within its k = 2 interval when the period is near a whole number of samples', () => {
    // Worst case for the sampling grid: the edges drift slowly across it, so their errors are correlated.
    let outside = 0;
    for (let k = 0; k < 100; k++) {
      const spp = 810 + (k - 50) * 0.001 + (k % 3) / 3;
      const f = 1e6 / spp;
      const spec = { shape: 'square', frequency: f, amplitude: 1, sampleRate: 1e6, samples: Math.ceil((k % 2 ? 21 : 60) * spp), phase: (k * 0.381) % 1 } as const;
      const m = frequencyOf(spec);
      if (!(m !== null && Math.abs(m.value - f) <= 2 * m.uncertainty)) outside++;
    }
    // k = 2 gives about 95 % coverage (JCGM 100 §6.2); allow 5 of 100 outside.
    expect(outside).toBeLessThanOrEqual(5);
  });

  for (const shape of ['triangle', 'sine', 'square'] as const) {
    it(`frequency of a noisy ${shape} lies within its own k = 2 interval in at least 90 % of 200 seeded trials (GUM §6.2: k = 2 ≈ 95 %)`, () => {
      let inside = 0;
      for (let seed = 1; seed <= 200; seed++) {
        const f = 500 + seed * 0.731;
        const spec = { shape, frequency: f, amplitude: 1, sampleRate: 50_000, samples: 5_000, phase: (seed * 0.6180339) % 1, noise: 0.03, seed };
        const m = frequencyOf(spec);
        if (m !== null && Math.abs(m.value - f) <= 2 * m.uncertainty) inside++;
      }
      expect(inside).toBeGreaterThanOrEqual(180);
    });
  }

  it('frequency is withheld with the cycle count when the capture holds 1.4 cycles', () => {
    const ch = measure({ ...clean, shape: 'triangle', samples: Math.round(1.4 * 382.2) });
    expect(ch.measurements.frequency?.value).toBeNull();
    expect(ch.measurements.frequency?.reason).toBe('too-few-cycles');
    expect(ch.measurements.frequency?.note).toBe('the capture holds 1.4 cycles; lengthen the timebase to at least 2');
    expect(ch.measurements.period?.reason).toBe('too-few-cycles');
  });

  it('frequency is withheld with advice when 2.5 cycles hold only one period between like crossings', () => {
    // 2.5 cycles of a sine starting just before a falling zero: rising crossings at 1 T and 2 T only.
    const ch = measure({ shape: 'sine', frequency: 100, amplitude: 1, sampleRate: 100_000, samples: 2500, phase: 0.4999 });
    expect(ch.measurements.frequency?.note).toBe('the capture holds 2.5 cycles, but only 1 whole period lies between like crossings; lengthen the timebase to at least 3 cycles');
  });

  it('frequency is withheld when the capture holds less than one cycle', () => {
    const ch = measure({ ...clean, shape: 'sine', samples: 300 });
    expect(ch.measurements.frequency?.reason).toBe('too-few-cycles');
    expect(ch.measurements.frequency?.note).toMatch(/less than one whole cycle/);
  });

  it('jitter is the standard deviation of the periods when the oscillator jitters above the capture floor', () => {
    // A square whose periods are independent draws from N(1 ms, (2 µs)²), high for the first half of each.
    const fs = 1_000_000;
    const rnd = createRandom(2024);
    const periods = Array.from({ length: 200 }, () => 1e-3 + 2e-6 * rnd.gaussian());
    const edges: number[] = [];
    let t = 0;
    for (const p of periods) {
      edges.push(t, t + p / 2);
      t += p;
    }
    const values = new Float64Array(Math.floor(t * fs));
    let e = 0;
    for (let i = 0; i < values.length; i++) {
      while (e < edges.length && edges[e] <= i / fs) e++;
      values[i] = e % 2 === 1 ? 1 : -1;
    }
    const ch = measureCapture(captureOf([{ t0: 0, dt: 1 / fs, values }])).channels[0];
    // Expected: the sample standard deviation of the drawn periods (GUM eq. 4, computed independently
    // here), widened by the ±½-sample placement of each edge: √(s² + 2/12) samples (closed form).
    const s = standardDeviationOf(periods.slice(1, -1));
    const expected = Math.sqrt(s * s + (2 / 12) * (1 / fs) ** 2);
    expectWithin(ch.measurements.jitter?.value, expected, { rel: 0.05 }, 'sd of the drawn periods with sampling (closed form)');
  });

  it('jitter is withheld as below the noise when a clean capture has none', () => {
    const ch = measure({ ...clean, shape: 'triangle', noise: 0.01, seed: 3 });
    expect(ch.measurements.jitter?.value).toBeNull();
    expect(ch.measurements.jitter?.reason).toBe('below-noise');
  });
});

function standardDeviationOf(xs: readonly number[]): number {
  const m = xs.reduce((a, b) => a + b, 0) / xs.length;
  return Math.sqrt(xs.reduce((a, b) => a + (b - m) ** 2, 0) / (xs.length - 1));
}
