import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { trackingFit } from '../../src/analysis/index.js';
import type { TrackingPoint } from '../../src/analysis/index.js';
import { expectWithin } from '../helpers/expectWithin.js';

// A VCO whose law is exactly f = f0·2^(k·V): the fit must give k and log2 f0 back exactly
// (closed form). 65.41 Hz at 0 V is the demo's reference (invented, demo only).
const lawPoints = (k: number, f0: number, controls: readonly number[], u: number | null = null): TrackingPoint[] =>
  controls.map((c) => ({ control: c, frequency: f0 * 2 ** (k * c), uncertainty: u === null ? null : u * f0 * 2 ** (k * c) }));

describe('trackingFit', () => {
  it('trackingFit recovers the scale and offset of an exact exponential law', () => {
    const fit = trackingFit(lawPoints(0.987, 65.41 * 2 ** (-12 / 1200), [0, 1, 2, 3, 4, 5]), 'exponential');
    expectWithin(fit.slope, 0.987, { abs: 1e-12 }, 'closed form: the data lie on the law');
    expectWithin(1200 * (fit.intercept - Math.log2(65.41)), -12, { abs: 1e-9 }, 'closed form: −12 cents at 0 V');
    for (const d of fit.deviations) expectWithin(d, 0, { abs: 1e-9 }, 'closed form: no deviation from an exact law');
  });

  it('trackingFit gives the intercept at the origin it is asked for', () => {
    const fit = trackingFit(lawPoints(1, 65.41, [0, 1, 2, 3]), 'exponential', { origin: 2 });
    expectWithin(2 ** fit.intercept, 261.64, { rel: 1e-12 }, 'closed form: 65.41·2² at 2 V');
  });

  it('trackingFit recovers slope and intercept of a linear law in Hz', () => {
    const points = [0, 1, 2, 3].map((c) => ({ control: c, frequency: 100 + 250 * c, uncertainty: 0.5 }));
    const fit = trackingFit(points, 'linear');
    expectWithin(fit.slope, 250, { rel: 1e-12 }, 'closed form');
    expectWithin(fit.intercept, 100, { rel: 1e-12 }, 'closed form');
  });

  it('trackingFit gives var b = σ²/Σ(x − x̄)² when every point has the same σ', () => {
    const controls = [0, 1, 2, 3, 4, 5];
    const sigma = 0.2;
    const points = controls.map((c) => ({ control: c, frequency: 100 + 10 * c, uncertainty: sigma }));
    const fit = trackingFit(points, 'linear');
    const mean = controls.reduce((a, b) => a + b, 0) / controls.length;
    const sxx = controls.reduce((a, c) => a + (c - mean) ** 2, 0);
    expectWithin(fit.slopeUncertainty, sigma / Math.sqrt(sxx), { rel: 1e-12 }, 'textbook straight-line fit, equal σ (Bevington & Robinson ch. 6, from memory)');
    expectWithin(fit.interceptUncertainty, sigma * Math.sqrt(1 / controls.length + mean ** 2 / sxx), { rel: 1e-12 }, 'same source: var a = σ²(1/n + x̄²/Sxx)');
  });

  it('trackingFit reports the deviation of a point off the law in cents', () => {
    const points = lawPoints(1, 65.41, [0, 1, 2, 3, 4]);
    const bent = points.map((p, i) => (i === 2 ? { ...p, frequency: p.frequency * 2 ** (6 / 1200) } : p));
    const fit = trackingFit(bent, 'exponential');
    // Least squares spreads the 6-cent bump: the point keeps 6·(1 − 1/5 − 0) = 4.8 cents (x at the mean).
    expectWithin(fit.deviations[2], 4.8, { abs: 1e-9 }, 'closed form: leverage of the middle point is 1/n');
  });

  it('trackingFit carries no parameter uncertainty when a step lacks one', () => {
    const points = lawPoints(1, 65.41, [0, 1, 2], 1e-5).map((p, i) => (i === 1 ? { ...p, uncertainty: null } : p));
    const fit = trackingFit(points, 'exponential');
    expect(fit.slopeUncertainty).toBeNull();
    expect(fit.method).toMatch(/unweighted/);
  });

  it('trackingFit refuses fewer than two distinct controls and non-positive frequencies', () => {
    expect(() => trackingFit(lawPoints(1, 65.41, [2, 2]), 'exponential')).toThrow(RangeError);
    expect(() => trackingFit([{ control: 0, frequency: -1, uncertainty: null }, { control: 1, frequency: 2, uncertainty: null }], 'exponential')).toThrow(/-1/);
  });

  it('trackingFit leaves its input unchanged', () => {
    const points = lawPoints(1, 65.41, [0, 1, 2]);
    const copy = JSON.parse(JSON.stringify(points)) as unknown;
    trackingFit(points, 'exponential');
    expect(points).toEqual(copy);
  });

  it('trackingFit scale does not change when every frequency is multiplied by one factor (property)', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.5, max: 2, noNaN: true }), fc.double({ min: 0.1, max: 10, noNaN: true }), (k, factor) => {
        const a = trackingFit(lawPoints(k, 50, [0, 1, 2, 3]), 'exponential');
        const b = trackingFit(lawPoints(k, 50 * factor, [0, 1, 2, 3]), 'exponential');
        expect(Math.abs(a.slope - b.slope)).toBeLessThan(1e-9);
        expect(Math.abs(b.intercept - a.intercept - Math.log2(factor))).toBeLessThan(1e-9);
      }),
    );
  });
});
