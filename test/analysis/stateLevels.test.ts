import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { stateLevels } from '../../src/analysis/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { sameSamples } from './captureOf.js';

// Second-order step, ζ = 0.5, ωn chosen so each state lasts many ring periods (REFERENCES.md test case 10).
const ringing = (noise: number, seed = 1) =>
  synthesize({ shape: 'square', frequency: 1000, amplitude: 0.5, offset: 0.5, sampleRate: 10_000_000, samples: 50_000, edge: { zeta: 0.5, omegaN: 2 * Math.PI * 100_000 }, noise, seed });

describe('stateLevels', () => {
  it('stateLevels finds the levels of a ringing square with noise within 0.5 % of amplitude (REFERENCES.md test case 10)', () => {
    const s = ringing(0.005).values;
    const l = stateLevels(s);
    expectWithin(l?.low, 0, { abs: 0.005 }, 'REFERENCES.md test case 10: histogram-mode low level 0.000 ± 0.5 % of A');
    expectWithin(l?.high, 1, { abs: 0.005 }, 'REFERENCES.md test case 10: histogram-mode high level 1.000 ± 0.5 % of A');
  });

  it('stateLevels gives −1 and +1 for an ideal ±1 V square (REFERENCES.md test case 4)', () => {
    const s = synthesize({ shape: 'square', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 10_000 }).values;
    const l = stateLevels(s);
    expectWithin(l?.low, -1, { abs: 1e-9 }, 'REFERENCES.md test case 4');
    expectWithin(l?.high, 1, { abs: 1e-9 }, 'REFERENCES.md test case 4');
  });

  it('stateLevels states an uncertainty that covers the error of a noisy level', () => {
    const s = ringing(0.02, 9).values;
    const l = stateLevels(s);
    expect(l).not.toBeNull();
    expect(Math.abs((l?.high ?? 0) - 1)).toBeLessThanOrEqual(3 * (l?.uHigh ?? 0) + 1e-3);
  });

  it('stateLevels returns null for a flat record, which has no states to split', () => {
    expect(stateLevels(new Float64Array(100).fill(2.5))).toBeNull();
  });

  it('stateLevels refuses a bin count below 4 as a caller bug', () => {
    expect(() => stateLevels(new Float64Array([0, 1]), { bins: 2 })).toThrow(RangeError);
  });

  it('stateLevels leaves its input unmodified', () => {
    const s = ringing(0.005).values;
    const copy = Float64Array.from(s);
    stateLevels(s);
    expect(sameSamples(s, copy)).toBe(true);
  });

  it('stateLevels moves with a DC shift and scales with the amplitude (property)', () => {
    const s = ringing(0.005).values;
    const l = stateLevels(s);
    fc.assert(
      fc.property(fc.double({ min: -10, max: 10, noNaN: true }), fc.double({ min: 0.01, max: 100, noNaN: true }), (shift, gain) => {
        const t = s.map((v) => gain * v + shift);
        const m = stateLevels(t);
        expectWithin(m?.high, gain * (l?.high ?? 0) + shift, { abs: 1e-9 * (gain + Math.abs(shift)) }, 'affine map of the levels (closed form)');
        expectWithin(m?.low, gain * (l?.low ?? 0) + shift, { abs: 1e-9 * (gain + Math.abs(shift)) }, 'affine map of the levels (closed form)');
      }),
      { numRuns: 20 },
    );
  });
});
