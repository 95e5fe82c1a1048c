import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { midCrossings, noiseLevel, periodFit, sineFit } from '../../src/analysis/index.js';
import { createRandom, synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { sameSamples } from './captureOf.js';

describe('midCrossings', () => {
  it('midCrossings places the crossing of a straight ramp exactly, by linear interpolation (IEEE 181 §5.3)', () => {
    const ramp = Float64Array.from({ length: 10 }, (_, i) => i * 0.3 - 1);
    const c = midCrossings(ramp, 0.05, 0.2);
    expect(c.rising.length).toBe(1);
    expectWithin(c.rising[0], 1.05 / 0.3, { abs: 1e-12 }, 'closed form: (level + 1)/0.3 samples');
  });

  it('midCrossings finds one crossing per edge when noise rides on a slow edge (hysteresis)', () => {
    const rnd = createRandom(3);
    // A slow rise through the level with noise 10 % of the swing: without hysteresis it crosses many times.
    const x = Float64Array.from({ length: 2000 }, (_, i) => Math.tanh((i - 1000) / 300) + 0.1 * rnd.gaussian());
    let naive = 0;
    for (let i = 1; i < x.length; i++) if (x[i - 1] <= 0 && x[i] > 0) naive++;
    expect(naive).toBeGreaterThan(3);
    const c = midCrossings(x, 0, 0.4);
    expect(c.rising.length).toBe(1);
    expect(c.falling.length).toBe(0);
  });

  it('midCrossings refuses a negative hysteresis as a caller bug', () => {
    expect(() => midCrossings(new Float64Array(4), 0, -1)).toThrow(RangeError);
  });

  it('midCrossings counts 2·cycles crossings of any sine record (property)', () => {
    fc.assert(
      fc.property(fc.integer({ min: 3, max: 40 }), fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }), (cycles, phase) => {
        const s = synthesize({ shape: 'sine', frequency: cycles, amplitude: 1, sampleRate: 1000 * cycles, samples: 1000 * cycles, phase });
        const c = midCrossings(s.values, 0, 0.1);
        // Each whole cycle holds one rising and one falling crossing; the ends may cut one of each.
        expect(c.rising.length + c.falling.length).toBeGreaterThanOrEqual(2 * cycles - 2);
        expect(c.rising.length + c.falling.length).toBeLessThanOrEqual(2 * cycles);
      }),
      { numRuns: 30 },
    );
  });
});

describe('periodFit', () => {
  it('periodFit returns null without two like crossings', () => {
    expect(periodFit({ rising: [10], falling: [20], risingSteps: [1], fallingSteps: [1] }, 1)).toBeNull();
  });

  it('periodFit bridges a missed crossing instead of counting it as one period', () => {
    const rising = [0, 100, 200, 400, 500, 600].map((t) => t + 0.25);
    const steps = rising.map(() => 0.01);
    const f = periodFit({ rising, falling: [], risingSteps: steps, fallingSteps: [] }, 1);
    expectWithin(f?.period, 100, { abs: 1e-9 }, 'crossings every 100 samples (closed form)');
    expect(f?.cycles).toBe(6);
  });
});

describe('sineFit (IEEE 1057 four-parameter)', () => {
  it('sineFit recovers frequency, amplitude and offset of a noisy sine within its stated uncertainties', () => {
    const s = synthesize({ shape: 'sine', frequency: 997.3, amplitude: 1.5, offset: 0.2, sampleRate: 48_000, samples: 9600, phase: 0.3, noise: 0.01, seed: 4 });
    const f = sineFit(s.values, s.dt, 997.2); // a start as close as the crossing fit gives
    expect(f).not.toBeNull();
    expectWithin(f?.frequency, 997.3, { abs: 3 * (f?.uFrequency ?? 0) }, 'synthesized frequency, within 3u');
    expectWithin(f?.amplitude, 1.5, { abs: 3 * (f?.uAmplitude ?? 0) }, 'synthesized amplitude, within 3u');
    expectWithin(f?.offset, 0.2, { abs: 3 * (f?.uOffset ?? 0) }, 'synthesized offset, within 3u');
    // The residual of a fit to sine + white noise is the noise (IEEE 1057: residual rms = NAD).
    expectWithin(f?.residualRms, 0.01, { rel: 0.05 }, 'synthesized noise σ');
  });

  it('sineFit gives up (null) on a flat record instead of inventing a frequency', () => {
    expect(sineFit(new Float64Array(1000).fill(1), 1e-3, 10)).toBeNull();
  });

  it('sineFit gives up (null) rather than converge elsewhere from a start several bins away', () => {
    const s = synthesize({ shape: 'sine', frequency: 997.3, amplitude: 1, sampleRate: 48_000, samples: 9600, noise: 0.01, seed: 4 });
    const f = sineFit(s.values, s.dt, 800);
    expect(f === null || Math.abs(f.frequency - 997.3) < 3 * f.uFrequency).toBe(true);
  });

  it('sineFit leaves its input unmodified', () => {
    const s = synthesize({ shape: 'sine', frequency: 50, amplitude: 1, sampleRate: 5000, samples: 1000, noise: 0.01, seed: 1 });
    const copy = Float64Array.from(s.values);
    sineFit(s.values, s.dt, 49);
    expect(sameSamples(s.values, copy)).toBe(true);
  });
});

describe('noiseLevel', () => {
  it('noiseLevel estimates white noise σ within 5 % on a triangle and on a square', () => {
    for (const shape of ['triangle', 'square'] as const) {
      const s = synthesize({ shape, frequency: 100, amplitude: 1, sampleRate: 100_000, samples: 50_000, noise: 0.02, seed: 6 });
      expectWithin(noiseLevel(s.values), 0.02, { rel: 0.05 }, `synthesized σ on a ${shape} (second differences have variance 6σ²)`);
    }
  });

  it('noiseLevel does not report zero on an 8-bit quantised ramp', () => {
    const s = synthesize({ shape: 'triangle', frequency: 10, amplitude: 1, sampleRate: 100_000, samples: 20_000, bits: 8, fullScale: 2.2 });
    // Quantisation noise of an ideal quantiser is q/√12 (REFERENCES.md §3); within a factor 2 here.
    const q = 2.2 / 256;
    const sigma = noiseLevel(s.values);
    expect(sigma).toBeGreaterThan(q / Math.sqrt(12) / 2);
    expect(sigma).toBeLessThan((2 * q) / Math.sqrt(12));
  });
});
