/**
 * Least-squares straight lines through the 20–80 % part of every ramp (triangle and sawtooth).
 * The slope of the integrator ramp is the charge (or discharge) current over the timing capacitor,
 * so matched currents give equal slopes. 20 %/80 % reference levels are a common alternative to
 * 10/90 % in IEEE Std 181-2011 (REFERENCES.md §2); they keep the rounded corners out of the fit.
 *
 * Two passes per ramp: the first takes the samples between the 20 % and 80 % crossings around each
 * mid-reference crossing; the second refits over the samples where that first *line* lies between
 * 20 % and 80 %. Choosing samples by their own noisy values would keep only those whose noise points
 * inward at the ends and flatten the slope; choosing them by time does not.
 * Residuals of the second fit are averaged in 16 bins along the ramp, over all ramps of one direction,
 * so noise averages out of the linearity profile while a bow (an exponential charge) stays.
 */
import type { Crossings } from '../timing/midCrossings.js';

export interface RampFit {
  /** Slope in units per sample interval (signed). */
  readonly slope: number;
  /** Standard error of the slope from the fit residuals (units per sample interval). */
  readonly slopeError: number;
  /** First and last sample index fitted, and the line's values there. */
  readonly from: number;
  readonly to: number;
  readonly vFrom: number;
  readonly vTo: number;
}

export interface RampProfile {
  readonly sum: Float64Array;
  readonly count: Float64Array;
}

export interface RampFits {
  readonly rising: readonly RampFit[];
  readonly falling: readonly RampFit[];
  readonly risingProfile: RampProfile;
  readonly fallingProfile: RampProfile;
}

const PROFILE_BINS = 16;
const MIN_SAMPLES = 4;

export function rampFits(samples: Float64Array, c: Crossings, low: number, high: number): RampFits {
  const r20 = low + 0.2 * (high - low);
  const r80 = low + 0.8 * (high - low);
  const all = [...c.rising.map((t) => ({ t, dir: 1 as const })), ...c.falling.map((t) => ({ t, dir: -1 as const }))];
  all.sort((a, b) => a.t - b.t);
  const out = { rising: [] as RampFit[], falling: [] as RampFit[], risingProfile: profile(), fallingProfile: profile() };
  for (let k = 0; k < all.length; k++) {
    const { t, dir } = all[k];
    const lo = k > 0 ? Math.ceil(all[k - 1].t) : 0;
    const hi = k + 1 < all.length ? Math.floor(all[k + 1].t) : samples.length - 1;
    const first = valueWindow(samples, t, dir, r20, r80, lo, hi);
    if (!first) continue;
    const line1 = fitLine(samples, first[0], first[1]);
    const win = lineWindow(line1, r20, r80, lo, hi);
    if (!win || win[1] - win[0] + 1 < MIN_SAMPLES) continue;
    const line = fitLine(samples, win[0], win[1]);
    const target = dir > 0 ? out.rising : out.falling;
    target.push(line);
    addResiduals(samples, line, r20, r80, dir > 0 ? out.risingProfile : out.fallingProfile);
  }
  return out;
}

function profile(): RampProfile {
  return { sum: new Float64Array(PROFILE_BINS), count: new Float64Array(PROFILE_BINS) };
}

/** Samples strictly between the 20 % and 80 % crossings around crossing t; null if either is outside [lo, hi]. */
function valueWindow(x: Float64Array, t: number, dir: 1 | -1, r20: number, r80: number, lo: number, hi: number): [number, number] | null {
  const startRef = dir > 0 ? r20 : r80;
  const endRef = dir > 0 ? r80 : r20;
  let a = Math.floor(t);
  while (a >= lo && dir * (x[a] - startRef) >= 0) a--;
  let b = Math.ceil(t);
  while (b <= hi && dir * (x[b] - endRef) <= 0) b++;
  if (a < lo || b > hi || b - a - 1 < MIN_SAMPLES) return null;
  return [a + 1, b - 1];
}

/** Samples where the fitted line lies between the references, clipped to [lo, hi]. */
function lineWindow(l: RampFit, r20: number, r80: number, lo: number, hi: number): [number, number] | null {
  if (l.slope === 0) return null;
  const at = (v: number): number => l.from + (v - l.vFrom) / l.slope;
  const [t1, t2] = [at(r20), at(r80)].sort((a, b) => a - b);
  const a = Math.max(lo, Math.ceil(t1));
  const b = Math.min(hi, Math.floor(t2));
  return b > a ? [a, b] : null;
}

function fitLine(x: Float64Array, from: number, to: number): RampFit {
  const n = to - from + 1;
  const ib = (from + to) / 2;
  let sy = 0;
  for (let i = from; i <= to; i++) sy += x[i];
  const yb = sy / n;
  let sxx = 0;
  let sxy = 0;
  for (let i = from; i <= to; i++) {
    sxx += (i - ib) ** 2;
    sxy += (i - ib) * (x[i] - yb);
  }
  const slope = sxy / sxx;
  let rss = 0;
  for (let i = from; i <= to; i++) rss += (x[i] - yb - slope * (i - ib)) ** 2;
  const slopeError = n > 2 ? Math.sqrt(rss / (n - 2) / sxx) : 0;
  return { slope, slopeError, from, to, vFrom: yb + slope * (from - ib), vTo: yb + slope * (to - ib) };
}

function addResiduals(x: Float64Array, l: RampFit, r20: number, r80: number, p: RampProfile): void {
  for (let i = l.from; i <= l.to; i++) {
    const v = l.vFrom + l.slope * (i - l.from);
    const bin = Math.min(PROFILE_BINS - 1, Math.max(0, Math.floor(((v - r20) / (r80 - r20)) * PROFILE_BINS)));
    p.sum[bin] += x[i] - v;
    p.count[bin]++;
  }
}
