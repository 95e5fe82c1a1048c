/**
 * The time base of a capture: from its time column, else from the user's --interval/--sample-rate,
 * else from the preamble. A non-uniform x column is resampled onto a uniform grid (with a warning).
 */
import type { CaptureLayout, CaptureWarning, ReadCaptureOptions } from '../types/index.js';
import { captureError } from './errors.js';
import type { MetadataTiming } from './metadata.js';
import { gridLength, medianStep, resampleUniform } from './resample.js';
import type { Resampled } from './resample.js';
import type { AxisResult } from './timeAxis.js';

/** A resampled grid may hold at most this many times the rows read (and never more than 2^27 points). */
const MAX_GRID_GROWTH = 8;
const MAX_GRID_POINTS = 2 ** 27;
/** Fewest rows from which a time base is rebuilt out of repeated stamps. */
const MIN_REBUILT_ROWS = 16;

export interface TimingInput {
  readonly file: string;
  readonly axis: AxisResult | null;
  readonly xKind: 'time' | 'index' | null;
  /** Factor from the time column's unit to seconds. */
  readonly xScale: number;
  readonly meta: MetadataTiming;
  readonly options: ReadCaptureOptions;
  readonly channels: Float64Array[];
  readonly firstDataLine: number;
}

export interface Timing {
  readonly startTime: number;
  readonly sampleInterval: number;
  readonly timing: CaptureLayout['timing'];
  readonly resampled: boolean;
  readonly channels: Float64Array[];
  readonly warnings: CaptureWarning[];
}

/** The interval the user or the preamble gives, or null; throws when an x column is missing too. */
export function givenInterval(options: ReadCaptureOptions, meta: MetadataTiming): { value: number; from: 'option' | 'metadata' } | null {
  if (options.interval !== undefined) return { value: options.interval, from: 'option' };
  if (options.sampleRate !== undefined) return { value: 1 / options.sampleRate, from: 'option' };
  return meta.interval ? { value: meta.interval.value, from: 'metadata' } : null;
}

export function noTimeBase(file: string, line: number) {
  return captureError('no-time-base', file, {
    line,
    problem: 'the capture has no time column and states no sample interval or rate',
    expected: 'a time column (header such as "Time (s)"), a preamble line such as "sample interval,1e-6", or a flag',
    fix: 'give the rate the capture was taken at: --sample-rate 1e6 (Hz) or --interval 1e-6 (s)',
  });
}

export function resolveTiming(input: TimingInput): Timing {
  const { axis, xKind, options, meta, file } = input;
  const given = givenInterval(options, meta);
  const warnings: CaptureWarning[] = [];
  if (xKind !== 'time' && given === null) throw noTimeBase(file, input.firstDataLine);
  if (axis && !axis.uniform && axis.firstRepeatLine !== undefined) return rebuildRepeated(input, axis, given);
  const unitScale = xKind === 'time' ? input.xScale : given!.value;
  const timing: CaptureLayout['timing'] = xKind === 'time' ? 'time-column' : given!.from;
  const start = (t0File: number): number => (xKind === 'time' ? t0File * unitScale : meta.startTime ?? 0);
  if (axis === null || axis.uniform) {
    const interval = axis ? axis.step * unitScale : given!.value;
    if (xKind === 'time' && given && Math.abs(given.value - interval) > 1e-3 * interval) {
      warnings.push({
        code: given.from === 'option' ? 'option-ignored' : 'interval-mismatch',
        message: `the time column steps by ${interval} s, but the ${given.from === 'option' ? 'flag gives' : 'preamble states'} ${given.value} s; the time column is used`,
      });
    }
    return { startTime: axis ? start(axis.t0) : start(0), sampleInterval: interval, timing, resampled: false, channels: input.channels, warnings };
  }
  const { times, firstIrregularLine } = axis;
  const step = xKind === 'time' && options.interval !== undefined ? options.interval / unitScale : xKind === 'time' && options.sampleRate !== undefined ? 1 / options.sampleRate / unitScale : medianStep(times);
  const points = gridLength(times, step);
  if (points > Math.min(MAX_GRID_POINTS, MAX_GRID_GROWTH * times.length + 16)) {
    throw captureError('resample-too-large', file, {
      line: firstIrregularLine,
      problem: `the time steps vary so much that a uniform grid at the median step would need ${points} points for ${times.length} rows`,
      expected: 'time steps that vary by less than a factor of about 8 across the capture',
      fix: 'choose the grid step yourself with --interval S (e.g. the simulator\'s maximum step)',
    });
  }
  const r = resampleUniform(times, input.channels, step);
  const interval = r.step * unitScale;
  const dropped = markDropouts(times, r, step);
  if (dropped.points > 0) {
    warnings.push({
      code: 'dropouts',
      message: `${dropped.points} sample(s) are missing in ${dropped.gaps} gap(s) of an otherwise uniform time column (the first after ${dropped.firstAt * unitScale} s); they are kept as gaps, not interpolated, and the longest continuous run is measured`,
    });
  }
  warnings.push({
    code: 'resampled',
    line: firstIrregularLine,
    message: `the ${xKind === 'time' ? 'time' : 'sample-index'} steps are not uniform from line ${firstIrregularLine} on; ${times.length} rows were resampled by linear interpolation onto ${points} points every ${interval} s`,
  });
  return { startTime: start(r.t0), sampleInterval: interval, timing, resampled: true, channels: r.channels, warnings };
}

/**
 * A time column printed with fewer digits than its step needs: each stamp is the true time rounded
 * to the print resolution q, so the true times lie on a uniform grid within q of every stamp. The
 * step is the stated interval when there is one, else the least-squares slope of stamp against row
 * (its error falls as 1/n^1.5, far below q/n); the grid is accepted only when every stamp lies
 * within q of it, else the repeats are real and the column is refused as before.
 */
function rebuildRepeated(input: TimingInput, axis: Extract<AxisResult, { uniform: false }>, given: ReturnType<typeof givenInterval>): Timing {
  const { times, quantum } = axis;
  const scale = input.xScale;
  const n = times.length;
  let d: number;
  if (given) d = given.value / scale;
  else {
    const mi = (n - 1) / 2;
    let mt = 0;
    for (let i = 0; i < n; i++) mt += times[i];
    mt /= n;
    let sxy = 0;
    let sxx = 0;
    for (let i = 0; i < n; i++) {
      sxy += (i - mi) * (times[i] - mt);
      sxx += (i - mi) * (i - mi);
    }
    d = sxy / sxx;
  }
  let a = 0;
  for (let i = 0; i < n; i++) a += times[i] - i * d;
  a /= n;
  let worst = 0;
  for (let i = 0; i < n; i++) worst = Math.max(worst, Math.abs(times[i] - (a + i * d)));
  // Repeats are explained by printing only when the step is finer than the print resolution.
  if (!(d > 0) || n < MIN_REBUILT_ROWS || d >= quantum || worst > 1.01 * quantum + 1e-12 * Math.abs(times[n - 1])) {
    throw captureError('time-repeated', input.file, {
      line: axis.firstRepeatLine,
      problem: `the time column repeats a value on line ${axis.firstRepeatLine}, and its stamps do not lie on one uniform grid within their printed resolution ${quantum}`,
      expected: 'a time column that increases on every row (or repeats only because it is printed with too few digits)',
      fix: 'export the time with more digits, or drop the time column and give --sample-rate',
    });
  }
  const interval = d * scale;
  const source = given ? (given.from === 'option' ? 'the flag' : 'the preamble') : 'a straight-line fit of the stamps';
  return {
    startTime: a * scale,
    sampleInterval: interval,
    timing: given ? given.from : 'time-column',
    resampled: false,
    channels: input.channels,
    warnings: [
      {
        code: 'time-rebuilt',
        line: axis.firstRepeatLine,
        message: `the time column repeats stamps from line ${axis.firstRepeatLine} on (printed to ${quantum * scale} s, coarser than the ${interval} s step); the uniform time base was rebuilt from the ${n} rows and the interval of ${source}`,
      },
    ],
  };
}

/** A gap longer than this many steps in a uniform time column is a dropout, not jitter or one lost row. */
const DROPOUT_STEPS = 3.5;
/** Share of steps within 0.1 % of the grid step for a time column to count as uniform apart from its gaps. */
const UNIFORM_SHARE = 0.9;

/**
 * Samples lost from a logger or scope record (a gap of several steps in a column that is otherwise
 * uniform): the grid points inside the gap become NaN, so that nothing is made up across it. A
 * simulator's adaptive steps vary everywhere and are left to the interpolation.
 */
function markDropouts(times: Float64Array, r: Resampled, step: number): { points: number; gaps: number; firstAt: number } {
  const none = { points: 0, gaps: 0, firstAt: 0 };
  let even = 0;
  for (let i = 1; i < times.length; i++) if (Math.abs(times[i] - times[i - 1] - step) <= 1e-3 * step) even++;
  if (even < UNIFORM_SHARE * (times.length - 1)) return none;
  let points = 0;
  let gaps = 0;
  let firstAt = 0;
  for (let i = 1; i < times.length; i++) {
    if (times[i] - times[i - 1] <= DROPOUT_STEPS * step) continue;
    if (gaps++ === 0) firstAt = times[i - 1];
    const from = Math.floor((times[i - 1] - r.t0) / step + 1e-9) + 1;
    const to = Math.ceil((times[i] - r.t0) / step - 1e-9) - 1;
    for (let g = from; g <= to; g++) for (const ch of r.channels) ch[g] = NaN;
    points += Math.max(0, to - from + 1);
  }
  return { points, gaps, firstAt };
}
