/**
 * Process capability indices, NIST/SEMATECH e-Handbook of Statistical Methods §6.1.6
 * ("What is Process Capability?"): Cp = (USL − LSL)/(6σ), Cpu = (USL − μ)/(3σ), Cpl = (μ − LSL)/(3σ),
 * Cpk = min(Cpu, Cpl). With samples, the mean x̄ and the standard deviation s stand in for μ and σ.
 * A one-sided tolerance has only Cpu or Cpl, which is then Cpk; Cp needs both limits.
 */
import type { Capability } from '../types/index.js';
import { mean, standardDeviation } from '../analysis/index.js';

export interface CapabilityInput {
  readonly mean: number;
  readonly sd: number;
  readonly lower: number | null;
  readonly upper: number | null;
}

export function capability(input: CapabilityInput): Capability {
  const { mean, sd, lower, upper } = input;
  if (!Number.isFinite(mean) || !Number.isFinite(sd) || sd < 0) {
    throw new RangeError(`capability: mean ${mean} and sd ${sd} must be finite, sd ≥ 0`);
  }
  if (lower !== null && upper !== null && lower > upper) throw new RangeError(`capability: lower limit ${lower} is above upper ${upper}`);
  // With no spread the indices are unbounded: report none rather than Infinity.
  if (sd === 0) return { cp: null, cpu: null, cpl: null, cpk: null };
  const cp = lower !== null && upper !== null ? (upper - lower) / (6 * sd) : null;
  const cpu = upper !== null ? (upper - mean) / (3 * sd) : null;
  const cpl = lower !== null ? (mean - lower) / (3 * sd) : null;
  const sides = [cpu, cpl].filter((x): x is number => x !== null);
  const cpk = sides.length ? Math.min(...sides) : null;
  return { cp, cpu, cpl, cpk };
}

export interface SampleSummary {
  readonly count: number;
  readonly mean: number | null;
  /** Sample standard deviation with n − 1 in the denominator; null below two values. */
  readonly sd: number | null;
  readonly min: number | null;
  readonly max: number | null;
}

/** Mean, sample standard deviation (the analysis stage's statistics), range. */
export function describeSample(values: readonly number[]): SampleSummary {
  const n = values.length;
  if (n === 0) return { count: 0, mean: null, sd: null, min: null, max: null };
  let min = Infinity;
  let max = -Infinity;
  for (const v of values) {
    if (v < min) min = v;
    if (v > max) max = v;
  }
  return { count: n, mean: mean(values), sd: n < 2 ? null : standardDeviation(values), min, max };
}
