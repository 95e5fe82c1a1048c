/**
 * Period jitter: the standard deviation of the individual periods, each the interval between two
 * consecutive rising mid-reference crossings (IEEE Std 181-2011 period; sample standard deviation,
 * JCGM 100:2008 eq. 4), so period jitter; cycle-to-cycle jitter is cycleToCycleJitter.ts. Rising to rising is the usual convention (common practice, no source); the
 * falling series stands in when the rising one is too short.
 *
 * The capture itself adds timing scatter: additive noise σ moves a crossing by σ/slope, and an edge
 * that falls between samples is known only to ±½ sample. When the observed scatter is not clearly
 * above that floor (1.5 times), the oscillator's own jitter cannot be told from the capture's and the
 * value is withheld, with the observed scatter plus 2u as an upper bound on the oscillator's own.
 * Standard uncertainty of a standard deviation of n normal values: s/√(2(n − 1))
 * (common result, e.g. Taylor, An Introduction to Error Analysis, §5.8; from memory).
 */
import type { MeasureResult } from '../../types/index.js';
import type { Crossings } from './midCrossings.js';
import type { PeriodFit } from './periodFit.js';
import { bounded, measured, withheld } from '../measureResult.js';
import { standardDeviation } from '../stats.js';

export const MIN_PERIODS = 4;
export const FLOOR_FACTOR = 1.5;

export function jitter(fit: PeriodFit | null, c: Crossings, noise: number, span: number, dt: number): MeasureResult {
  const periods = fit ? (fit.risingPeriods.length >= MIN_PERIODS ? fit.risingPeriods : fit.fallingPeriods) : [];
  const n = periods.length;
  if (!fit || n < MIN_PERIODS) {
    return withheld('too-few-cycles', `only ${n} whole period${n === 1 ? '' : 's'} in the capture; at least ${MIN_PERIODS} are needed for a period scatter`);
  }
  const s = standardDeviation(periods);
  const word = periods === fit.risingPeriods ? 'rising' : 'falling';
  const floor = timingFloor(word === 'rising' ? c.risingSteps : c.fallingSteps, noise, span);
  if (s <= FLOOR_FACTOR * floor) {
    // Own and capture scatter add in quadrature, so the oscillator's own jitter is at most the observed
    // scatter; its upper bound is s + 2u(s) (k = 2).
    const bound = s * (1 + 2 / Math.sqrt(2 * (n - 1))) * dt;
    return bounded(
      'upper',
      bound,
      `the period scatter (${formatSeconds(s * dt)}) is within what the capture's noise and sample spacing alone produce (${formatSeconds(floor * dt)}); raise the sample rate or reduce the noise to see the oscillator's own jitter`,
      `upper bound: the standard deviation of ${n} periods between ${word} mid-reference crossings, plus 2u, holds the oscillator's own jitter and the capture's timing floor (${formatSeconds(floor * dt)}) together`,
    );
  }
  return measured(s * dt, (s / Math.sqrt(2 * (n - 1))) * dt, 's', `standard deviation of ${n} periods between ${word} mid-reference crossings (capture timing floor ${formatSeconds(floor * dt)})`);
}

/** Expected standard deviation of one period from noise and sampling, in sample intervals. */
export function timingFloor(steps: readonly number[], noise: number, span: number): number {
  let sum = 0;
  for (const step of steps) {
    const fromNoise = step > 0 ? noise / step : 1;
    const fromSampling = Math.min(1, span > 0 ? step / span : 1) / Math.sqrt(12);
    sum += fromNoise ** 2 + fromSampling ** 2;
  }
  return Math.sqrt((2 * sum) / steps.length);
}

/** Seconds in µs or ns with two significant digits, for notes (report formatting lives downstream). */
export function formatSeconds(seconds: number): string {
  const two = (x: number): string => String(Number(x.toPrecision(2)));
  return seconds >= 1e-6 ? `${two(seconds * 1e6)} µs` : `${two(seconds * 1e9)} ns`;
}
