/**
 * Flat tops: stretches where the waveform sits at its extreme level instead of passing through it,
 * and whether that level is the capture's own full scale (the trace ran off the scope's screen) or
 * lies inside it (the circuit saturated). Common practice (no source); the rule, stated so it can be
 * checked, with every threshold in the signal's own terms so it holds at any vertical resolution:
 *
 * 1. Flat: a run of at least 3 samples exactly (to 1e-9 of the span) at the highest (lowest) level
 *    the record holds for 3 samples in a row, so a stray overshoot past it does not hide it; failing that, of
 *    samples within a band b = 6σ below the level only 0.1 % of the record exceeds, σ the additive noise
 *    (noiseLevel.ts), so noise riding on a saturated level stays inside the band and a lone spike
 *    past it changes nothing. Nothing depends on the size of the converter's steps: an
 *    exactly flat run counts at 1 µV as at 80 mV.
 * 2. Longer than a peak would dwell there: more than 1.5 times the samples the signal then takes, on
 *    the slower side, to fall 4u below the level (u = b, or the step q to the next value for an exact
 *    run). A parabolic peak c·t² stays within u for 2√(u/c) samples and reaches 4u in 2√(u/c): ratio
 *    1; a triangle's apex 1/2 (closed forms); a flat F samples long on a ramp of slope s, F·s/(4u) + 1/2.
 * 3. Cuts off a ramp: walking away from the run on one side, the signal takes at least 3 times as many
 *    samples to fall 4d below the level as to fall d; d = max(2q, 5 % of the span) for an exact run
 *    (a straight ramp 4×, a parabolic peak √4 = 2×, the jump of a square edge 1×, closed forms) and
 *    d = max(8b, 5 % of the span) for a noisy one (counted from the band's edge at b: a ramp at least
 *    (32 − 1)/(8 − 1) ≈ 4.4×, a parabola at most (√32 − 1)/(√8 − 1) ≈ 2.55×). When 4d passes half
 *    the span the rule cannot be judged and nothing is flagged. Only the run's core, within b/2 of its
 *    median, counts as flat.
 * 4. The flat samples on a side reach 0.5 % of the record.
 * At full scale rules 2 and 3 are not asked: any flat run there is the screen's edge, whatever the shape.
 * Full scale: the channel's limits when the capture states them (a level held at or past an edge, or
 * within 0.5 % of the span inside it, see statedEdge); otherwise a level that sits on a
 * converter end code (|level/q| = 2^(b−1) or 2^(b−1) − 1 for b = 8, 10, 12, 14 or 16 bits, with every
 * code of the record inside ±2^(b−1), q the step between the level and the next value), or a record
 * whose codes fill 2^b − 1 steps or more from end to end (also where the capture states a full scale). A scope
 * whose vertical offset moves its codes off zero is only recognised from the full scale it states.
 */
import type { FlatTop } from '../../types/index.js';
import { extremes, quantiles } from './quantiles.js';

const BAND_SIGMAS = 6;
const DWELL_RATIO = 1.5;
const RAMP_RATIO = 3;
const MIN_SHARE = 0.005;
const MIN_RUN = 3;
/** How far inside a stated full-scale edge a held level still counts as on it, as a share of the span (statedEdge). */
const EDGE_SHARE = 0.005;
/** Converter widths of bench oscilloscopes and digitisers. */
const CONVERTER_BITS = [8, 10, 12, 14, 16] as const;

export interface FlatTopOptions {
  /** Standard deviation of the additive noise, in the samples' unit. */
  readonly noise: number;
  /** Span of the waveform (e.g. between its 0.5 % and 99.5 % quantiles). */
  readonly span: number;
  /** The capture's full-scale limits for this channel, when it states them. */
  readonly fullScale?: { readonly low: number; readonly high: number };
  /** The record's extremes, when the caller has them (saves a pass). */
  readonly range?: { readonly min: number; readonly max: number };
  /**
   * Only the scope's clipping is wanted (a square's or pulse's flat states are its shape): a side
   * whose level is not at full scale is not searched, as its runs could only be the circuit's.
   */
  readonly scopeRangeOnly?: boolean;
}

export function flatTops(samples: Float64Array, options: FlatTopOptions): FlatTop[] {
  const { noise, span, fullScale, scopeRangeOnly = false } = options;
  const { min, max } = options.range ?? extremes(samples);
  if (!(max > min) || !(span > 0)) return [];
  const out: FlatTop[] = [];
  // Values printed with 15 digits differ in the last one: "exactly" flat means within this much.
  const equal = 1e-9 * Math.max(Math.abs(max), Math.abs(min), span);
  const held = heldLevels(samples, equal);
  // A stray sample past a flat run (a simulator's or scope's overshoot) must not hide it: the exact
  // level is the highest (lowest) one held for MIN_RUN samples in a row.
  const levels = { high: held.high ?? max, low: held.low ?? min };
  const steps = stepsInside(samples, levels, { max, min }, equal);
  let tails: number[] | null = null;
  for (const dir of [1, -1] as const) {
    const side = dir > 0 ? 'high' : 'low';
    const extreme = dir > 0 ? max : min;
    const level = dir > 0 ? levels.high : levels.low;
    const q = dir > 0 ? steps.belowHigh : steps.aboveLow;
    // A converter end code is the scope's edge whatever the preamble states (it may be misread).
    const from = (fullScale ? statedEdge(side, level, fullScale) : null) ?? fullScaleOf(extreme, level === extreme ? q : dir > 0 ? steps.belowMax : steps.aboveMin, max, min);
    if (from === null && scopeRangeOnly) continue;
    const noisy = { band: BAND_SIGMAS * noise, unit: BAND_SIGMAS * noise, d: Math.max(8 * BAND_SIGMAS * noise, 0.05 * span) };
    const exact = { band: equal, unit: q, d: Math.max(2 * q, 0.05 * span) };
    // At full scale any flat run is the screen's edge, whatever the shape; inside it, rules 2 and 3 apply.
    let found = flatSamples(samples, level, dir, exact, span, from === null);
    if (found.count < MIN_SHARE * samples.length) {
      // A noisy flat is sought below its 0.1 % extreme, so a lone spike past it does not hide it.
      tails ??= quantiles(samples, [0.001, 0.999], { min, max });
      found = flatSamples(samples, from === null ? (dir > 0 ? tails[1] : tails[0]) : extreme, dir, noisy, span, from === null);
    }
    if (found.count < MIN_SHARE * samples.length) continue;
    out.push({
      side,
      level: found.sum / found.count,
      share: found.count / samples.length,
      samples: found.count,
      cause: from ? 'scope-range' : 'circuit',
      ...(from ? { fullScaleFrom: from } : {}),
    });
  }
  return out;
}

interface Scales {
  /** Width of the flat band below the level (0: exactly equal samples). */
  readonly band: number;
  /** Depth unit of rule 2. */
  readonly unit: number;
  /** Depth d of rule 3. */
  readonly d: number;
}

/**
 * How far the samples lie below (dir = 1) or above (dir = −1) a level: depth(i) = dir·(level − x[i]).
 * Passed as the level and the direction, not as a closure: a fresh closure per call made V8 throw
 * away the optimised loops that had inlined the previous one (seen with --trace-deopt).
 */
interface Side {
  readonly level: number;
  readonly dir: 1 | -1;
}

/** Samples (and their sum) in runs at `level` that pass rules 1 to 3 at the given scales. */
function flatSamples(x: Float64Array, level: number, dir: 1 | -1, sc: Scales, span: number, judge: boolean): { count: number; sum: number } {
  const side: Side = { level, dir };
  const scratch = { values: new Float64Array(0) };
  // Too coarse to follow a ramp over 4d within half the span: rule 3 cannot be judged.
  if (judge && !(4 * sc.d <= span / 2 && sc.unit > 0)) return { count: 0, sum: 0 };
  let count = 0;
  let sum = 0;
  let i = 0;
  const n = x.length;
  const band = sc.band;
  const edge = level - dir * band;
  while (i < n) {
    // The walks over the record are small functions of their own: V8 compiles a small hot loop in a
    // few milliseconds, while this whole function (with the rules inlined) took up to 90 ms to
    // compile under load, its first long pass running unoptimised meanwhile (--trace-opt).
    i = dir > 0 ? nextAtOrAbove(x, i, edge) : nextAtOrBelow(x, i, edge);
    if (i >= n) break;
    const a = i;
    i = endOfBand(x, i, level, dir, band);
    const run = i - a;
    if (run < MIN_RUN) continue;
    if (judge) {
      if (!dwellsLonger(x, a, i, side, 4 * sc.unit)) continue;
      if (!cutsRamp(x, a - 1, -1, side, sc.d) && !cutsRamp(x, i, 1, side, sc.d)) continue;
    }
    const core = flatCore(x, a, i, band / 2, scratch);
    count += core.count;
    sum += core.sum;
  }
  return { count, sum };
}

/** Index of the first sample from `i` on at or above `edge` (x.length when none; NaN never is). */
function nextAtOrAbove(x: Float64Array, i: number, edge: number): number {
  const n = x.length;
  while (i < n && !(x[i] >= edge)) i++;
  return i;
}

function nextAtOrBelow(x: Float64Array, i: number, edge: number): number {
  const n = x.length;
  while (i < n && !(x[i] <= edge)) i++;
  return i;
}

/** Index of the first sample from `i` on deeper than `band` below (dir 1) or above (dir −1) `level`. */
function endOfBand(x: Float64Array, i: number, level: number, dir: 1 | -1, band: number): number {
  const n = x.length;
  while (i < n && dir * (level - x[i]) <= band) i++;
  return i;
}

/**
 * The run's samples within `half` of its median: the flat itself, without the ends of the ramps that
 * lie inside the band (noise on a flat spreads ±3σ = half the band around its level).
 */
function flatCore(x: Float64Array, a: number, b: number, half: number, scratch: { values: Float64Array }): { count: number; sum: number } {
  // The median by selection in a buffer kept across runs: sorting a copy of every run (tens of
  // thousands of samples on each state of a square) cost more than the rest of the search.
  if (scratch.values.length < b - a) scratch.values = new Float64Array(Math.max(b - a, 2 * scratch.values.length));
  const median = selectInPlace(scratch.values, x, a, b, (b - a) >> 1);
  let count = 0;
  let sum = 0;
  for (let j = a; j < b; j++) {
    if (Math.abs(x[j] - median) > half) continue;
    count++;
    sum += x[j];
  }
  return { count, sum };
}

/**
 * The k-th smallest of x[a…b) (the value a sort would put at index k), by Hoare's selection
 * (C. A. R. Hoare, "Algorithm 65: Find", CACM 4(7), 1961) on a copy in `work`; x holds no NaN here
 * (every run sample lies within its band).
 */
function selectInPlace(work: Float64Array, x: Float64Array, a: number, b: number, k: number): number {
  const n = b - a;
  for (let i = 0; i < n; i++) work[i] = x[a + i];
  let lo = 0;
  let hi = n - 1;
  while (hi > lo) {
    const pivot = work[(lo + hi) >> 1];
    let i = lo;
    let j = hi;
    while (i <= j) {
      while (work[i] < pivot) i++;
      while (work[j] > pivot) j--;
      if (i <= j) {
        const t = work[i];
        work[i] = work[j];
        work[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else break;
  }
  return work[k];
}

function cutsRamp(x: Float64Array, from: number, by: number, side: Side, d: number): boolean {
  const shallow = samplesToDepth(x, from, by, side, d);
  const deep = samplesToDepth(x, from, by, side, 4 * d);
  return shallow > 0 && deep >= RAMP_RATIO * shallow;
}

/**
 * Rule 2: the run [a, b) lasts longer than DWELL_RATIO times the samples the waveform takes to reach
 * `depth` below it on either side (a side that never gets there, at the record's end or a gap, says
 * nothing; neither side saying anything fails the rule). Each walk stops once its count alone would
 * fail the rule, so a long state broken by noise into many short runs costs time linear in the
 * record, not in runs × state length (a 4M-row pulse took seconds); a side stopped that way is
 * walked in full only when the other side alone would pass the rule, which is the one case where
 * how the stopped side ends (a count or nothing) decides.
 */
function dwellsLonger(x: Float64Array, a: number, b: number, side: Side, depth: number): boolean {
  const run = b - a;
  const cap = Math.floor(run / DWELL_RATIO) + 1;
  let before = a > 0 ? samplesToDepth(x, a - 1, -1, side, depth, cap) : -1;
  let after = b < x.length ? samplesToDepth(x, b, 1, side, depth, cap) : -1;
  if (before === STOPPED && after === STOPPED) return false;
  if (before === STOPPED || after === STOPPED) {
    const other = before === STOPPED ? after : before;
    if (other < 0 || run <= DWELL_RATIO * other) return false;
    if (before === STOPPED) before = samplesToDepth(x, a - 1, -1, side, depth, Infinity);
    else after = samplesToDepth(x, b, 1, side, depth, Infinity);
  }
  if (before < 0 && after < 0) return false;
  return run > DWELL_RATIO * Math.max(before, after);
}

/** samplesToDepth's answer when it stopped at its limit without reaching the depth. */
const STOPPED = Number.POSITIVE_INFINITY;

/** Samples from `from` (counting it) until the depth is reached; −1 at the record's end or a gap; STOPPED past `limit`. */
function samplesToDepth(x: Float64Array, from: number, by: number, side: Side, depth: number, limit = Number.POSITIVE_INFINITY): number {
  const { level, dir } = side;
  for (let k = 1, j = from; j >= 0 && j < x.length; k++, j += by) {
    if (k > limit) return STOPPED;
    const dd = dir * (level - x[j]);
    if (dd !== dd) return -1;
    if (dd >= depth) return k;
  }
  return -1;
}

/**
 * Whether a level held on this side is at the full scale the capture states: at or past its edge, or
 * inside it by at most 0.5 % of the span. A scope clips at its converter's end, which lies at or
 * beyond the screen's edge (some digitise ±5.12 div of a ±5 div screen), never inside it; the 0.5 %
 * covers a preamble's settings printed to 3 significant digits (a half unit of the last digit of
 * volts per division is at most 0.5 % of it, 0.25 % of the span) and an 8-bit converter whose end
 * code sits one step (0.5 % of 200 steps on screen) inside the edge. Common practice (no source).
 */
function statedEdge(side: 'high' | 'low', level: number, fullScale: NonNullable<FlatTopOptions['fullScale']>): FlatTop['fullScaleFrom'] | null {
  const tol = EDGE_SHARE * (fullScale.high - fullScale.low);
  const at = side === 'high' ? level >= fullScale.high - tol : level <= fullScale.low + tol;
  return at ? 'preamble' : null;
}

/** Whether `level` sits on a converter end code (rule above), null when it lies inside the range. */
function fullScaleOf(level: number, q: number, max: number, min: number): FlatTop['fullScaleFrom'] | null {
  if (!(q > 0) || q < 1e-5 * (max - min)) return null;
  const codes = (max - min) / q;
  const code = level / q;
  const whole = (v: number): boolean => Math.abs(v - Math.round(v)) < 1e-3;
  if (!whole(code) || !whole(codes)) return null;
  const lowCode = Math.round(min / q);
  const highCode = Math.round(max / q);
  for (const b of CONVERTER_BITS) {
    const half = 2 ** (b - 1);
    // Codes −2^(b−1) … 2^(b−1) − 1 (two's complement), or ±2^(b−1) where an export scales them
    // symmetrically; the record must fit in them.
    if (lowCode < -half || highCode > half) continue;
    const c = Math.abs(Math.round(code));
    if (c === half || c === half - 1 || Math.round(codes) >= 2 ** b - 1) return 'converter-codes';
  }
  return null;
}

/**
 * Distances from the held levels to the nearest other value on the inside (more than `equal` away),
 * and from the extremes to theirs (any other value), in one pass: the step q of rules 2 and 3, and the
 * step fullScaleOf reads converter codes with. Infinity where there is none.
 */
function stepsInside(
  x: Float64Array,
  levels: { readonly high: number; readonly low: number },
  range: { readonly max: number; readonly min: number },
  equal: number,
): { belowHigh: number; belowMax: number; aboveLow: number; aboveMin: number } {
  const { high, low } = levels;
  const { max, min } = range;
  let belowHigh = Infinity;
  let belowMax = Infinity;
  let aboveLow = Infinity;
  let aboveMin = Infinity;
  for (let i = 0; i < x.length; i++) {
    const v = x[i];
    const dh = high - v;
    if (dh > equal && dh < belowHigh) belowHigh = dh;
    const dm = max - v;
    if (dm > 0 && dm < belowMax) belowMax = dm;
    const dl = v - low;
    if (dl > equal && dl < aboveLow) aboveLow = dl;
    const dn = v - min;
    if (dn > 0 && dn < aboveMin) aboveMin = dn;
  }
  return { belowHigh, belowMax, aboveLow, aboveMin };
}

/** The highest and lowest values held within `equal` for MIN_RUN samples in a row (null where none), in one pass. */
function heldLevels(x: Float64Array, equal: number): { high: number | null; low: number | null } {
  let high = -Infinity;
  let low = Infinity;
  let run = 1;
  for (let i = 1; i < x.length; i++) {
    const v = x[i];
    run = Math.abs(v - x[i - 1]) <= equal ? run + 1 : 1;
    if (run < MIN_RUN) continue;
    if (v > high) high = v;
    if (v < low) low = v;
  }
  return { high: high > -Infinity ? high : null, low: low < Infinity ? low : null };
}
