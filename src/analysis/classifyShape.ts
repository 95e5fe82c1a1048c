/**
 * Waveform shape from the time domain alone: sine, triangle, square, pulse, sawtooth or unknown.
 *
 * The record is folded at its measured period into one average cycle of 64 phase bins (noise averages
 * out over the cycles). The sorted bin values form the cycle's amplitude quantile function, which
 * does not depend on offset, gain, symmetry or duty: a straight-ramp wave (triangle or sawtooth, any
 * symmetry) is uniform, 2p − 1; a sine is the arcsine law, −cos πp; a two-state wave is a step.
 * Each template is fitted by least squares with free offset and gain; its misfit ρ = √(1 − R²) says
 * how far the cycle is from it. The uniform and arcsine laws are 0.12 apart in ρ (computed: their
 * correlation is (4/π²)/√(1/6) = 0.9927) and both about 0.44 or more from a step, so ρ ≤ 0.25 for
 * the best template leaves room for noise and corner rounding. Rounded edges smear a step's
 * quantile function, so a cycle that spends at least 60 % of its time within 10 % of the span from
 * its 5 % or 95 % quantile (the dwell; a sine spends 41 %, a triangle 28 %, closed forms) is also
 * two-state. Without a period (under one cycle) the raw samples stand in for the cycle; a partial
 * cycle distorts the distribution, so there the best misfit must be under 0.12 (the sine–ramp
 * distance), else the shape is unknown. Otherwise: unknown.
 *
 * Then: a ramp whose fast edge takes under a tenth of the cycle (rise share, from the phase of the
 * minimum to the phase of the maximum, above 0.9 or below 0.1) is a sawtooth, else a triangle, so a
 * triangle with slope ratio 1.1 stays a triangle. A two-state wave with a high share of 40–60 % is a
 * square, else a pulse (our boundary; a 25 % duty wave is a pulse). Common practice for the
 * boundaries, no source.
 */
import type { Shape } from '../types/index.js';

export interface ShapeEvidence {
  readonly shape: Shape;
  /** Template misfits ρ = √(1 − R²). */
  readonly ramp: number;
  readonly sine: number;
  readonly step: number;
  /** Rising share of the cycle (ramps), 0…1. */
  readonly riseShare: number;
  /** High share of the cycle for the best step fit, 0…1. */
  readonly highShare: number;
  /** Share of the cycle within 10 % of the span from the 5 % or 95 % quantile. */
  readonly dwell: number;
}

const BINS = 64;
const MAX_MISFIT = 0.25;
const MAX_MISFIT_UNFOLDED = 0.12;
const MIN_DWELL = 0.6;
const MAX_RAW = 4096;

/** `start` and `period` in fractional samples (first rising crossing and fitted period), or null. */
export function classifyShape(samples: Float64Array, start: number | null, period: number | null): ShapeEvidence {
  const folded = start !== null && period !== null && period > 0 ? foldCycle(samples, start, period) : null;
  const cycle = folded ?? strided(samples);
  const sorted = Float64Array.from(cycle).sort();
  const ramp = templateMisfit(sorted, (p) => 2 * p - 1);
  const sine = templateMisfit(sorted, (p) => -Math.cos(Math.PI * p));
  const { misfit: step, highShare } = stepMisfit(sorted);
  const riseShare = folded ? foldedRiseShare(folded) : rawRiseShare(samples);
  const dwell = dwellShare(sorted);
  const evidence = { ramp, sine, step, riseShare, highShare, dwell };
  return { shape: decide(evidence, folded !== null), ...evidence };
}

function decide(e: Omit<ShapeEvidence, 'shape'>, folded: boolean): Shape {
  const best = Math.min(e.ramp, e.sine, e.step);
  if (best > (folded ? MAX_MISFIT : MAX_MISFIT_UNFOLDED) && e.dwell < MIN_DWELL) return 'unknown';
  if (best === e.step || e.dwell >= MIN_DWELL) return e.highShare >= 0.4 && e.highShare <= 0.6 ? 'square' : 'pulse';
  if (best === e.sine) return 'sine';
  return e.riseShare > 0.9 || e.riseShare < 0.1 ? 'sawtooth' : 'triangle';
}

function dwellShare(s: Float64Array): number {
  const n = s.length;
  const lo = s[Math.floor(0.05 * (n - 1))];
  const hi = s[Math.ceil(0.95 * (n - 1))];
  const band = 0.1 * (hi - lo);
  if (!(band > 0)) return 0;
  let near = 0;
  for (let j = 0; j < n; j++) if (Math.abs(s[j] - lo) <= band || Math.abs(s[j] - hi) <= band) near++;
  return near / n;
}

/** Mean value in each of BINS phase bins over the whole cycles after `start`; empty bins dropped. */
function foldCycle(x: Float64Array, start: number, period: number): number[] | null {
  const cycles = Math.floor((x.length - 1 - start) / period);
  if (cycles < 1) return null;
  const sum = new Float64Array(BINS);
  const count = new Float64Array(BINS);
  const end = start + cycles * period;
  for (let i = Math.ceil(start); i < end; i++) {
    const phase = (i - start) / period;
    const b = Math.min(BINS - 1, Math.floor((phase - Math.floor(phase)) * BINS));
    sum[b] += x[i];
    count[b]++;
  }
  const out: number[] = [];
  for (let b = 0; b < BINS; b++) if (count[b] > 0) out.push(sum[b] / count[b]);
  return out.length >= 8 ? out : null;
}

function strided(x: Float64Array): number[] {
  const stride = Math.max(1, Math.floor(x.length / MAX_RAW));
  const out: number[] = [];
  for (let i = 0; i < x.length; i += stride) out.push(x[i]);
  return out;
}

function templateMisfit(s: Float64Array, q: (p: number) => number): number {
  const n = s.length;
  const t = Array.from({ length: n }, (_, j) => q((j + 0.5) / n));
  const ms = s.reduce((a, b) => a + b, 0) / n;
  const mt = t.reduce((a, b) => a + b, 0) / n;
  let sst = 0;
  let sss = 0;
  let sts = 0;
  for (let j = 0; j < n; j++) {
    sst += (t[j] - mt) ** 2;
    sss += (s[j] - ms) ** 2;
    sts += (t[j] - mt) * (s[j] - ms);
  }
  if (!(sss > 0)) return 1;
  return Math.sqrt(Math.max(0, 1 - (sts * sts) / (sst * sss)));
}

/** Best two-level fit of the sorted values: split where the within-group sum of squares is least. */
function stepMisfit(s: Float64Array): { misfit: number; highShare: number } {
  const n = s.length;
  const total = s.reduce((a, b) => a + b, 0);
  const mean = total / n;
  const sst = s.reduce((a, b) => a + (b - mean) ** 2, 0);
  if (!(sst > 0)) return { misfit: 1, highShare: 0.5 };
  let best = { between: -1, split: 1 };
  let left = 0;
  for (let k = 1; k < n; k++) {
    left += s[k - 1];
    const between = (left * left) / k + ((total - left) * (total - left)) / (n - k) - (total * total) / n;
    if (between > best.between) best = { between, split: k };
  }
  return { misfit: Math.sqrt(Math.max(0, 1 - best.between / sst)), highShare: (n - best.split) / n };
}

/** Phase distance from the minimum to the maximum of the folded cycle, as a share of the cycle. */
function foldedRiseShare(c: readonly number[]): number {
  let lo = 0;
  let hi = 0;
  for (let j = 1; j < c.length; j++) {
    if (c[j] < c[lo]) lo = j;
    if (c[j] > c[hi]) hi = j;
  }
  return (((hi - lo) % c.length) + c.length) % c.length / c.length;
}

/** Share of rising steps between block means (blocks of 1/256 of the record). */
function rawRiseShare(x: Float64Array): number {
  const size = Math.max(1, Math.floor(x.length / 256));
  const means: number[] = [];
  for (let i = 0; i + size <= x.length; i += size) {
    let s = 0;
    for (let j = i; j < i + size; j++) s += x[j];
    means.push(s / size);
  }
  let up = 0;
  for (let j = 1; j < means.length; j++) if (means[j] > means[j - 1]) up++;
  return means.length > 1 ? up / (means.length - 1) : 0.5;
}
