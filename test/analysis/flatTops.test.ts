/**
 * flatTops against closed forms: a symmetric triangle of peak A spends (A − L)/(2A) of each period
 * above a level L (closed form, straight ramps), so a buffer saturating at L is flat for that share;
 * an 8-bit converter's codes run from −128q to 127q (two's complement, mid-tread, as src/syntheticCaptures
 * quantises). Demo figures are ours (FH-210 triangle ±3 V at 261.63 Hz).
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { flatTops } from '../../src/analysis/levels/flatTops.js';
import { measureCapture } from '../../src/analysis/index.js';
import { createRandom, synthesize } from '../../src/syntheticCaptures/index.js';
import { noiseLevel } from '../../src/analysis/levels/noiseLevel.js';
import { captureOf } from './captureOf.js';
import { expectWithin } from '../helpers/expectWithin.js';

const base = { shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 261.63 * 400 * 1.0137, samples: 20_000, phase: 0.13 } as const;
const SHARE = (3 - 2.4) / (2 * 3);

function quantise(x: Float64Array, q: number): Float64Array {
  return x.map((v) => Math.round(v / q) * q);
}

function flatsOf(x: Float64Array) {
  let lo = Infinity;
  let hi = -Infinity;
  for (const v of x) [lo, hi] = [Math.min(lo, v), Math.max(hi, v)];
  return flatTops(x, { noise: noiseLevel(x), span: hi - lo });
}

describe('flatTops', () => {
  for (const [label, q] of [['1 µV', 1e-6], ['80 mV', 0.08]] as const) {
    it(`flatTops finds a triangle buffer saturating at +2.4 V as the circuit's, with the closed-form share, at ${label} resolution`, () => {
      const x = quantise(synthesize({ ...base, clip: { low: -99, high: 2.4 } }).values, q);
      const f = flatsOf(x);
      expect(f).toHaveLength(1);
      expect(f[0]).toMatchObject({ side: 'high', cause: 'circuit' });
      expectWithin(f[0].level, 2.4, { abs: q / 2 + 1e-9 }, 'clip level, to half a code');
      expectWithin(f[0].share, SHARE, { abs: 0.01 }, 'closed form (A − L)/(2A) for a triangle');
    });
  }

  it('flatTops finds saturation with noise riding on the flat level', () => {
    const x = synthesize({ ...base, clip: { low: -2.4, high: 99 } }).values;
    const rnd = createRandom(7);
    const y = x.map((v) => v + 0.005 * rnd.gaussian());
    // One spike past the flat (a glitch) must not hide it.
    y[1234] = -2.9;
    const f = flatsOf(y);
    expect(f.map((t) => [t.side, t.cause])).toEqual([['low', 'circuit']]);
    expectWithin(f[0].share, SHARE, { abs: 0.015 }, 'closed form (A − L)/(2A); noise moves the run edges by a few samples');
  });

  it('flatTops names the scope when the flat level is an 8-bit converter end code, and when the capture states the full scale', () => {
    // 8 bits over 4.8 V: q = 18.75 mV, codes −2.4 V … 2.38125 V; the ±3 V triangle runs off both ends.
    const x = synthesize({ ...base, bits: 8, fullScale: 4.8 }).values;
    const f = flatsOf(x);
    expect(f.map((t) => [t.side, t.cause, t.fullScaleFrom])).toEqual([['high', 'scope-range', 'converter-codes'], ['low', 'scope-range', 'converter-codes']]);
    // Clamped symmetrically at ±2.5 V = ±128 codes of 19.53 mV, as an export that scales codes about zero gives.
    const sym = synthesize({ ...base, clip: { low: -2.5, high: 2.5 } }).values.map((v) => Math.round(v / (5 / 256)) * (5 / 256));
    expect(flatsOf(sym).map((t) => [t.side, t.cause])).toEqual([['high', 'scope-range'], ['low', 'scope-range']]);
    const y = synthesize({ ...base, clip: { low: -2.5, high: 2.5 } }).values;
    const stated = flatTops(y, { noise: noiseLevel(y), span: 5, fullScale: { low: -2.5, high: 2.5 } });
    expect(stated.every((t) => t.cause === 'scope-range' && t.fullScaleFrom === 'preamble')).toBe(true);
  });

  it('flatTops takes a level at, past or within 0.5 % of the span inside a stated edge for the scope, and one further inside for the circuit', () => {
    const stated = { low: -2.5, high: 2.5 };
    const causeAt = (high: number, fullScale = stated): string[] => {
      const y = synthesize({ ...base, clip: { low: -99, high } }).values;
      return flatTops(y, { noise: noiseLevel(y), span: 3 + high, fullScale }).map((t) => `${t.side} ${t.cause}`);
    };
    // 0.5 % of the 5 V span is 25 mV (the tolerance the rule states).
    expect(causeAt(2.5)).toEqual(['high scope-range']);
    expect(causeAt(2.48)).toEqual(['high scope-range']);
    expect(causeAt(2.56, { low: -2.5, high: 2.5 })).toEqual(['high scope-range']);
    expect(causeAt(2.4)).toEqual(['high circuit']);
  });

  it('flatTops does not flag quantised, unclipped triangles and sines whose peaks repeat a code', () => {
    fc.assert(
      fc.property(fc.constantFrom<'sine' | 'triangle'>('sine', 'triangle'), fc.integer({ min: 50, max: 4000 }), fc.double({ min: 0, max: 0.05, noNaN: true }), fc.integer({ min: 6, max: 16 }), fc.integer({ min: 1, max: 99 }), (shape, perPeriod, noise, bits, seed) => {
        const x = synthesize({ shape, frequency: 100, amplitude: 3, sampleRate: 100 * perPeriod * 1.013, samples: 20_000, bits, fullScale: 8, noise, seed }).values;
        expect(flatsOf(x), `${shape} at ${perPeriod} samples/period, ${bits} bits, noise ${noise}`).toEqual([]);
      }),
      { seed: 15, numRuns: 40 },
    );
  });

  it('flatTops does not take the flat states of a pulse with sharp or RC edges for flat tops', () => {
    const sharp = synthesize({ ...base, shape: 'pulse', amplitude: 5, duty: 0.3, bits: 8, fullScale: 40, noise: 0.012 }).values;
    expect(flatsOf(sharp)).toEqual([]);
    const rc = synthesize({ ...base, shape: 'pulse', amplitude: 5, sampleRate: 1e6, edge: { tau: 5e-6 } }).values;
    expect(flatsOf(rc)).toEqual([]);
  });

  it('flatTops leaves its input unmodified', () => {
    const x = synthesize({ ...base, clip: { low: -2, high: 2 } }).values;
    const copy = x.slice();
    flatsOf(x);
    expect(Array.from(x)).toEqual(Array.from(copy));
  });
});

describe('measureCapture on flat tops', () => {
  it('measureCapture keeps the values of a saturating triangle, with the flat top as a finding, and withholds those of a scope-clipped one', () => {
    const sat = measureCapture(captureOf([synthesize({ ...base, clip: { low: -99, high: 2.4 } })])).channels[0];
    expect(sat.flatTops).toMatchObject([{ side: 'high', cause: 'circuit' }]);
    expect(sat.warnings.map((w) => w.code)).toContain('saturated');
    expectWithin(sat.measurements.maximum?.value, 2.4, { abs: 1e-9 }, 'clip level');
    expectWithin(sat.measurements.riseSlope?.value, 4 * 3 * 261.63, { rel: 0.01 }, 'slope 4·A·f of the unsaturated ramp (REFERENCES §4)');
    const scope = measureCapture(captureOf([synthesize({ ...base, bits: 8, fullScale: 4.8 })])).channels[0];
    expect(scope.measurements.maximum?.reason).toBe('clipped');
    expect(scope.measurements.maximum?.note).toMatch(/volts per division/);
    expectWithin(scope.measurements.frequency?.value, 261.63, { rel: 1e-3 }, 'synthesised frequency; clipping leaves the crossings');
  });
});
