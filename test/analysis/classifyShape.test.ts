import { describe, expect, it } from 'vitest';
import { classifyShape, measureCapture } from '../../src/analysis/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { captureOf } from './captureOf.js';

const shapeOf = (spec: SynthSpec) => measureCapture(captureOf([synthesize(spec)])).channels[0].shape;
const base = { frequency: 261.63, amplitude: 3, sampleRate: 100_000, samples: 20_000, phase: 0.3 } as const;

// Expected shapes are the synthesized ones; the pulse/square boundary (duty outside 40–60 % is a
// pulse) and the sawtooth boundary (fast edge under a tenth of the cycle) are ours (common practice, no source).
describe('classifyShape', () => {
  const cases: [string, SynthSpec, string][] = [
    ['a clean sine', { ...base, shape: 'sine' }, 'sine'],
    ['a noisy sine with offset', { ...base, shape: 'sine', offset: 4, noise: 0.15, seed: 1 }, 'sine'],
    ['a sine with 3 % second harmonic', { ...base, shape: 'sine', harmonics: [{ n: 2, fraction: 0.03 }] }, 'sine'],
    ['a symmetric triangle', { ...base, shape: 'triangle' }, 'triangle'],
    ['a triangle with slope ratio 1.1', { ...base, shape: 'triangle', riseFraction: 1 / 2.1 }, 'triangle'],
    ['a noisy 8-bit triangle with offset', { ...base, shape: 'triangle', offset: -1, noise: 0.1, bits: 8, seed: 2 }, 'triangle'],
    ['a band-limited triangle (rounded corners)', { ...base, shape: 'triangle', bandLimited: true, sampleRate: 10_000 }, 'triangle'],
    ['a square', { ...base, shape: 'square' }, 'square'],
    ['a square with RC edges of 3 % of the period', { ...base, shape: 'square', edge: { tau: 0.03 / 261.63 / Math.log(9) } }, 'square'],
    ['a ringing square with noise', { ...base, shape: 'square', edge: { zeta: 0.5, omegaN: 2 * Math.PI * 10_000 }, noise: 0.1, seed: 3 }, 'square'],
    ['a 55 % square', { ...base, shape: 'pulse', duty: 0.55 }, 'square'],
    ['a 25 % pulse', { ...base, shape: 'pulse', duty: 0.25 }, 'pulse'],
    ['a 5 % pulse', { ...base, shape: 'pulse', duty: 0.05 }, 'pulse'],
    ['a rising sawtooth', { ...base, shape: 'sawtooth' }, 'sawtooth'],
    ['a noisy sawtooth with offset', { ...base, shape: 'sawtooth', offset: 2, noise: 0.1, seed: 4 }, 'sawtooth'],
  ];
  for (const [what, spec, shape] of cases) {
    it(`classifyShape calls ${what} a ${shape}`, () => {
      expect(shapeOf(spec)).toBe(shape);
    });
  }

  it('classifyShape calls a falling sawtooth (an inverted rising one) a sawtooth', () => {
    const s = synthesize({ ...base, shape: 'sawtooth' });
    const inverted = { ...s, values: s.values.map((v) => -v) };
    const ch = measureCapture(captureOf([inverted])).channels[0];
    expect(ch.shape).toBe('sawtooth');
    expect(ch.measurements.fallSlope?.value).not.toBeNull();
    expect(ch.measurements.riseSlope).toBeUndefined();
  });

  it('classifyShape calls pure noise unknown', () => {
    const noise = synthesize({ ...base, shape: 'sine', amplitude: 0, noise: 1, seed: 9 });
    expect(classifyShape(noise.values, null, null).shape).toBe('unknown');
  });

  it('classifyShape names a square of 1.3 cycles and a triangle of 2.4 cycles', () => {
    expect(shapeOf({ ...base, shape: 'square', samples: 500 })).toBe('square');
    expect(shapeOf({ ...base, shape: 'triangle', samples: 900 })).toBe('triangle');
  });

  it('classifyShape calls a sine of less than one cycle unknown rather than guess', () => {
    expect(shapeOf({ ...base, shape: 'sine', samples: 300 })).toBe('unknown');
  });

  it('classifyShape calls a square with RC edges of 10 % of the period a square (dwell near the levels)', () => {
    expect(shapeOf({ ...base, shape: 'square', edge: { tau: 0.1 / 261.63 / Math.log(9) } })).toBe('square');
  });

  it('classifyShape leaves its input unmodified', () => {
    const s = synthesize({ ...base, shape: 'triangle', noise: 0.1, seed: 1 }).values;
    const copy = Float64Array.from(s);
    classifyShape(s, 10, 382.2);
    expect(s.every((v, i) => v === copy[i])).toBe(true);
  });
});
