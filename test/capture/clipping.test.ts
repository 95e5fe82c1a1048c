import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { detectClipping } from '../../src/capture/index.js';
import { synthesize } from '../../src/synth/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

// FH-210 demo figures (ours): triangle ±3 V, pulse 0…10 V, 8-bit scope over 20 V / 40 V full scale.
const base = { frequency: 261.63, sampleRate: 200 * 261.63 * 1.0137, samples: 4800, seed: 3 } as const;

describe('detectClipping', () => {
  it('flags a triangle clipped at +2.55 V, with the pinned share a triangle spends above the level', () => {
    const x = synthesize({ ...base, shape: 'triangle', amplitude: 3, bits: 8, fullScale: 20, noise: 0.006, clip: { low: -99, high: 2.55 } }).values;
    const c = detectClipping(x);
    expect(c?.low).toBe(0);
    // Above 2.55 V for 2·(3 − 2.55)/(4·3) = 7.5 % of each period (closed form), less the codes at the run edges.
    expectWithin(c!.high / x.length, 0.075, { abs: 0.01 }, 'closed form: time a triangle spends above a level');
  });

  it('flags a sine clipped at both rails', () => {
    const x = synthesize({ ...base, shape: 'sine', amplitude: 3, bits: 8, fullScale: 20, clip: { low: -2.7, high: 2.7 } }).values;
    const c = detectClipping(x);
    expect(c!.high).toBeGreaterThan(0);
    expect(c!.low).toBeGreaterThan(0);
  });

  it('does not flag 8-bit quantised, unclipped triangles and sines whose peaks repeat a code', () => {
    fc.assert(
      fc.property(fc.constantFrom<'sine' | 'triangle'>('sine', 'triangle'), fc.integer({ min: 50, max: 4000 }), fc.double({ min: 0, max: 0.05, noNaN: true }), fc.integer({ min: 1, max: 99 }), (shape, perPeriod, noise, seed) => {
        const x = synthesize({ shape, frequency: 100, amplitude: 3, sampleRate: 100 * perPeriod * 1.013, samples: 20_000, bits: 8, fullScale: 8, noise, seed }).values;
        expect(detectClipping(x), `${shape} at ${perPeriod} samples/period, noise ${noise}`).toBeNull();
      }),
      { numRuns: 40 },
    );
  });

  it('does not take the flat levels of a pulse output for clipping, with sharp or RC edges', () => {
    const sharp = synthesize({ ...base, shape: 'pulse', amplitude: 5, bits: 8, fullScale: 40, noise: 0.012 }).values;
    expect(detectClipping(sharp)).toBeNull();
    const rc = synthesize({ ...base, shape: 'pulse', amplitude: 5, sampleRate: 1e6, edge: { tau: 5e-6 }, bits: 8, fullScale: 40 }).values;
    expect(detectClipping(rc)).toBeNull();
  });

  it('ignores NaN gaps and returns null for a constant record', () => {
    const x = new Float64Array(1000).fill(1.25);
    expect(detectClipping(x)).toBeNull();
    x[10] = NaN;
    expect(detectClipping(x)).toBeNull();
  });

  it('leaves its input unmodified', () => {
    const x = synthesize({ ...base, shape: 'triangle', amplitude: 3, clip: { low: -2, high: 2 } }).values;
    const copy = x.slice();
    detectClipping(x);
    expect(Array.from(x)).toEqual(Array.from(copy));
  });
});
