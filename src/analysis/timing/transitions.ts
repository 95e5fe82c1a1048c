/**
 * Per-transition reference instants and aberrations of a two-state waveform, IEEE Std 181-2011:
 * reference levels at 10 % (proximal), 50 % (mesial) and 90 % (distal) of the amplitude above the
 * low state; each instant by linear interpolation between the straddling samples; the proximal
 * instant is the last 10 % crossing before the mesial one, the distal the first 90 % crossing after it
 * (REFERENCES.md §2; the 10/50/90 set is the standard's default, from memory).
 *
 * Aberrations are measured in the post-transition region, from the distal instant to halfway to the
 * next transition's mesial instant (the standard leaves the region to the user; halfway keeps the
 * next transition out of it). Overshoot: largest excursion beyond the final state; undershoot: the
 * largest ring-back toward the initial state after that peak; both in % of the amplitude and never
 * negative (a first-order edge has neither).
 */
import type { Crossings } from './midCrossings.js';

export interface Transition {
  readonly direction: 1 | -1;
  /** Fractional sample indices of the 10 %, 50 % and 90 % instants (10 % is the start, also when falling). */
  readonly proximal: number;
  readonly mesial: number;
  readonly distal: number;
  /** |x[j+1] − x[j]| at the mesial straddle, for the sampling-resolution terms. */
  readonly step: number;
  /** % of amplitude; null when the region after the transition is cut by the record's end. */
  readonly overshoot: number | null;
  readonly undershoot: number | null;
}

export function transitions(samples: Float64Array, c: Crossings, low: number, high: number): Transition[] {
  const amp = high - low;
  const all = [
    ...c.rising.map((t, i) => ({ t, dir: 1 as const, step: c.risingSteps[i] })),
    ...c.falling.map((t, i) => ({ t, dir: -1 as const, step: c.fallingSteps[i] })),
  ].sort((a, b) => a.t - b.t);
  const out: Transition[] = [];
  for (let k = 0; k < all.length; k++) {
    const { t, dir, step } = all[k];
    const lo = k > 0 ? Math.ceil(all[k - 1].t) : 0;
    const hi = k + 1 < all.length ? Math.floor(all[k + 1].t) : samples.length - 1;
    const proximal = instantBefore(samples, t, dir > 0 ? low + 0.1 * amp : high - 0.1 * amp, dir, lo);
    const distal = instantAfter(samples, t, dir > 0 ? low + 0.9 * amp : high - 0.9 * amp, dir, hi);
    if (proximal === null || distal === null) continue;
    const end = k + 1 < all.length ? Math.floor((t + all[k + 1].t) / 2) : null;
    const ab = end === null ? null : aberrations(samples, Math.ceil(distal), end, dir, dir > 0 ? high : low, amp);
    out.push({ direction: dir, proximal, mesial: t, distal, step, overshoot: ab?.[0] ?? null, undershoot: ab?.[1] ?? null });
  }
  return out;
}

/** Last crossing of `level` before t, going in direction dir; null if the search reaches `lo`. */
function instantBefore(x: Float64Array, t: number, level: number, dir: 1 | -1, lo: number): number | null {
  let j = Math.floor(t);
  while (j >= lo && dir * (x[j] - level) > 0) j--;
  if (j < lo || j + 1 >= x.length) return null;
  return j + (level - x[j]) / (x[j + 1] - x[j]);
}

/** First crossing of `level` after t, going in direction dir; null if the search passes `hi`. */
function instantAfter(x: Float64Array, t: number, level: number, dir: 1 | -1, hi: number): number | null {
  let j = Math.ceil(t);
  while (j <= hi && dir * (x[j] - level) < 0) j++;
  if (j > hi || j < 1) return null;
  return j - 1 + (level - x[j - 1]) / (x[j] - x[j - 1]);
}

function aberrations(x: Float64Array, from: number, to: number, dir: 1 | -1, final: number, amp: number): [number, number] | null {
  if (to <= from) return null;
  let peak = from;
  for (let i = from; i <= to; i++) if (dir * (x[i] - x[peak]) > 0) peak = i;
  let back = peak;
  for (let i = peak; i <= to; i++) if (dir * (x[i] - x[back]) < 0) back = i;
  const over = Math.max(0, (100 * dir * (x[peak] - final)) / amp);
  const under = Math.max(0, (100 * dir * (final - x[back])) / amp);
  return [over, under];
}
