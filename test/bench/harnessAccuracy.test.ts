import { describe, expect, it } from 'vitest';
import { compareAccuracy, genCaptureTruth, rank, triangleHarmonic, triangleThdPercent } from '../../bench/lib/accuracy.js';
import { expectWithin } from '../helpers/expectWithin.js';

const REF4 = '../shared/REFERENCES.md §4';

describe('true values of the gen_capture.py benchmark file', () => {
  it('triangleHarmonic gives the symmetric triangle series 8A/(π²n²) for odd n and nothing for even n when r = ½', () => {
    expectWithin(triangleHarmonic(1, 1, 0.5), 0.81057, { rel: 1e-5 }, `${REF4} harmonic table (Smyth, UCSD)`);
    expectWithin(triangleHarmonic(3, 1, 0.5), 0.09006, { rel: 1e-4 }, `${REF4} harmonic table (Smyth, UCSD)`);
    expectWithin(triangleHarmonic(5, 1, 0.5), 0.03242, { rel: 2e-4 }, `${REF4} harmonic table (Smyth, UCSD)`);
    expectWithin(triangleHarmonic(2, 1, 0.5), 0, { abs: 1e-15 }, `${REF4}: odd harmonics only`);
  });

  it('triangleHarmonic tends to the sawtooth series 2A/(πn) when the rise takes almost the whole period', () => {
    for (const n of [1, 2, 3]) {
      expectWithin(triangleHarmonic(n, 1, 1 - 1e-7), 2 / (Math.PI * n), { rel: 1e-5 }, `${REF4} sawtooth series (Smyth, UCSD)`);
    }
  });

  it('triangleThdPercent gives the truncated triangle THD of the reference table for harmonics 2–10 and 2–50', () => {
    expectWithin(triangleThdPercent(10, 0.5), 12.048, { abs: 0.001 }, `${REF4} truncated THD, H = 10`);
    expectWithin(triangleThdPercent(50, 0.5), 12.115, { abs: 0.001 }, `${REF4} truncated THD, H = 50`);
  });

  it('genCaptureTruth gives slopes 2A/(rT) and 2A/((1−r)T) and their ratio (1−r)/r for the 55 % rise', () => {
    const t = genCaptureTruth().ch1;
    expectWithin(t.riseSlope, 10 / 0.55e-3, { rel: 1e-12 }, `${REF4} slopes, A = 5 V, T = 1 ms, r = 0.55`);
    expectWithin(t.fallSlope, 10 / 0.45e-3, { rel: 1e-12 }, `${REF4} slopes`);
    expectWithin(t.slopeRatio, 0.45 / 0.55, { rel: 1e-12 }, `${REF4} slopes`);
  });
});

describe('ranking the two tools', () => {
  it('rank calls benchproof better, equal, a tie below 0.01 %, or worse by relative error', () => {
    expect(rank(1e-3, 2e-3)).toBe('better');
    expect(rank(2e-3, 2e-3)).toBe('equal');
    expect(rank(5e-5, 1e-5)).toBe('tie');
    expect(rank(5e-3, 1e-3)).toBe('worse');
    expect(rank(null, 1e-3)).toBe('missing');
    expect(rank(1e-3, null)).toBe('better');
  });

  it('compareAccuracy counts a withheld benchproof value as not at least as accurate', () => {
    const peer = { ch1: { frequency: 1000.1, peakToPeak: 10, dcOffset: 0.1 }, ch2: { frequency: 1000, peakToPeak: 5, dcOffset: 2.75 } };
    const bp = { ch1: { frequency: null, peakToPeak: 10, dcOffset: 0.1 }, ch2: { frequency: 1000, peakToPeak: 5, dcOffset: 2.75 } };
    const rows = compareAccuracy(bp, peer);
    const f = rows.find((r) => r.channel === 'ch1' && r.quantity === 'frequency');
    expect(f?.atLeastAsAccurate).toBe(false);
    expect(rows.find((r) => r.channel === 'ch2' && r.quantity === 'dcOffset')?.verdict).toBe('equal');
  });
});
