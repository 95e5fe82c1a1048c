import { describe, expect, it } from 'vitest';
import { measureCapture } from '../../src/analysis/index.js';
import type { SynthSpec } from '../../src/syntheticCaptures/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import { expectWithin } from '../helpers/expectWithin.js';
import { captureOf } from './captureOf.js';

const measure = (spec: SynthSpec) => measureCapture(captureOf([synthesize(spec)])).channels[0];

describe('transitions of squares and pulses', () => {
  for (const samplesPerTau of [10, 25]) {
    it(`riseTime of an RC edge is τ·ln 9 within 2 % when the edge spans ${Math.round(samplesPerTau * Math.log(9))} samples`, () => {
      const tau = 10e-6;
      const ch = measure({ shape: 'pulse', frequency: 1000, amplitude: 0.5, duty: 0.5, sampleRate: samplesPerTau / tau, samples: Math.round(12e-3 * (samplesPerTau / tau)), edge: { tau }, noise: 0.001, seed: 5 });
      expectWithin(ch.measurements.riseTime?.value, tau * Math.log(9), { rel: 0.02 }, 'REFERENCES.md §5: 10–90 % rise of a first-order RC = τ·ln 9');
      expectWithin(ch.measurements.fallTime?.value, tau * Math.log(9), { rel: 0.02 }, 'REFERENCES.md test case 9: same fall time');
      expectWithin(ch.measurements.overshoot?.value, 0, { abs: 0.5 }, 'REFERENCES.md test case 9: overshoot 0 %');
    });
  }

  it('riseTime is withheld when the edge spans fewer than 5 samples', () => {
    const ch = measure({ shape: 'square', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 10_000, edge: { tau: 1e-6 } });
    expect(ch.measurements.riseTime?.value).toBeNull();
    expect(ch.measurements.riseTime?.reason).toBe('edge-too-fast');
    expect(ch.measurements.riseTime?.note).toMatch(/^sample rate too low for this edge/);
  });

  it('overshoot of a ζ = 0.5 step is 16.30 % and its ring-back 2.66 % (REFERENCES.md test case 10)', () => {
    const ch = measure({ shape: 'pulse', frequency: 1000, amplitude: 0.5, sampleRate: 20_000_000, samples: 100_000, edge: { zeta: 0.5, omegaN: 2 * Math.PI * 100_000 }, noise: 0.0005, seed: 8 });
    expect(ch.shape).toBe('square');
    expectWithin(ch.measurements.overshoot?.value, 16.3, { abs: 0.3 }, 'REFERENCES.md §5: exp(−πζ/√(1−ζ²)) = 16.30 %');
    // Second extremum of the underdamped step: exp(−2πζ/√(1−ζ²)) (Ogata §5-3, closed form; from memory).
    expectWithin(ch.measurements.undershoot?.value, 100 * Math.exp((-2 * Math.PI * 0.5) / Math.sqrt(0.75)), { abs: 0.3 }, 'Ogata §5-3 second peak (from memory)');
    expectWithin(ch.measurements.highLevel?.value, 1, { abs: 0.005 }, 'REFERENCES.md test case 10: high level 1.000 ± 0.5 % of A');
    expectWithin(ch.measurements.lowLevel?.value, 0, { abs: 0.005 }, 'REFERENCES.md test case 10: low level 0.000 ± 0.5 % of A');
  });

  it('dutyCycle of a 25 % pulse is 25.0 % and the shape is pulse (REFERENCES.md test case 8)', () => {
    const ch = measure({ shape: 'pulse', frequency: 1000, amplitude: 0.5, duty: 0.25, sampleRate: 1_000_000, samples: 20_000, phase: 0.4 });
    expect(ch.shape).toBe('pulse');
    expectWithin(ch.measurements.dutyCycle?.value, 25, { abs: 0.1 }, 'REFERENCES.md test case 8: duty 25.0 % ± 0.1 %');
    expectWithin(ch.measurements.dcOffset?.value, 0.25, { abs: 0.001 }, 'REFERENCES.md test case 8: DC 0.250');
    expectWithin(ch.measurements.rms?.value, 0.5, { abs: 0.001 }, 'REFERENCES.md test case 8: RMS 0.500');
    expectWithin(ch.measurements.acRms?.value, 0.433, { abs: 0.001 }, 'REFERENCES.md test case 8: AC RMS 0.4330');
  });

  it('dutyCycle of a square is 50.0 % (REFERENCES.md test case 4)', () => {
    const ch = measure({ shape: 'square', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 20_000, phase: 0.37 });
    expect(ch.shape).toBe('square');
    expectWithin(ch.measurements.dutyCycle?.value, 50, { abs: 0.1 }, 'REFERENCES.md test case 4: duty 50.0 % ± 0.1 %');
    expectWithin(ch.measurements.rms?.value, 1, { rel: 1e-3 }, 'REFERENCES.md §4: square rms = A');
  });

  it('transition measurements of a sine or triangle are absent, not withheld', () => {
    const ch = measure({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 1_000_000, samples: 20_000 });
    for (const id of ['riseTime', 'fallTime', 'dutyCycle', 'overshoot', 'undershoot', 'riseSlope'] as const) expect(ch.measurements[id], id).toBeUndefined();
  });
});
