import { describe, it, expect } from 'vitest';
import fc from 'fast-check';
import { capacitanceFromRamps, capacitanceFromSlope, coreFrequency, currentFromSlope, octaves, scaleToCondition, toleranceU } from '../../src/diagnose/index.js';
import type { Estimate } from '../../src/diagnose/index.js';
import { createRandom } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

const exact = (value: number): Estimate => ({ value, u: 0 });

describe('core frequency from design values (1/f = C·Vpp·(1/I_charge + 1/I_discharge))', () => {
  it('gives the figures a practitioner knows for a 6.8 nF integrator swinging 5 Vpp', () => {
    const c = exact(6.8e-9);
    const vpp = exact(5);
    const slow = coreFrequency(c, vpp, exact(2.5e-6), exact(2.5e-6)).value;
    const fast = coreFrequency(c, vpp, exact(640e-6), exact(640e-6)).value;
    expectWithin(slow, 37, { rel: 0.01 }, 'common practice (no source): 6.8 nF, 5 Vpp, 2.5 µA runs near 37 Hz');
    expectWithin(fast, 9400, { rel: 0.01 }, 'common practice (no source): 6.8 nF, 5 Vpp, 640 µA runs near 9.4 kHz');
    expectWithin(octaves(640e-6 / 2.5e-6), 8, { abs: 1e-12 }, 'common practice (no source): a 256:1 current range spans 8 octaves; log2 256 = 8');
    expectWithin(fast / slow, 256, { rel: 1e-12 }, 'closed form: f ∝ I');
  });

  it('reduces to f = I/(2·C·Vpp) for matched currents and to the sum of the two ramp times otherwise', () => {
    expectWithin(coreFrequency(exact(6.8e-9), exact(5), exact(2.5e-6), exact(2.5e-6)).value, 2.5e-6 / (2 * 6.8e-9 * 5), { rel: 1e-12 }, 'closed form f = I/(2·C·Vpp)');
    // Capacitor law: a ramp over Vpp at I/C takes C·Vpp/I; the period is the two ramp times added.
    const period = (6.8e-9 * 5) / 40e-6 + (6.8e-9 * 5) / 43e-6;
    expectWithin(coreFrequency(exact(6.8e-9), exact(5), exact(40e-6), exact(43e-6)).value, 1 / period, { rel: 1e-12 }, 'capacitor law dV/dt = I/C, ramp times added');
  });

  it('throws a RangeError for a zero or negative design value', () => {
    expect(() => coreFrequency(exact(6.8e-9), exact(5), exact(0), exact(1e-6))).toThrow(RangeError);
    expect(() => octaves(0)).toThrow(RangeError);
    expect(() => capacitanceFromSlope(exact(1e-6), exact(0))).toThrow(RangeError);
  });
});

describe('design values carried between conditions (1 V/octave)', () => {
  it('scales a current given at 2 V to 5 V by three octaves, tolerance included', () => {
    const atMid = { value: 14.76e-6, u: 0.3e-6 };
    const high = scaleToCondition(atMid, 261.63, 2093.0);
    expectWithin(high.value, 8 * 14.76e-6, { rel: 2e-4 }, 'common practice (no source): 1 V/octave, +3 V is ×8; 2093.0/261.63 = 7.99985');
    expectWithin(high.u / high.value, atMid.u / atMid.value, { rel: 1e-12 }, 'closed form: a scale factor keeps the relative uncertainty');
  });

  it('reads a ±5 % tolerance as a rectangular distribution, u = a/√3', () => {
    const u = toleranceU({ nominal: 4.7e-9, unit: 'F', lower: 4.465e-9, upper: 4.935e-9 });
    expectWithin(u, 0.235e-9 / Math.sqrt(3), { rel: 1e-12 }, 'JCGM 100:2008 §4.3.7, rectangular distribution');
  });
});

describe('uncertainty propagation checked against a Monte Carlo run (JCGM 101:2008)', () => {
  const M = 200_000; // trials; JCGM 101 §7.2 suggests 10^6 for 95 % intervals, 2·10^5 suffices for a standard deviation to ≈ 0.3 %
  const stats = (xs: Float64Array): { mean: number; sd: number } => {
    const mean = xs.reduce((s, x) => s + x, 0) / xs.length;
    return { mean, sd: Math.sqrt(xs.reduce((s, x) => s + (x - mean) ** 2, 0) / (xs.length - 1)) };
  };
  const rect = (rnd: ReturnType<typeof createRandom>, centre: number, half: number): number => centre + half * (2 * rnd.uniform() - 1);

  it('matches the Monte Carlo spread of I = C·|dV/dt| with C rectangular ±5 % and a normal slope', () => {
    const slope = { value: 3140, u: 6 };
    const c = { value: 4.7e-9, u: toleranceU({ nominal: 4.7e-9, unit: 'F', lower: 4.465e-9, upper: 4.935e-9 }) };
    const gum = currentFromSlope(slope, c);
    const rnd = createRandom(11);
    const draws = new Float64Array(M).map(() => rect(rnd, 4.7e-9, 0.235e-9) * (slope.value + slope.u * rnd.gaussian()));
    const mc = stats(draws);
    expectWithin(gum.value, mc.mean, { rel: 1e-3 }, 'JCGM 101 Monte Carlo mean, seeded, M = 2·10^5');
    expectWithin(gum.u, mc.sd, { rel: 0.01 }, 'JCGM 101 Monte Carlo standard deviation, seeded, M = 2·10^5');
  });

  it('matches the Monte Carlo spread of the design frequency with every input rectangular', () => {
    const tol = { c: 0.05, v: 0.02, i: 0.02 };
    const input = (x: number, t: number): Estimate => ({ value: x, u: (x * t) / Math.sqrt(3) });
    const gum = coreFrequency(input(4.7e-9, tol.c), input(6, tol.v), input(14.76e-6, tol.i), input(14.76e-6, tol.i));
    const rnd = createRandom(12);
    const draws = new Float64Array(M).map(() => {
      const [c, v, a, b] = [rect(rnd, 4.7e-9, 4.7e-9 * tol.c), rect(rnd, 6, 6 * tol.v), rect(rnd, 14.76e-6, 14.76e-6 * tol.i), rect(rnd, 14.76e-6, 14.76e-6 * tol.i)];
      return 1 / (c * v * (1 / a + 1 / b));
    });
    const mc = stats(draws);
    // First-order propagation of a mildly non-linear model: agreement to a few per cent is expected (JCGM 101 §8).
    expectWithin(gum.value, mc.mean, { rel: 0.003 }, 'JCGM 101 Monte Carlo mean, seeded, M = 2·10^5');
    expectWithin(gum.u, mc.sd, { rel: 0.03 }, 'JCGM 101 Monte Carlo standard deviation, seeded, M = 2·10^5');
  });

  it('matches the Monte Carlo spread of C from both ramps with rectangular currents and normal slopes', () => {
    const ic = { value: 15e-6, u: (0.3e-6) / Math.sqrt(3) };
    const id = { value: 14e-6, u: (0.28e-6) / Math.sqrt(3) };
    const rise = { value: 3191, u: 9 };
    const fall = { value: 2979, u: 8 };
    const gum = capacitanceFromRamps(ic, id, rise, fall);
    const rnd = createRandom(13);
    const draws = new Float64Array(M).map(() => (rect(rnd, 15e-6, 0.3e-6) + rect(rnd, 14e-6, 0.28e-6)) / (rise.value + rise.u * rnd.gaussian() + fall.value + fall.u * rnd.gaussian()));
    const mc = stats(draws);
    expectWithin(gum.value, mc.mean, { rel: 1e-3 }, 'JCGM 101 Monte Carlo mean, seeded, M = 2·10^5');
    expectWithin(gum.u, mc.sd, { rel: 0.02 }, 'JCGM 101 Monte Carlo standard deviation, seeded, M = 2·10^5');
  });
});

describe('current and capacitance from a slope (capacitor law I = C·dV/dt)', () => {
  it('round-trips: the capacitance back-computed from the current it gave is the one put in', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-10, max: 1e-6, noNaN: true }), fc.double({ min: 1, max: 1e6, noNaN: true }), fc.double({ min: 0, max: 0.1, noNaN: true }), (c, s, r) => {
        const slope = { value: s, u: r * s };
        const i = currentFromSlope(slope, exact(c));
        const back = capacitanceFromSlope(exact(i.value), exact(s));
        return Math.abs(back.value / c - 1) < 1e-12 && Math.abs(i.u / i.value - r) < 1e-12;
      }),
    );
  });

  it('gives the same current for a falling ramp as for a rising one of equal steepness, and leaves its inputs alone', () => {
    const fall = Object.freeze({ value: -3140, u: 6 });
    const rise = Object.freeze({ value: 3140, u: 6 });
    const c = Object.freeze(exact(4.7e-9));
    expect(currentFromSlope(fall, c)).toEqual(currentFromSlope(rise, c));
    expectWithin(currentFromSlope(rise, c).value, 4.7e-9 * 3140, { rel: 1e-12 }, 'capacitor law I = C·dV/dt');
  });
});
