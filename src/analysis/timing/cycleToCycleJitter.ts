/**
 * Cycle-to-cycle jitter: the RMS of the differences between adjacent periods, Δₖ = Tₖ₊₁ − Tₖ, each
 * period the interval between two consecutive rising mid-reference crossings (IEEE Std 181-2011
 * period). The definition is JEDEC JESD65B's "variation in cycle time of a signal between adjacent
 * cycles" as it is commonly computed (RMS over all adjacent pairs; from memory). Only pairs of whole
 * single periods that share a crossing count, so a missed crossing never joins two distant cycles.
 * The falling series stands in when the rising one is too short, as for period jitter (jitter.ts).
 *
 * Closed forms it is tested against: independent period perturbations of σ (edge times a random
 * walk) give period jitter σ and cycle-to-cycle √2·σ; independent edge-time perturbations of σₑ on
 * an ideal clock give √2·σₑ and √6·σₑ.
 *
 * Uncertainty: adjacent differences share a period, so they are correlated (lag 1: −1/2 for
 * independent periods; lags 1 and 2: −2/3 and 1/6 for independent edges), which raises the variance
 * of their mean square from 2σ⁴/m (m independent Gaussian values) to 1.5 to 1.94 times that
 * (Gaussian fourth moments, Isserlis; derived here). Hence u(s) ≤ 0.99·s/√m, and s/√m is used.
 *
 * The capture's timing floor: each crossing is located to σ_ε (noise over slope, and the sample
 * spacing), independently edge to edge, which is the independent-edge case above: √6·σ_ε on this
 * measure, √3 times its floor on period jitter (jitter.ts). At or below 1.5 times that floor the
 * value is withheld, with the observed RMS plus 2u as an upper bound on the oscillator's own.
 */
import type { MeasureResult } from '../../types/index.js';
import type { Crossings } from './midCrossings.js';
import type { PeriodFit } from './periodFit.js';
import { bounded, measured, withheld } from '../measureResult.js';
import { FLOOR_FACTOR, formatSeconds, timingFloor } from './jitter.js';

/** Adjacent pairs needed for a spread worth stating (common practice, no source). */
export const MIN_PAIRS = 3;

export function cycleToCycleJitter(fit: PeriodFit | null, c: Crossings, noise: number, span: number, dt: number): MeasureResult {
  const rising = fit ? adjacentDifferences(c.rising, fit.period) : [];
  const falling = fit && rising.length < MIN_PAIRS ? adjacentDifferences(c.falling, fit.period) : [];
  const useRising = rising.length >= MIN_PAIRS || falling.length < MIN_PAIRS;
  const diffs = useRising ? rising : falling;
  const m = diffs.length;
  if (!fit || m < MIN_PAIRS) {
    return withheld('too-few-cycles', `only ${m} pair${m === 1 ? '' : 's'} of adjacent whole periods in the capture; at least ${MIN_PAIRS} are needed for a cycle-to-cycle spread`);
  }
  let sum = 0;
  for (const d of diffs) sum += d * d;
  const s = Math.sqrt(sum / m);
  const word = useRising ? 'rising' : 'falling';
  // The period floor is √2·σ_ε; adjacent differences of independent edge errors reach √6·σ_ε.
  const floor = Math.sqrt(3) * timingFloor(useRising ? c.risingSteps : c.fallingSteps, noise, span);
  if (s <= FLOOR_FACTOR * floor) {
    const bound = s * (1 + 2 / Math.sqrt(m)) * dt;
    return bounded(
      'upper',
      bound,
      `the cycle-to-cycle spread (${formatSeconds(s * dt)}) is within what the capture's noise and sample spacing alone produce (${formatSeconds(floor * dt)}); raise the sample rate or reduce the noise to see the oscillator's own`,
      `upper bound: the RMS of ${m} differences of adjacent periods between ${word} mid-reference crossings, plus 2u, holds the oscillator's own cycle-to-cycle jitter and the capture's timing floor (${formatSeconds(floor * dt)}) together`,
    );
  }
  return measured(s * dt, (s / Math.sqrt(m)) * dt, 's', `RMS of ${m} differences of adjacent periods between ${word} mid-reference crossings (capture timing floor ${formatSeconds(floor * dt)})`);
}

/** Tₖ₊₁ − Tₖ for every two adjacent single periods (in samples); `period` is the fitted mean period. */
function adjacentDifferences(t: readonly number[], period: number): number[] {
  const out: number[] = [];
  let previous: number | null = null;
  for (let i = 1; i < t.length; i++) {
    const p = t[i] - t[i - 1];
    const single = Math.round(p / period) === 1;
    if (single && previous !== null) out.push(p - previous);
    previous = single ? p : null;
  }
  return out;
}
