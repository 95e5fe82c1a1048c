import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import { expectWithin } from '../../helpers/expectWithin.js';
import { pulseAmplitude, seriesAmplitude, type SeriesShape } from './fourierSeries.js';

const SERIES = 'Fourier series (REFERENCES §4)';

function harmonicTable(shape: SeriesShape, opts: { frequency: number; sampleRate: number; samples: number; phase?: number }) {
  const sig = synthesize({ shape, amplitude: 1, bandLimited: true, ...opts });
  return analyzeSpectrum(sig.values, sig.dt, opts.frequency, shape);
}

describe('harmonics', () => {
  const cases: [string, { frequency: number; sampleRate: number; samples: number; phase?: number }][] = [
    ['a whole number of cycles', { frequency: 1000, sampleRate: 200_000, samples: 20_000 }],
    ['a non-integer number of cycles', { frequency: 1013.7, sampleRate: 200_000, samples: 20_000, phase: 0.37 }],
    ['only 3.4 cycles', { frequency: 1013.7, sampleRate: 200_000, samples: 671, phase: 0.11 }],
  ];
  for (const shape of ['triangle', 'square', 'sawtooth'] as const) {
    for (const [label, opts] of cases) {
      it(`harmonics gives every ${shape} harmonic to 50 within 0.1 % of the Fourier series with ${label}`, () => {
        const r = harmonicTable(shape, opts);
        expect(r.harmonics.length).toBe(50);
        for (const h of r.harmonics) {
          const ideal = seriesAmplitude(shape, h.n);
          if (ideal > 0) expectWithin(h.amplitude, ideal, { rel: 1e-3 }, `${SERIES}, n = ${h.n}`);
          else expect(h.dbc, `even harmonic ${h.n}`).toBeLessThan(-100);
          expectWithin(h.frequency, h.n * opts.frequency, { rel: 1e-12 }, 'n × fundamental (definition)');
        }
      });
    }
  }

  it('harmonics reads the published dBc levels of a square and a triangle (3rd and 5th)', () => {
    const sq = harmonicTable('square', { frequency: 1000, sampleRate: 100_000, samples: 10_000 });
    expectWithin(sq.harmonics[2].dbc, -9.542, { abs: 0.05 }, 'REFERENCES test case 4');
    expectWithin(sq.harmonics[4].dbc, -13.979, { abs: 0.05 }, 'REFERENCES test case 4');
    const tri = harmonicTable('triangle', { frequency: 1000, sampleRate: 100_000, samples: 10_000 });
    expectWithin(tri.harmonics[2].dbc, -19.085, { abs: 0.05 }, 'REFERENCES test case 5');
    expectWithin(tri.harmonics[4].dbc, -27.959, { abs: 0.05 }, 'REFERENCES test case 5');
    expectWithin(tri.harmonics[2].idealDbc, -19.085, { abs: 0.001 }, 'REFERENCES §4 triangle series');
    expect(tri.harmonics[1].idealDbc).toBeUndefined();
  });

  it('harmonics of a 0/1 V pulse at 25 % duty give c₁ 0.4502 and c₂ 0.3183, with c₄ below −80 dBc', () => {
    const sig = synthesize({ shape: 'pulse', frequency: 1000, amplitude: 0.5, duty: 0.25, sampleRate: 100_000, samples: 12_345, bandLimited: true, offset: -0.5 });
    const r = analyzeSpectrum(sig.values, sig.dt, 1000, 'pulse', { dutyCycle: 25 });
    expectWithin(r.harmonics[0].amplitude, 0.4502, { abs: 1e-4 }, 'REFERENCES test case 8');
    expectWithin(r.harmonics[1].amplitude, 0.3183, { abs: 1e-4 }, 'REFERENCES test case 8');
    expect(r.harmonics[3].dbc).toBeLessThan(-80);
    for (const h of r.harmonics) expectWithin(h.amplitude, pulseAmplitude(h.n, 1, 0.25), { abs: 1e-6 }, `pulse series, n = ${h.n}`);
  });

  it('harmonics stops below Nyquist and says how many it reports', () => {
    const r = harmonicTable('square', { frequency: 1000, sampleRate: 20_000, samples: 4000 });
    expect(r.harmonics.map((h) => h.n)).toEqual([1, 2, 3, 4, 5, 6, 7, 8, 9]);
    expect(r.harmonicsMethod).toMatch(/N = 9\b/);
    expect(r.harmonicsMethod).toMatch(/least-squares multi-harmonic fit at the measured fundamental 1000 Hz/);
  });

  it('harmonics dBc levels do not change with amplitude scale or DC offset', () => {
    const base = synthesize({ shape: 'triangle', frequency: 523.25, amplitude: 1, sampleRate: 50_000, samples: 5000, bandLimited: true });
    const ref = analyzeSpectrum(base.values, base.dt, 523.25, 'triangle').harmonics;
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e3, noNaN: true }), fc.double({ min: -20, max: 20, noNaN: true }), (k, dc) => {
        const moved = base.values.map((v) => k * v + dc);
        const r = analyzeSpectrum(moved, base.dt, 523.25, 'triangle').harmonics;
        for (let i = 0; i < 15; i += 2) {
          expectWithin(r[i].dbc, ref[i].dbc, { abs: 1e-6 }, 'invariance of a level ratio (closed form)');
          expectWithin(r[i].amplitude, k * ref[i].amplitude, { rel: 1e-6 }, 'linearity of the Fourier series');
        }
      }),
      { seed: 7, numRuns: 12 },
    );
  });
});
