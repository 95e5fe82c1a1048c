import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { capability, describeSample } from '../../src/records/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

const NIST = 'NIST/SEMATECH e-Handbook §6.1.6 worked example (REFERENCES §6)';
const TEN = 'REFERENCES test case 15, ten readings (sample mean and n−1 standard deviation, closed form)';
const READINGS = [10.02, 9.98, 10.01, 10.0, 9.99, 10.03, 9.97, 10.0, 10.01, 9.99];

describe('capability', () => {
  it('gives Cp 1.000, Cpu 0.6667, Cpl 1.3333 and Cpk 0.6667 for USL 20, LSL 8, μ 16, σ 2', () => {
    const c = capability({ mean: 16, sd: 2, lower: 8, upper: 20 });
    expectWithin(c.cp, 1.0, { abs: 1e-4 }, NIST);
    expectWithin(c.cpu, 0.6667, { abs: 1e-4 }, NIST);
    expectWithin(c.cpl, 1.3333, { abs: 1e-4 }, NIST);
    expectWithin(c.cpk, 0.6667, { abs: 1e-4 }, NIST);
  });

  it('gives Cp = Cpk = 1.8257 for the ten readings against 10.00 ± 0.10', () => {
    const s = describeSample(READINGS);
    expectWithin(s.mean, 10.0, { abs: 1e-9 }, TEN);
    expectWithin(s.sd, 0.018257, { rel: 1e-4 }, TEN);
    expectWithin(s.min, 9.97, { abs: 0 }, 'smallest reading');
    expectWithin(s.max, 10.03, { abs: 0 }, 'largest reading');
    const c = capability({ mean: s.mean!, sd: s.sd!, lower: 9.9, upper: 10.1 });
    expectWithin(c.cp, 1.8257, { abs: 1e-4 }, TEN);
    expectWithin(c.cpk, 1.8257, { abs: 1e-4 }, TEN);
  });

  it('takes Cpk from the one limit there is and gives no Cp when the tolerance is one-sided', () => {
    const c = capability({ mean: 16, sd: 2, lower: null, upper: 20 });
    expect(c.cp).toBeNull();
    expect(c.cpl).toBeNull();
    expectWithin(c.cpk, 0.6667, { abs: 1e-4 }, NIST);
  });

  it('gives no indices when there is no spread, instead of infinity', () => {
    expect(capability({ mean: 1, sd: 0, lower: 0, upper: 2 })).toEqual({ cp: null, cpu: null, cpl: null, cpk: null });
  });

  it('throws a RangeError quoting the value for a negative spread or crossed limits (caller bugs)', () => {
    expect(() => capability({ mean: 1, sd: -1, lower: 0, upper: 2 })).toThrow(/sd -1/);
    expect(() => capability({ mean: 1, sd: 1, lower: 3, upper: 2 })).toThrow(/lower limit 3/);
  });

  it('never gives a Cpk above Cp, equal only for a centred process (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -100, max: 100, noNaN: true }), fc.double({ min: 0.01, max: 10, noNaN: true }), fc.double({ min: 0.1, max: 50, noNaN: true }), (mean, sd, half) => {
        const c = capability({ mean, sd, lower: -half, upper: half });
        expect(c.cpk!).toBeLessThanOrEqual(c.cp! * (1 + 1e-12));
      }),
    );
    const centred = capability({ mean: 5, sd: 1, lower: 2, upper: 8 });
    expectWithin(centred.cpk, centred.cp!, { rel: 1e-12 }, 'Cpk = Cp for a centred process (§6.1.6)');
  });

  it('keeps Cp and Cpk when values and limits shift together or scale together (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: -1e3, max: 1e3, noNaN: true }), fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (shift, scale) => {
        const base = capability({ mean: 16, sd: 2, lower: 8, upper: 20 });
        const moved = capability({ mean: (16 + shift) * scale, sd: 2 * scale, lower: (8 + shift) * scale, upper: (20 + shift) * scale });
        expectWithin(moved.cp, base.cp!, { rel: 1e-9 }, 'Cp is invariant to shift and scale (closed form)');
        expectWithin(moved.cpk, base.cpk!, { rel: 1e-6 }, 'Cpk is invariant to shift and scale (closed form)');
      }),
    );
  });
});

describe('describeSample', () => {
  it('gives no spread for a single value and nothing for none', () => {
    expect(describeSample([3])).toEqual({ count: 1, mean: 3, sd: null, min: 3, max: 3 });
    expect(describeSample([])).toEqual({ count: 0, mean: null, sd: null, min: null, max: null });
  });

  it('keeps the standard deviation of values far from zero (1e9 offset) within rounding', () => {
    const s = describeSample(READINGS.map((v) => v + 1e9));
    expectWithin(s.sd, 0.018257, { rel: 1e-3 }, `${TEN}, shifted by 1e9`);
  });

  it('leaves its input unmodified', () => {
    const input = [...READINGS];
    describeSample(input);
    expect(input).toEqual(READINGS);
  });
});
