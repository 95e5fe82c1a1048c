/**
 * Period from every like crossing of the record: a least-squares line of crossing instant against
 * cycle index, fitted jointly to the rising and the falling series (one common slope, one intercept
 * per series; ordinary least squares, e.g. Montgomery & Runger, Applied Statistics, ch. 11).
 * Fitting all crossings instead of timing one cycle averages out the timing noise of each edge.
 *
 * Standard uncertainty (JCGM 100:2008), in sample intervals:
 * - Type A from the scatter of the crossing instants about the line: s/√Σ(k − k̄)², with s² the
 *   residual variance on n − 1 − (number of series) degrees of freedom (GUM §4.2; standard error of
 *   a regression slope).
 * - Type B for the sample clock: an edge that falls between two samples is located only to the
 *   sample, like the ±1 count of a frequency counter over its gate time (common practice, no source).
 *   Over K cycles that is ±δ/K sample intervals on the period, rectangular: δ/(√3·K) (GUM §4.3.7).
 *   The errors of successive crossings are not independent when the period is close to a whole
 *   number of samples, or to a simple fraction of one (they drift together over a long beat), so the
 *   scatter alone can miss them; the term is always combined, which is conservative for edges that
 *   fall at scattered phases. δ is the mean step
 *   of the straddling pairs as a fraction of the amplitude: about 1 for an edge faster than a sample,
 *   near 0 for a ramp that linear interpolation resolves.
 */
import { mean as avg, median, rss } from '../stats.js';
import type { Crossings } from './midCrossings.js';

export interface PeriodFit {
  /** Period in sample intervals. */
  readonly period: number;
  /** Combined standard uncertainty of the period, sample intervals. */
  readonly uncertainty: number;
  readonly typeA: number;
  readonly resolution: number;
  /** Crossings used, per series. */
  readonly risingCount: number;
  readonly fallingCount: number;
  /** Whole cycles spanned by the longer series. */
  readonly cycles: number;
  /** Individual periods between consecutive rising (falling) crossings, sample intervals. */
  readonly risingPeriods: readonly number[];
  readonly fallingPeriods: readonly number[];
}

interface Series {
  readonly k: number[];
  readonly t: number[];
}

/** Null when no series holds two crossings. `span` is the peak-to-peak swing used for δ. */
export function periodFit(c: Crossings, span: number): PeriodFit | null {
  const diffs = [...consecutive(c.rising), ...consecutive(c.falling)];
  if (diffs.length === 0) return null;
  // Mean of the intervals that are not missed cycles: a median alone can sit on the shorter of two
  // alternating whole-sample intervals when there are only two or three samples per period.
  const m = median(diffs);
  const rough = avg(diffs.filter((d) => d <= 1.5 * m));
  const rise = indexSeries(c.rising, rough);
  const fall = indexSeries(c.falling, rough);
  const series = [rise, fall].filter((s) => s.k.length >= 2);
  let sxx = 0;
  let sxy = 0;
  for (const s of series) {
    const kb = avg(s.k);
    const tb = avg(s.t);
    for (let i = 0; i < s.k.length; i++) {
      sxx += (s.k[i] - kb) ** 2;
      sxy += (s.k[i] - kb) * (s.t[i] - tb);
    }
  }
  if (!(sxx > 0)) return null;
  const period = sxy / sxx;
  const n = series.reduce((a, s) => a + s.k.length, 0);
  const dof = n - 1 - series.length;
  const typeA = dof > 0 ? Math.sqrt(residualSquares(series, period) / dof / sxx) : 0;
  const cycles = Math.max(...series.map((s) => s.k[s.k.length - 1] - s.k[0]));
  const steps = [...c.risingSteps, ...c.fallingSteps];
  const delta = span > 0 ? avg(steps.map((x) => Math.min(1, x / span))) : 1;
  const resolution = delta / (Math.sqrt(3) * cycles);
  return {
    period,
    uncertainty: rss(typeA, resolution),
    typeA,
    resolution,
    risingCount: rise.k.length >= 2 ? rise.k.length : 0,
    fallingCount: fall.k.length >= 2 ? fall.k.length : 0,
    cycles,
    risingPeriods: periodsOf(rise),
    fallingPeriods: periodsOf(fall),
  };
}

function consecutive(t: readonly number[]): number[] {
  const out: number[] = [];
  for (let i = 1; i < t.length; i++) out.push(t[i] - t[i - 1]);
  return out;
}

/** Cycle index of each crossing, counted from the previous one, so a missed crossing leaves a gap. */
function indexSeries(t: readonly number[], rough: number): Series {
  const k: number[] = [];
  for (let i = 0; i < t.length; i++) k.push(i === 0 ? 0 : k[i - 1] + Math.max(1, Math.round((t[i] - t[i - 1]) / rough)));
  return { k, t: [...t] };
}

function residualSquares(series: readonly Series[], period: number): number {
  let s = 0;
  for (const { k, t } of series) {
    const kb = avg(k);
    const tb = avg(t);
    for (let i = 0; i < k.length; i++) s += (t[i] - tb - period * (k[i] - kb)) ** 2;
  }
  return s;
}

function periodsOf({ k, t }: Series): number[] {
  const out: number[] = [];
  for (let i = 1; i < k.length; i++) if (k[i] - k[i - 1] === 1) out.push(t[i] - t[i - 1]);
  return out;
}
