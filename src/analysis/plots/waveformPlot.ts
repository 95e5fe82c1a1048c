/**
 * A short excerpt of a channel for plots: about three cycles from just before the first rising
 * crossing (the whole record when no period was found), at most 1000 points. Longer excerpts are
 * decimated by min/max pairs per bucket, kept in time order, so edges and peaks survive (common
 * practice for plotting long records, no source). Analysis marks are carried in seconds.
 */
import type { WaveformPlot } from '../../types/index.js';
import type { ChannelAnalysis } from '../measureChannel.js';

const MAX_POINTS = 1000;
const CYCLES = 3;

/** `t0`: time of samples[0] in seconds; `period` in samples, null when withheld. */
export function waveformPlot(samples: Float64Array, dt: number, t0: number, marks: ChannelAnalysis['marks'], period: number | null): WaveformPlot {
  const firstRise = marks.crossings.rising[0];
  const start = period && firstRise !== undefined ? Math.max(0, Math.floor(firstRise - 0.25 * period)) : 0;
  const end = period ? Math.min(samples.length, Math.ceil(start + (CYCLES + 0.5) * period)) : samples.length;
  const { values, step } = decimate(samples, start, end);
  const inside = (i: number): boolean => i >= start && i <= end - 1;
  const at = (i: number): number => t0 + i * dt;
  const crossings = [...marks.crossings.rising, ...marks.crossings.falling].filter(inside).sort((a, b) => a - b).map(at);
  const slopeFits = marks.ramps
    .filter((r) => inside(r.from) && inside(r.to))
    .sort((a, b) => a.from - b.from)
    .map((r) => ({ t1: at(r.from), v1: r.vFrom, t2: at(r.to), v2: r.vTo }));
  return {
    t0: at(start),
    dt: step * dt,
    values,
    ...(marks.levels ? { highLevel: marks.levels.high, lowLevel: marks.levels.low } : {}),
    midReference: marks.mid,
    crossings,
    slopeFits,
  };
}

function decimate(x: Float64Array, start: number, end: number): { values: number[]; step: number } {
  const n = end - start;
  if (n <= MAX_POINTS) return { values: Array.from(x.subarray(start, end)), step: 1 };
  const buckets = MAX_POINTS / 2;
  const size = n / buckets;
  const values: number[] = [];
  for (let b = 0; b < buckets; b++) {
    const from = start + Math.floor(b * size);
    const to = start + Math.floor((b + 1) * size);
    let lo = from;
    let hi = from;
    for (let i = from; i < to; i++) {
      if (x[i] < x[lo]) lo = i;
      if (x[i] > x[hi]) hi = i;
    }
    values.push(x[Math.min(lo, hi)], x[Math.max(lo, hi)]);
  }
  return { values, step: size / 2 };
}
