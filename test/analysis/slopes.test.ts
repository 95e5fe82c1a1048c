import { describe, expect, it } from 'vitest';
import { measureCapture } from '../../src/analysis/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf } from './captureOf.js';

const measure = (spec: SynthSpec) => measureCapture(captureOf([synthesize(spec)])).channels[0];
const kestrel = { shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 200_000, samples: 40_000, phase: 0.21 } as const;

describe('ramp slopes of triangles and sawtooths', () => {
  it('riseSlope and fallSlope of a symmetric triangle equal 4·A·f (REFERENCES.md §4 Slopes)', () => {
    const ch = measure({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 30_000 });
    expectWithin(ch.measurements.riseSlope?.value, 4000, { rel: 0.005 }, 'REFERENCES.md test case 5: +4.000 V/ms ± 0.5 %');
    expectWithin(ch.measurements.fallSlope?.value, 4000, { rel: 0.005 }, 'REFERENCES.md test case 5: −4.000 V/ms (magnitude) ± 0.5 %');
    expectWithin(ch.measurements.slopeRatio?.value, 1, { rel: 0.002 }, 'REFERENCES.md test case 5: ratio 1.000');
    expectWithin(ch.measurements.symmetry?.value, 50, { abs: 0.1 }, 'symmetric triangle rises half the period (closed form)');
  });

  it('slopes of the r = 0.8 triangle are +2.5 and −10 V/ms (REFERENCES.md §4 Slopes)', () => {
    const ch = measure({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 30_000, riseFraction: 0.8 });
    expectWithin(ch.measurements.riseSlope?.value, 2500, { rel: 0.005 }, 'REFERENCES.md §4: 2A/(rT) = 2.5 V/ms');
    expectWithin(ch.measurements.fallSlope?.value, 10_000, { rel: 0.005 }, 'REFERENCES.md §4: 2A/((1−r)T) = 10 V/ms');
    expectWithin(ch.measurements.symmetry?.value, 80, { abs: 0.2 }, 'rise share r = 80 % (closed form)');
  });

  for (const r of [0.5, 0.48, 0.45, 0.4, 0.3]) {
    it(`slopeRatio of a triangle with rise share ${r} is within 0.2 % of (1 − r)/r with noise and 8-bit quantisation`, () => {
      const ch = measure({ ...kestrel, riseFraction: r, noise: 0.01, bits: 8, fullScale: 8, seed: Math.round(r * 100) });
      expect(ch.shape).toBe('triangle');
      expectWithin(ch.measurements.slopeRatio?.value, (1 - r) / r, { rel: 0.002 }, 'REFERENCES.md §4 Slopes: ratio (1 − r)/r');
    });
  }

  it('linearity of straight ramps is near zero and grows for exponential ramps', () => {
    const straight = measure({ ...kestrel, noise: 0.005, seed: 4 });
    expect(straight.measurements.linearity?.value).toBeLessThan(0.05);
    // Exponential charge toward ±(A + V) from a resistor-fed integrator: v(t) = −A + (2A)(1 − e^{−t/τ})/(1 − e^{−T/2τ}).
    const T = 1 / 261.63;
    const tau = T / 2;
    const fs = 200_000;
    const values = new Float64Array(40_000);
    const norm = 1 - Math.exp(-T / 2 / tau);
    for (let i = 0; i < values.length; i++) {
      const p = ((i / fs) % T) / (T / 2);
      const half = p < 1 ? p : p - 1;
      const rise = (1 - Math.exp((-half * T) / 2 / tau)) / norm;
      values[i] = p < 1 ? -3 + 6 * rise : 3 - 6 * rise;
    }
    const bowed = measureCapture(captureOf([{ t0: 0, dt: 1 / fs, values }])).channels[0];
    // Over the 20–80 % part the exponential bows by about 1 % of the swing (computed numerically from the formula above).
    expect(bowed.measurements.linearity?.value).toBeGreaterThan(0.5);
  });

  it('a rising sawtooth reports only its slow ramp and the reset edge', () => {
    const ch = measure({ shape: 'sawtooth', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 30_000, noise: 0.002, seed: 2 });
    expect(ch.shape).toBe('sawtooth');
    expectWithin(ch.measurements.riseSlope?.value, 2000, { rel: 0.005 }, 'sawtooth slope 2A/T (closed form)');
    expect(ch.measurements.fallSlope).toBeUndefined();
    expect(ch.measurements.slopeRatio).toBeUndefined();
    expect(ch.measurements.symmetry).toBeUndefined();
    expect(ch.measurements.fallTime?.reason).toBe('edge-too-fast');
  });

  it('slopes are withheld when the triangle is clipped at the full scale the capture states', () => {
    const s = synthesize({ ...kestrel, clip: { low: -2.5, high: 2.5 } });
    const ch = measureCapture(captureOf([s], [{ fullScale: { low: -2.5, high: 2.5 } }])).channels[0];
    for (const id of ['riseSlope', 'fallSlope', 'slopeRatio', 'linearity', 'highLevel', 'amplitude'] as const) {
      expect(ch.measurements[id]?.value, id).toBeNull();
      expect(ch.measurements[id]?.reason, id).toBe('clipped');
    }
    expectWithin(ch.measurements.frequency?.value, 261.63, { rel: 1e-4 }, 'clipping leaves the crossings, so the synthesized frequency stands');
  });
});
