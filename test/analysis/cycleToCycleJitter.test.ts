/**
 * Cycle-to-cycle jitter (RMS of adjacent-period differences, JEDEC JESD65B's definition as commonly
 * computed; from memory) against closed forms, on crossing trains built here:
 * - independent Gaussian period perturbations σ (edge times a random walk): period jitter σ,
 *   cycle-to-cycle √2·σ (difference of two independent values);
 * - independent Gaussian edge-time perturbations σₑ on an ideal clock: periods Tₖ = T + eₖ₊₁ − eₖ,
 *   period jitter √2·σₑ, cycle-to-cycle eₖ₊₂ − 2eₖ₊₁ + eₖ, √(1 + 4 + 1)·σₑ = √6·σₑ;
 * - periods alternating T ± a: every adjacent difference is ±2a, so exactly 2a; a linear chirp
 *   Tₖ = T + k·b: exactly b.
 * Statistical tolerances are 4 standard errors of an RMS over m values (s/√m, the bound the method
 * states), so a seeded run fails only if the method is wrong.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { cycleToCycleJitter } from '../../src/analysis/timing/cycleToCycleJitter.js';
import { jitter } from '../../src/analysis/timing/jitter.js';
import type { Crossings } from '../../src/analysis/timing/midCrossings.js';
import { periodFit } from '../../src/analysis/timing/periodFit.js';
import { measureCapture } from '../../src/analysis/index.js';
import { createRandom, synthesize } from '../../src/syntheticCaptures/index.js';
import { captureOf } from './captureOf.js';
import { expectWithin } from '../helpers/expectWithin.js';

const T = 400; // samples per period
const SPAN = 6;
/** A crossing step of 1e-6 of the span: the capture's timing floor is negligible. */
const STEP = 1e-6 * SPAN;

function crossingsAt(rising: readonly number[]): Crossings {
  return { rising, falling: [], risingSteps: rising.map(() => STEP), fallingSteps: [] };
}

function both(rising: readonly number[], dt = 1) {
  const c = crossingsAt(rising);
  const fit = periodFit(c, SPAN);
  return { c2c: cycleToCycleJitter(fit, c, 0, SPAN, dt), period: jitter(fit, c, 0, SPAN, dt) };
}

function fromPeriods(periods: readonly number[], start = 10): number[] {
  const t = [start];
  for (const p of periods) t.push(t[t.length - 1] + p);
  return t;
}

describe('cycleToCycleJitter', () => {
  it('gives √2·σ for independent period perturbations σ, where period jitter gives σ', () => {
    const rnd = createRandom(22);
    const sigma = 0.8;
    const n = 3000;
    const { c2c, period } = both(fromPeriods(Array.from({ length: n }, () => T + sigma * rnd.gaussian())));
    expect(c2c.ok && period.ok).toBe(true);
    if (!c2c.ok || !period.ok) return;
    expectWithin(c2c.value, Math.SQRT2 * sigma, { rel: 4 / Math.sqrt(n - 1) }, 'closed form √2·σ for independent periods');
    expectWithin(period.value, sigma, { rel: 4 / Math.sqrt(2 * (n - 1)) }, 'closed form σ');
    expect(c2c.uncertainty).toBeGreaterThan(0);
  });

  it('gives √6·σₑ for independent edge-time perturbations σₑ, where period jitter gives √2·σₑ', () => {
    const rnd = createRandom(23);
    const sigmaE = 0.5;
    const n = 3000;
    const edges = Array.from({ length: n + 1 }, (_, k) => 10 + k * T + sigmaE * rnd.gaussian());
    const { c2c, period } = both(edges);
    if (!c2c.ok || !period.ok) throw new Error('expected values');
    expectWithin(c2c.value, Math.sqrt(6) * sigmaE, { rel: 4 / Math.sqrt(n - 1) }, 'closed form √6·σₑ (second difference of white edge errors)');
    expectWithin(period.value, Math.SQRT2 * sigmaE, { rel: 4 / Math.sqrt(2 * (n - 1)) }, 'closed form √2·σₑ');
  });

  it('gives exactly 2a for periods alternating T ± a and b for a linear chirp of b per period, in seconds', () => {
    const dt = 2e-6;
    const alternating = both(fromPeriods(Array.from({ length: 40 }, (_, k) => T + (k % 2 ? 1.5 : -1.5))), dt).c2c;
    expectWithin(alternating.ok ? alternating.value : NaN, 2 * 1.5 * dt, { rel: 1e-9 }, 'closed form 2a');
    const chirp = both(fromPeriods(Array.from({ length: 40 }, (_, k) => T + 0.25 * k)), dt).c2c;
    expectWithin(chirp.ok ? chirp.value : NaN, 0.25 * dt, { rel: 1e-9 }, 'closed form b');
  });

  it('never pairs periods across a missed crossing', () => {
    const t = fromPeriods(Array.from({ length: 41 }, (_, k) => T + (k % 2 ? 1.5 : -1.5)));
    // Dropping crossing 20 joins two periods into one of about 2T; the pairs beside it are left out.
    const gapped = [...t.slice(0, 20), ...t.slice(21)];
    const r = both(gapped).c2c;
    expectWithin(r.ok ? r.value : NaN, 3, { rel: 1e-9 }, 'closed form 2a, the joined interval excluded');
    expect(r.ok && r.method).toMatch(/RMS of 37 differences/);
  });

  it('withholds the value with too few adjacent periods', () => {
    const r = both(fromPeriods([T, T + 1, T])).c2c;
    expect(r).toMatchObject({ ok: false, reason: 'too-few-cycles' });
  });

  it('gives an upper bound, not a value, when the spread is within the capture’s timing floor', () => {
    // A clean synthesised triangle: its crossings scatter only by the interpolation of 400 samples per period.
    const x = synthesize({ shape: 'triangle', frequency: 261.63, amplitude: 3, sampleRate: 261.63 * 400 * 1.0137, samples: 40_000, noise: 0.003, seed: 5 });
    const m = measureCapture(captureOf([x])).channels[0].measurements;
    expect(m.cycleToCycleJitter).toMatchObject({ value: null, unit: 's', bound: { kind: 'upper' } });
    expect(m.cycleToCycleJitter?.bound?.value).toBeLessThan(1e-3 / 261.63);
  });

  it('is the same whatever the crossings’ origin, and scales with the sample interval', () => {
    fc.assert(
      fc.property(fc.integer({ min: 1, max: 1000 }), fc.double({ min: -1e4, max: 1e4, noNaN: true }), fc.double({ min: 1e-9, max: 1e-3, noNaN: true }), (seed, shift, dt) => {
        const rnd = createRandom(seed);
        const periods = Array.from({ length: 60 }, () => T + 0.7 * rnd.gaussian());
        const a = both(fromPeriods(periods, 10), 1).c2c;
        const b = both(fromPeriods(periods, 10 + shift + 1e4), dt).c2c;
        if (!a.ok || !b.ok) throw new Error('expected values');
        expectWithin(b.value, a.value * dt, { rel: 1e-6 }, 'invariance to a time shift, linear in dt');
      }),
      { seed: 65, numRuns: 30 },
    );
  });

  it('leaves the crossings unmodified', () => {
    const t = fromPeriods([T, T + 1, T - 1, T + 2, T]);
    const copy = [...t];
    both(t);
    expect(t).toEqual(copy);
  });
});
