import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { findSplice } from '../../src/capture/splice.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import type { SynthShape } from '../../src/syntheticCaptures/index.js';

// FH-210 Kestrel outputs (demo scenario, ours) at 50 kS/s, with the impairments a bench sees.
const signal = (shape: SynthShape, seed: number, extra: Record<string, unknown> = {}) =>
  synthesize({ shape, frequency: 261.63, amplitude: 3, sampleRate: 50_000, samples: 4000, noise: 0.01, seed, ...extra }).values;

describe('findSplice', () => {
  it('finds no splice in whole records of every shape, with noise, hum, 8-bit steps, RC edges or clipping', () => {
    fc.assert(
      fc.property(
        fc.constantFrom<SynthShape>('sine', 'triangle', 'square', 'pulse', 'sawtooth'),
        fc.integer({ min: 1, max: 10_000 }),
        fc.constantFrom<Record<string, unknown>>({}, { bits: 8 }, { hum: [{ frequency: 50, amplitude: 0.05 }] }, { edge: { tau: 2e-5 } }, { clip: { low: -2.5, high: 2.5 } }),
        (shape, seed, extra) => findSplice([signal(shape, seed, extra)]) === null,
      ),
      { seed: 1414, numRuns: 120 },
    );
  });

  it('finds where a tail from another stretch of the signal was joined on, with or without a step', () => {
    fc.assert(
      fc.property(fc.constantFrom<SynthShape>('sine', 'triangle'), fc.integer({ min: 2600, max: 3600 }), fc.integer({ min: 50, max: 150 }), fc.double({ min: 0.2, max: 0.6, noNaN: true }), (shape, at, lag, offset) => {
        const x = signal(shape, 7);
        const spliced = Float64Array.from(x, (v, i) => (i < at ? v : x[i - lag] + offset));
        const s = findSplice([spliced]);
        // The tail's first samples may agree with the record by chance; the break is found within a few samples of where it is.
        return s !== null && s.at >= at && s.at <= at + 5;
      }),
      { seed: 1415, numRuns: 60 },
    );
  });

  it('leaves its input unmodified', () => {
    const x = signal('triangle', 3);
    const copy = Float64Array.from(x);
    findSplice([x]);
    expect(x).toEqual(copy);
  });

  it('finds a joined tail in a long record (searched at every fourth sample) within a few samples, and nothing in a whole one', () => {
    const long = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 1e6, samples: 200_000, noise: 0.01, seed: 5 }).values;
    expect(findSplice([long])).toBeNull();
    for (const [at, lag, offset] of [[150_001, 1234, 0.5], [170_003, 777, 0], [120_002, 2000, -0.3]]) {
      const spliced = Float64Array.from(long, (v, i) => (i < at ? v : long[i - lag] + offset));
      const s = findSplice([spliced]);
      expect(s !== null && s.at >= at && s.at <= at + 5, `splice at ${at}, found ${s?.at}`).toBe(true);
    }
  });
});
