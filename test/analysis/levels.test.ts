import { describe, expect, it } from 'vitest';
import { measureCapture } from '../../src/analysis/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf } from './captureOf.js';

const measure = (spec: SynthSpec) => measureCapture(captureOf([synthesize(spec)])).channels[0];
const base = { frequency: 1000, sampleRate: 1_000_000, samples: 100_500, phase: 0.13 } as const;

describe('levels, DC offset and rms over whole cycles', () => {
  it('sine basics match REFERENCES.md test case 3 (A = 1 V, offset 0.5 V, 100 cycles)', () => {
    const ch = measure({ ...base, shape: 'sine', amplitude: 1, offset: 0.5 });
    expect(ch.shape).toBe('sine');
    expectWithin(ch.measurements.peakToPeak?.value, 2, { abs: 1e-6 }, 'REFERENCES.md test case 3: Vpp 2.000 V');
    expectWithin(ch.measurements.dcOffset?.value, 0.5, { abs: 1e-6 }, 'REFERENCES.md test case 3: mean 0.500 V');
    expectWithin(ch.measurements.rms?.value, Math.sqrt(0.25 + 0.5), { abs: 1e-6 }, 'REFERENCES.md test case 3: total rms 0.86603 V');
    expectWithin(ch.measurements.acRms?.value, Math.SQRT1_2, { abs: 1e-6 }, 'REFERENCES.md §4: sine rms A/√2');
    expectWithin(ch.measurements.frequency?.value, 1000, { rel: 1e-4 }, 'REFERENCES.md test case 3: 1000.000 Hz ± 0.01 %');
    expectWithin(ch.measurements.highLevel?.value, 1.5, { abs: 1e-6 }, 'peak of the sine, offset + A (closed form)');
    expectWithin(ch.measurements.amplitude?.value, 2, { abs: 1e-6 }, 'IEEE 181 amplitude = high − low = 2A (closed form)');
  });

  it('triangle rms is A/√3 and DC offset follows the offset (REFERENCES.md §4)', () => {
    const ch = measure({ ...base, shape: 'triangle', amplitude: 3, offset: -0.25 });
    expectWithin(ch.measurements.acRms?.value, 3 / Math.sqrt(3), { rel: 1e-4 }, 'REFERENCES.md §4: triangle rms A/√3');
    expectWithin(ch.measurements.dcOffset?.value, -0.25, { abs: 1e-4 }, 'synthesized offset');
    expectWithin(ch.measurements.highLevel?.value, 2.75, { abs: 1e-3 }, 'offset + A');
    expectWithin(ch.measurements.lowLevel?.value, -3.25, { abs: 1e-3 }, 'offset − A');
  });

  it('square rms is A (REFERENCES.md §4)', () => {
    const ch = measure({ ...base, shape: 'square', amplitude: 2 });
    expectWithin(ch.measurements.rms?.value, 2, { rel: 1e-4 }, 'REFERENCES.md §4: square rms A');
    expectWithin(ch.measurements.dcOffset?.value, 0, { abs: 1e-3 }, 'square of zero mean');
  });

  it('DC offset over whole cycles is not biased by a partial last cycle', () => {
    // 10.5 cycles of a triangle with zero mean: the whole-record mean would be off by about A/20.
    const ch = measure({ shape: 'triangle', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 10_500, phase: 0 });
    expectWithin(ch.measurements.dcOffset?.value, 0, { abs: 2e-4 }, 'zero-mean triangle (closed form) over whole cycles');
  });

  it('state levels are withheld and raw extremes kept out when the channel is clipped at the full scale the capture states', () => {
    const s = synthesize({ ...base, shape: 'square', amplitude: 1, clip: { low: -0.5, high: 2 } });
    const ch = measureCapture(captureOf([s], [{ fullScale: { low: -0.5, high: 2 } }])).channels[0];
    for (const id of ['maximum', 'minimum', 'peakToPeak', 'lowLevel', 'amplitude', 'dcOffset', 'rms'] as const) {
      expect(ch.measurements[id]?.reason, id).toBe('clipped');
      expect(ch.measurements[id]?.note, id).toMatch(/clipped/);
    }
    expectWithin(ch.measurements.dutyCycle?.value, 50, { abs: 0.1 }, 'clipping does not move the mid-reference crossings of fast edges');
  });

  it('a flat channel reports no signal and keeps its DC level', () => {
    const s = synthesize({ ...base, shape: 'sine', amplitude: 0, offset: 1.2, noise: 0.001, seed: 2 });
    const ch = measureCapture(captureOf([s])).channels[0];
    expect(ch.shape).toBe('unknown');
    expect(ch.measurements.frequency?.reason).toBe('no-signal');
    expectWithin(ch.measurements.dcOffset?.value, 1.2, { abs: 1e-4 }, 'synthesized DC level');
  });
});
