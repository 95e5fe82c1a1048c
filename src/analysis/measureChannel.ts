/**
 * All time-domain measurements of one channel's finite samples: shape, timing, levels, and the
 * measurements of the shape's family. Each method's source is in its own file; this file decides the
 * order and what is withheld for the whole channel (no signal, clipping, possible aliasing).
 *
 * Timing reference (common practice, no source): a first mid reference halfway between the 0.5 %
 * and 99.5 % quantiles, with hysteresis of ±10 % of that span (±3σ of the noise if larger, at most
 * ±25 %), is
 * enough to find the period and fold the cycle for the shape. Two-state shapes are then re-timed at
 * the 50 % level between their IEEE 181 state levels. A channel is "no signal" when its swing is
 * under 8σ of the noise and its crossings do not form a regular train.
 */
import type { CaptureWarning, FlatTop, MeasurementId, Shape } from '../types/index.js';
import type { Levels, Results } from './levels/channelLevels.js';
import { isTwoState, levelResults, levelsOf, momentResults } from './levels/channelLevels.js';
import { classifyShape } from './classifyShape.js';
import { flatTops } from './levels/flatTops.js';
import { frequency } from './timing/frequency.js';
import { jitter } from './timing/jitter.js';
import { cycleToCycleJitter } from './timing/cycleToCycleJitter.js';
import { withheld } from './measureResult.js';
import type { Crossings } from './timing/midCrossings.js';
import { midCrossings } from './timing/midCrossings.js';
import { noiseLevel } from './levels/noiseLevel.js';
import { period } from './timing/period.js';
import type { PeriodFit } from './timing/periodFit.js';
import { periodFit } from './timing/periodFit.js';
import { extremes, quantiles } from './levels/quantiles.js';
import type { RampFit } from './ramps/rampFits.js';
import { shapeResults } from './ramps/shapeResults.js';
import { sineFit } from './fits/sineFit.js';
import { mean, standardDeviation } from './stats.js';

export interface ChannelOptions {
  readonly unit: string;
  /** The channel's full-scale limits, when the capture states them. */
  readonly fullScale?: { readonly low: number; readonly high: number };
}

export interface ChannelAnalysis {
  readonly shape: Shape;
  readonly results: Results;
  readonly warnings: readonly Omit<CaptureWarning, 'channel'>[];
  /** Measured fundamental in Hz, null when withheld. */
  readonly fundamental: number | null;
  /** Flat tops: the scope's clipping (values withheld) or the circuit's saturation (a finding). */
  readonly flatTops: readonly FlatTop[];
  /** Marks for plots, in sample indices of the samples given. */
  readonly marks: { readonly levels: Levels | null; readonly mid: number; readonly crossings: Crossings; readonly ramps: readonly RampFit[] };
}

export const MIN_SAMPLES = 16;
const SIGNAL_SPAN_IN_NOISE = 8;
const NYQUIST_MARGIN = 3;

export function measureChannel(samples: Float64Array, dt: number, options: ChannelOptions): ChannelAnalysis {
  const { unit } = options;
  const noise = noiseLevel(samples);
  const range = extremes(samples);
  const [qLow, qHigh] = quantiles(samples, [0.005, 0.995], range);
  const span = qHigh - qLow;
  if (!(span > 0)) return noSignal(samples, range, noise, unit);
  const mid0 = (qLow + qHigh) / 2;
  const c0 = midCrossings(samples, mid0, hysteresis(span, noise));
  const fit0 = periodFit(c0, span);
  if (span <= SIGNAL_SPAN_IN_NOISE * noise && !regular(fit0)) return noSignal(samples, range, noise, unit);
  const evidence = classifyShape(samples, fit0 ? firstCrossing(c0) : null, fit0?.period ?? null);
  const { shape } = evidence;
  const levels = levelsOf(samples, shape, c0.rising, noise);
  let [c, fit, mid] = [c0, fit0, mid0];
  if (levels && isTwoState(shape)) {
    // Re-time at the 50 % level between the state levels (IEEE 181 mesial reference).
    mid = (levels.high + levels.low) / 2;
    c = midCrossings(samples, mid, hysteresis(levels.high - levels.low, noise));
    fit = periodFit(c, levels.high - levels.low) ?? fit0;
  }
  const timing = timingResults(samples, dt, fit, c, shape, noise, span);
  const results: Results = {
    ...timing.results,
    ...levelResults(range, levels, noise, unit),
    ...momentResults(samples, c.rising, noise, span, unit),
  };
  const family = levels ? shapeResults(shape, { samples, dt, crossings: c, levels, noise, unit, riseShare: evidence.riseShare }) : null;
  Object.assign(results, family?.results ?? withheldFamily(shape));
  // A square's or pulse's flat states are its shape; only the scope's clipping counts there.
  const flats = flatTops(samples, { noise, span, range, scopeRangeOnly: isTwoState(shape), ...(options.fullScale ? { fullScale: options.fullScale } : {}) });
  const scope = flats.filter((f) => f.cause === 'scope-range');
  const warnings = [...aliasingWarning(fit, dt), ...flatWarnings(flats, unit)];
  return {
    shape,
    results: scope.length > 0 ? applyClipping(results, scope, unit) : results,
    warnings,
    fundamental: timing.fundamental,
    flatTops: flats,
    marks: { levels, mid, crossings: c, ramps: family?.ramps ?? [] },
  };
}

function hysteresis(span: number, noise: number): number {
  return Math.min(0.25 * span, Math.max(0.1 * span, 3 * noise));
}

/**
 * A regular crossing train (period scatter under 20 %) is a signal even when the noise estimate,
 * which counts the curvature of a coarsely sampled wave as noise, is close to the swing.
 */
function regular(fit: PeriodFit | null): boolean {
  const p = fit ? (fit.risingPeriods.length >= fit.fallingPeriods.length ? fit.risingPeriods : fit.fallingPeriods) : [];
  return p.length >= 2 && standardDeviation(p) < 0.2 * mean(p);
}

function firstCrossing(c: Crossings): number {
  return c.rising.length > 0 ? c.rising[0] : c.falling[0];
}

function timingResults(x: Float64Array, dt: number, fit: PeriodFit | null, c: Crossings, shape: Shape, noise: number, span: number): { results: Results; fundamental: number | null } {
  const sine = shape === 'sine' && fit && fit.cycles >= 2 ? sineFit(x, dt, 1 / (fit.period * dt)) : null;
  const input = { fit, sine, length: x.length, dt };
  const f = frequency(input);
  return {
    results: { frequency: f, period: period(input), jitter: jitter(fit, c, noise, span, dt), cycleToCycleJitter: cycleToCycleJitter(fit, c, noise, span, dt) },
    fundamental: f.ok ? f.value : null,
  };
}

/** A record with no swing above its noise: only the raw levels and the record mean mean anything. */
function noSignal(x: Float64Array, range: { min: number; max: number }, noise: number, unit: string): ChannelAnalysis {
  const why = withheld('no-signal', `no waveform above the noise (peak-to-peak ${(range.max - range.min).toPrecision(3)} ${unit || 'V'}); check the probe connection and the channel's vertical range`);
  const levels = levelResults(range, null, noise, unit);
  const whole = wholeRecord(momentResults(x, [0, x.length], noise, range.max - range.min, unit));
  const results: Results = { frequency: why, period: why, jitter: why, cycleToCycleJitter: why, ...levels, highLevel: why, lowLevel: why, amplitude: why, ...whole };
  const c: Crossings = { rising: [], falling: [], risingSteps: [], fallingSteps: [] };
  return { shape: 'unknown', results, warnings: [], fundamental: null, flatTops: [], marks: { levels: null, mid: (range.max + range.min) / 2, crossings: c, ramps: [] } };
}

/** Without a waveform there are no cycles: the moments are taken over the whole record, and say so. */
function wholeRecord(r: Results): Results {
  const out: Results = {};
  for (const [id, m] of Object.entries(r) as [MeasurementId, NonNullable<Results[MeasurementId]>][]) {
    out[id] = m.ok ? { ...m, method: m.method.replace(/over 1 whole cycle \((\d+) samples\)/, 'over the whole record ($1 samples; no waveform to take whole cycles of)') } : m;
  }
  return out;
}

function withheldFamily(shape: Shape): Results {
  const why = withheld('too-few-cycles', 'the capture holds less than one whole cycle; lengthen the timebase to hold at least 2 cycles');
  const ids: Partial<Record<Shape, MeasurementId[]>> = {
    triangle: ['riseSlope', 'fallSlope', 'slopeRatio', 'symmetry', 'linearity'],
    sawtooth: ['riseSlope', 'linearity'],
    square: ['dutyCycle', 'riseTime', 'fallTime', 'overshoot', 'undershoot'],
    pulse: ['dutyCycle', 'riseTime', 'fallTime', 'overshoot', 'undershoot'],
  };
  return Object.fromEntries((ids[shape] ?? []).map((id) => [id, why]));
}

function aliasingWarning(fit: PeriodFit | null, dt: number): Omit<CaptureWarning, 'channel'>[] {
  if (!fit || fit.period >= NYQUIST_MARGIN) return [];
  const f = 1 / (fit.period * dt);
  return [{ code: 'aliasing', message: `the measured frequency ${f.toPrecision(4)} Hz is close to half the sample rate (${(0.5 / dt).toPrecision(4)} Hz): the capture may be aliased; raise the sample rate to at least 10 times the signal frequency` }];
}

const q = (v: number, unit: string): string => `${Number(v.toPrecision(4))} ${unit || 'V'}`;
const pct = (share: number): string => `${Number((100 * share).toPrecision(2))} %`;

function flatWarnings(flats: readonly FlatTop[], unit: string): Omit<CaptureWarning, 'channel'>[] {
  return flats.map((f) =>
    f.cause === 'scope-range'
      ? { code: 'clipped', message: `the trace runs off the scope's ${f.side === 'high' ? 'top' : 'bottom'} at ${q(f.level, unit)}, its full scale (${f.fullScaleFrom === 'preamble' ? 'as the capture states' : 'the converter\'s end code'}), for ${pct(f.share)} of the record; levels, slopes and harmonics are withheld: set more volts per division (or move the vertical offset) so the whole swing fits on screen, and capture again` }
      : { code: 'saturated', message: `the waveform sits flat at ${q(f.level, unit)} on its ${f.side === 'high' ? 'top' : 'bottom'} for ${pct(f.share)} of each cycle, inside the scope's range: the circuit saturates there (output stage or rail)` },
  );
}

const CLIP_SENSITIVE: readonly MeasurementId[] = [
  'maximum', 'minimum', 'peakToPeak', 'highLevel', 'lowLevel', 'amplitude', 'dcOffset', 'rms', 'acRms',
  'riseSlope', 'fallSlope', 'slopeRatio', 'symmetry', 'linearity', 'riseTime', 'fallTime', 'overshoot', 'undershoot',
];

function applyClipping(results: Results, scope: readonly FlatTop[], unit: string): Results {
  const where = scope.map((f) => `${f.samples} samples at ${q(f.level, unit)} on the ${f.side === 'high' ? 'top' : 'bottom'}`).join(', ');
  const why = withheld(
    'clipped',
    `the trace is clipped at the scope's full scale (${where}), so this would read the screen's edge, not the waveform; set more volts per division (or move the vertical offset) so the whole swing fits, and capture again`,
  );
  const out: Results = { ...results };
  for (const id of CLIP_SENSITIVE) if (id in out) out[id] = why;
  return out;
}
