/**
 * The measurements that belong to one shape family: ramp slopes, slope ratio, symmetry and linearity
 * for triangles; the slow ramp, its linearity and the reset edge for sawtooths; duty cycle, transition
 * durations and aberrations for squares and pulses. A measurement that does not apply is absent.
 *
 * Sawtooth (our decision): only the slow ramp is a ramp. A rising sawtooth reports `riseSlope` and the
 * 10–90 % duration of its reset as `fallTime`; a falling one reports `fallSlope` and `riseTime`.
 * There is no slope ratio or symmetry, because the reset is an edge, not a second ramp.
 */
import type { Shape } from '../../types/index.js';
import type { Levels, Results } from '../levels/channelLevels.js';
import { aberration } from '../levels/aberration.js';
import { dutyCycle } from '../timing/dutyCycle.js';
import { linearity } from './linearity.js';
import type { Crossings } from '../timing/midCrossings.js';
import type { RampFit } from './rampFits.js';
import { rampFits } from './rampFits.js';
import { rampSlope } from './rampSlope.js';
import { slopeRatio } from './slopeRatio.js';
import { symmetry } from './symmetry.js';
import { transitionDuration } from '../timing/transitionDuration.js';
import { transitions } from '../timing/transitions.js';
import { unitFor } from '../measurementUnits.js';

export interface ShapeInput {
  readonly samples: Float64Array;
  readonly dt: number;
  readonly crossings: Crossings;
  readonly levels: Levels;
  readonly noise: number;
  readonly unit: string;
  /** Ramps: rising share of the cycle (decides a sawtooth's direction). */
  readonly riseShare: number;
}

export interface ShapeOutput {
  readonly results: Results;
  readonly ramps: readonly RampFit[];
}

export function shapeResults(shape: Shape, input: ShapeInput): ShapeOutput {
  if (shape === 'triangle') return triangleResults(input);
  if (shape === 'sawtooth') return sawtoothResults(input);
  if (shape === 'square' || shape === 'pulse') return { results: edgeResults(input), ramps: [] };
  return { results: {}, ramps: [] };
}

function triangleResults(input: ShapeInput): ShapeOutput {
  const { samples, dt, crossings, levels, noise, unit } = input;
  const fits = rampFits(samples, crossings, levels.low, levels.high);
  const slopeUnit = unitFor('riseSlope', unit);
  const riseSlope = rampSlope(fits.rising, dt, slopeUnit, 'rising');
  const fallSlope = rampSlope(fits.falling, dt, slopeUnit, 'falling');
  const ratio = slopeRatio(riseSlope, fallSlope);
  const amp = levels.high - levels.low;
  return {
    results: {
      riseSlope,
      fallSlope,
      slopeRatio: ratio,
      symmetry: symmetry(ratio),
      linearity: linearity([fits.risingProfile, fits.fallingProfile], amp, noise),
    },
    ramps: [...fits.rising, ...fits.falling],
  };
}

function sawtoothResults(input: ShapeInput): ShapeOutput {
  const { samples, dt, crossings, levels, noise, unit, riseShare } = input;
  const fits = rampFits(samples, crossings, levels.low, levels.high);
  const rising = riseShare >= 0.5;
  const slow = rising ? fits.rising : fits.falling;
  const slope = rampSlope(slow, dt, unitFor('riseSlope', unit), rising ? 'rising' : 'falling');
  const profile = rising ? fits.risingProfile : fits.fallingProfile;
  const reset = transitionDuration(transitions(samples, crossings, levels.low, levels.high), rising ? -1 : 1, dt);
  const results: Results = rising
    ? { riseSlope: slope, linearity: linearity([profile], levels.high - levels.low, noise), fallTime: reset }
    : { fallSlope: slope, linearity: linearity([profile], levels.high - levels.low, noise), riseTime: reset };
  return { results, ramps: slow };
}

function edgeResults(input: ShapeInput): Results {
  const { samples, dt, crossings, levels, noise } = input;
  const amp = levels.high - levels.low;
  const ts = transitions(samples, crossings, levels.low, levels.high);
  return {
    dutyCycle: dutyCycle(ts, amp),
    riseTime: transitionDuration(ts, 1, dt),
    fallTime: transitionDuration(ts, -1, dt),
    overshoot: aberration(ts, 'overshoot', amp, noise),
    undershoot: aberration(ts, 'undershoot', amp, noise),
  };
}
