import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { measureCapture, measureChannel } from '../../src/analysis/index.js';
import type { MeasurementId } from '../../src/types/index.js';
import type { SynthShape } from '../../src/syntheticCaptures/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf, sameSamples } from './captureOf.js';

// Invariances that follow from the definitions (closed form): a DC shift moves only the levels and
// the offset; a gain scales the levels and slopes; stretching time by k divides the frequency by k
// and multiplies the period and rise time by k; a time shift changes nothing.
const shapeArb = fc.constantFrom<SynthShape>('sine', 'triangle', 'square', 'pulse');
const signalArb = fc.record({
  shape: shapeArb,
  frequency: fc.double({ min: 200, max: 3000, noNaN: true }),
  phase: fc.double({ min: 0, max: 1, noNaN: true, maxExcluded: true }),
  seed: fc.integer({ min: 1, max: 1000 }),
});

/**
 * The time-domain measurements (measureChannel, which measureCapture reports as they are, finite
 * values only): every property below is about them, so the spectrum is not computed here. The last
 * test runs the whole of measureCapture.
 */
function measure(values: Float64Array, dt: number) {
  const a = measureChannel(values, dt, { unit: 'V' });
  const measurements: Partial<Record<MeasurementId, { value: number | null; uncertainty: number | null }>> = {};
  for (const [id, r] of Object.entries(a.results) as [MeasurementId, (typeof a.results)[MeasurementId]][]) {
    measurements[id] = r?.ok && Number.isFinite(r.value) ? { value: r.value, uncertainty: r.uncertainty } : { value: null, uncertainty: null };
  }
  return { shape: a.shape, measurements };
}

// 250 kS/s holds 6 to 90 cycles of 200 Hz to 3 kHz in 7 500 samples, with 83 or more samples per
// period and edges of τ = 2 samples: enough for every measurement below to be made, and the
// invariances hold at any size (they follow from the definitions).
const RATE = 250_000;
const SAMPLES = 7_500;
/** Samples dropped from the start (a sixth of the record) before the time-shift property cuts up to as many more. */
const LEAD = 1_250;

function base(p: { shape: SynthShape; frequency: number; phase: number; seed: number }) {
  return synthesize({ ...p, amplitude: 1, sampleRate: RATE, samples: SAMPLES, noise: 0.002, edge: { tau: 2 / RATE }, duty: p.shape === 'pulse' ? 0.3 : 0.5 });
}

const SHIFT_INVARIANT: MeasurementId[] = ['frequency', 'period', 'amplitude', 'peakToPeak', 'acRms', 'riseSlope', 'fallSlope', 'slopeRatio', 'dutyCycle', 'riseTime'];

describe('measurement properties', () => {
  it('measurements are unchanged by a DC shift except the levels, which move with it', () => {
    fc.assert(
      fc.property(signalArb, fc.double({ min: -5, max: 5, noNaN: true }), (p, shift) => {
        const s = base(p);
        const a = measure(s.values, s.dt);
        const b = measure(s.values.map((v) => v + shift), s.dt);
        expect(b.shape).toBe(a.shape);
        for (const id of SHIFT_INVARIANT) {
          const va = a.measurements[id]?.value;
          if (va == null) continue;
          expectWithin(b.measurements[id]?.value, va, { rel: 1e-6 }, `${id} does not depend on a DC shift (closed form)`);
        }
        expectWithin(b.measurements.dcOffset?.value, (a.measurements.dcOffset?.value ?? NaN) + shift, { abs: 1e-6 }, 'offset moves with the shift');
        expectWithin(b.measurements.highLevel?.value, (a.measurements.highLevel?.value ?? NaN) + shift, { abs: 1e-6 }, 'high level moves with the shift');
      }),
      { numRuns: 12 },
    );
  });

  it('levels and slopes scale with the amplitude, timing does not', () => {
    fc.assert(
      fc.property(signalArb, fc.double({ min: 0.01, max: 100, noNaN: true }), (p, gain) => {
        const s = base(p);
        const a = measure(s.values, s.dt);
        const b = measure(s.values.map((v) => v * gain), s.dt);
        for (const id of ['amplitude', 'highLevel', 'acRms', 'riseSlope'] as const) {
          const va = a.measurements[id]?.value;
          if (va == null) continue;
          expectWithin(b.measurements[id]?.value, va * gain, { rel: 1e-6 }, `${id} scales with the gain (closed form)`);
        }
        expectWithin(b.measurements.frequency?.value, a.measurements.frequency?.value ?? NaN, { rel: 1e-9 }, 'frequency does not depend on gain');
      }),
      { numRuns: 12 },
    );
  });

  it('frequency divides and period multiplies by k when time is stretched by k', () => {
    fc.assert(
      fc.property(signalArb, fc.double({ min: 1e-3, max: 1e3, noNaN: true }), (p, k) => {
        const s = base(p);
        const a = measure(s.values, s.dt);
        const b = measure(s.values, s.dt * k);
        expectWithin(b.measurements.frequency?.value, (a.measurements.frequency?.value ?? NaN) / k, { rel: 1e-9 }, 'f scales as 1/k (closed form)');
        expectWithin(b.measurements.period?.value, (a.measurements.period?.value ?? NaN) * k, { rel: 1e-9 }, 'T scales as k (closed form)');
        const ra = a.measurements.riseTime?.value;
        if (ra != null) expectWithin(b.measurements.riseTime?.value, ra * k, { rel: 1e-9 }, 'rise time scales as k (closed form)');
      }),
      { numRuns: 12 },
    );
  });

  it('frequency and amplitude do not depend on where the record starts in the cycle', () => {
    fc.assert(
      fc.property(signalArb, fc.integer({ min: 1, max: LEAD }), (p, cut) => {
        const s = base(p);
        const a = measure(s.values.subarray(LEAD), s.dt);
        const b = measure(s.values.subarray(LEAD - cut, s.values.length - cut), s.dt);
        const fa = a.measurements.frequency;
        expectWithin(b.measurements.frequency?.value, p.frequency, { abs: 3 * Math.hypot(fa?.uncertainty ?? 0, b.measurements.frequency?.uncertainty ?? 0) + p.frequency * 1e-6 }, 'synthesized frequency within the stated uncertainties');
        expectWithin(b.measurements.amplitude?.value, a.measurements.amplitude?.value ?? NaN, { rel: 0.01 }, 'amplitude does not depend on a time shift');
      }),
      { numRuns: 12 },
    );
  });

  it('measureCapture never modifies the samples it is given', () => {
    fc.assert(
      fc.property(signalArb, (p) => {
        const s = base(p);
        const copy = Float64Array.from(s.values);
        measureCapture(captureOf([s]), { plotData: true });
        expect(sameSamples(s.values, copy)).toBe(true);
      }),
      { numRuns: 8 },
    );
  });
});
