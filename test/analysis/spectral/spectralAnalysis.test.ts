import { describe, expect, it } from 'vitest';
import { synthesize } from '../../../src/syntheticCaptures/index.js';
import { analyzeSpectrum } from '../../../src/analysis/spectrum/spectralAnalysis.js';
import { expectWithin } from '../../helpers/expectWithin.js';

const tri = synthesize({ shape: 'triangle', frequency: 1000, amplitude: 3, sampleRate: 100_000, samples: 10_000, bandLimited: true, noise: 1e-3, seed: 21 });
const HARMONIC_SET = ['thd', 'snr', 'sfdr', 'shapeError', 'evenOddRatio'] as const;

describe('analyzeSpectrum withholding', () => {
  it('analyzeSpectrum withholds the harmonic set as too-few-cycles when no fundamental was measured', () => {
    const r = analyzeSpectrum(tri.values, tri.dt, null, 'triangle');
    for (const id of HARMONIC_SET) expect(r.measurements[id], id).toMatchObject({ ok: false, reason: 'too-few-cycles' });
    expect(r.harmonics).toEqual([]);
    expect(r.harmonicsMethod).toMatch(/^not measured: the fundamental frequency was not measured/);
  });

  it('analyzeSpectrum withholds THD and harmonic levels of a clipped channel but still gives SNR', () => {
    const r = analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle', { clipped: true });
    for (const id of ['thd', 'sfdr', 'shapeError', 'evenOddRatio'] as const) expect(r.measurements[id], id).toMatchObject({ ok: false, reason: 'clipped' });
    expect(r.harmonics).toEqual([]);
    expect(r.harmonicsMethod).toMatch(/^withheld: the channel is clipped/);
    expect(r.measurements.snr?.ok).toBe(true);
  });

  it('analyzeSpectrum withholds everything as too-few-samples below 64 samples', () => {
    const r = analyzeSpectrum(tri.values.subarray(0, 40), tri.dt, 1000, 'triangle');
    for (const id of [...HARMONIC_SET, 'humFrequency', 'humLevel'] as const) expect(r.measurements[id], id).toMatchObject({ ok: false, reason: 'too-few-samples' });
  });

  it('analyzeSpectrum withholds everything as invalid-samples when a sample is not finite, naming it', () => {
    const bad = Float64Array.from(tri.values);
    bad[77] = Number.NaN;
    const r = analyzeSpectrum(bad, tri.dt, 1000, 'triangle');
    expect(r.measurements.thd).toMatchObject({ ok: false, reason: 'invalid-samples', detail: 'sample 77 is NaN' });
  });

  it('analyzeSpectrum withholds harmonics as too-few-cycles when the record holds under 3 cycles', () => {
    const r = analyzeSpectrum(tri.values.subarray(0, 250), tri.dt, 1000, 'triangle');
    expect(r.measurements.thd).toMatchObject({ ok: false, reason: 'too-few-cycles' });
    expect(r.harmonicsMethod).toMatch(/2\.50 cycles/);
  });

  it('analyzeSpectrum withholds harmonics as aliasing when the fundamental is at or above Nyquist', () => {
    expect(analyzeSpectrum(tri.values, tri.dt, 60_000, 'triangle').measurements.thd).toMatchObject({ ok: false, reason: 'aliasing' });
  });

  it('analyzeSpectrum withholds THD as aliasing when the 2nd harmonic is above Nyquist', () => {
    const sine = synthesize({ shape: 'sine', frequency: 30_000, amplitude: 1, sampleRate: 100_000, samples: 10_000 });
    const r = analyzeSpectrum(sine.values, sine.dt, 30_000, 'sine');
    expect(r.measurements.thd).toMatchObject({ ok: false, reason: 'aliasing' });
    expect(r.harmonics.map((h) => h.n)).toEqual([1]);
  });

  it('analyzeSpectrum refuses the fit as fit-failed when the given fundamental is 2 % off', () => {
    const r = analyzeSpectrum(tri.values, tri.dt, 1020, 'triangle');
    expect(r.measurements.thd).toMatchObject({ ok: false, reason: 'fit-failed' });
  });

  it('analyzeSpectrum leaves its input unmodified', () => {
    const copy = Float64Array.from(tri.values);
    analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle', { plot: true });
    expect(tri.values).toEqual(copy);
  });

  it('analyzeSpectrum throws RangeError on a bad sample interval or harmonic count, quoting it', () => {
    expect(() => analyzeSpectrum(tri.values, 0, 1000, 'triangle')).toThrow(/dt must be a positive finite number, got 0/);
    expect(() => analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle', { maxHarmonic: 2.5 })).toThrow(RangeError);
  });

  it('analyzeSpectrum gives SINAD and ENOB for a sine only', () => {
    const sine = synthesize({ shape: 'sine', frequency: 1000, amplitude: 1, sampleRate: 100_000, samples: 10_000, noise: 1e-3 });
    const r = analyzeSpectrum(sine.values, sine.dt, 1000, 'sine');
    expect(r.measurements.sinad?.ok).toBe(true);
    expect(r.measurements.enob?.ok).toBe(true);
    expect(analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle').measurements.sinad).toBeUndefined();
  });

  it('every reported value is finite and carries a unit, an uncertainty and a method', () => {
    const r = analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle', { plot: true });
    for (const [id, m] of Object.entries(r.measurements)) {
      if (!m.ok) continue;
      expect(Number.isFinite(m.value), id).toBe(true);
      expect(m.uncertainty === null || Number.isFinite(m.uncertainty), id).toBe(true);
      expect(m.method.length, id).toBeGreaterThan(10);
    }
    expect(JSON.parse(JSON.stringify(r))).toEqual(r);
  });
});

describe('spectrum plot', () => {
  it('spectrum plot holds at most 2000 points up to 20 × the fundamental with the fundamental at 0 dBc', () => {
    const r = analyzeSpectrum(tri.values, tri.dt, 1000, 'triangle', { plot: true });
    const s = r.spectrum;
    expect(s).toBeDefined();
    if (!s) return;
    expect(s.dbc.length).toBeLessThanOrEqual(2000);
    expectWithin(s.dbc.length * s.binWidth, 20_000, { rel: 0.01 }, '20 × fundamental (our plot span)');
    const at1k = Math.round(1000 / s.binWidth);
    expectWithin(Math.max(...s.dbc.slice(at1k - 1, at1k + 2)), 0, { abs: 0.05 }, 'fundamental is the dBc reference (definition)');
    const at3k = Math.round(3000 / s.binWidth);
    expectWithin(Math.max(...s.dbc.slice(at3k - 1, at3k + 2)), -19.085, { abs: 0.9 }, 'triangle 3rd harmonic, REFERENCES §4, within the 0.83 dB scallop loss');
    expect(s.window).toMatch(/Blackman-Harris/);
    expect(s.reference).toBe('fundamental');
  });

  it('spectrum plot of a long record keeps to 2000 points by a peak hold', () => {
    const long = synthesize({ shape: 'sine', frequency: 50, amplitude: 1, sampleRate: 100_000, samples: 200_000 });
    const s = analyzeSpectrum(long.values, long.dt, null, 'unknown', { plot: true }).spectrum;
    expect(s?.dbc.length).toBeLessThanOrEqual(2000);
    expect(s?.reference).toBe('largest component');
    expectWithin(Math.max(...(s?.dbc ?? [])), 0, { abs: 0.01 }, 'largest component is the reference (definition)');
  });
});
