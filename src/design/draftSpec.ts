/**
 * `spec init`: a starter spec from captures of a known-good unit. Each output gets one reading per
 * quantity a design states for its shape (a triangle's frequency, swing, offset and symmetry; a
 * pulse's frequency, levels, duty and edges), never six readings of one swing. The nominal comes
 * from the golden capture, rounded to four significant digits; a value that changes between
 * conditions (frequency) gets its nominal per condition.
 *
 * How each limit is set (written beside it in the draft): the half-width is the larger of the
 * `--tolerance` (the floor) and 3U, U being the golden reading's expanded uncertainty (k = 2,
 * GUM 6.2). 3U covers the golden reading's own U, the next good unit's U (its reading of the same
 * value scatters as much) and the guard band of guarded acceptance (ILAC-G8:2019 §4.2.2), so a
 * second good unit that reads what the golden one read passes outright rather than conditionally.
 * Quantisation counts: a one-code difference between two units is inside U when the capture's
 * resolution is in U. Quantities that are "smaller is better" (overshoot, jitter, THD, hum) have
 * no nominal to copy and are left for the user, as the header says.
 */
import { MEASUREMENT_UNITS } from '../types/index.js';
import type { ChannelReport, MeasureReport, MeasurementId, Shape } from '../types/index.js';
import { formatSpecQuantity } from './quantity.js';

export interface GoldenCapture {
  readonly path: string;
  readonly condition: string;
  readonly report: MeasureReport;
}

export interface DraftOptions {
  /** Relative tolerance, e.g. 0.02 for 2 %. */
  readonly tolerance: number;
  readonly pattern: string;
  readonly name?: string;
}

type Policy = 'relative' | 'points' | 'swing';

/**
 * The readings a design states per shape, and how each is toleranced: relative to its nominal, in
 * % points, or absolute from the swing (levels near 0 V have no meaningful relative tolerance).
 * Common practice for oscillator specs (no source): one reading per quantity.
 */
const READINGS: Readonly<Record<Shape, readonly (readonly [MeasurementId, Policy])[]>> = {
  triangle: [['frequency', 'relative'], ['peakToPeak', 'relative'], ['dcOffset', 'swing'], ['symmetry', 'points']],
  sawtooth: [['frequency', 'relative'], ['peakToPeak', 'relative'], ['dcOffset', 'swing']],
  sine: [['frequency', 'relative'], ['peakToPeak', 'relative'], ['dcOffset', 'swing']],
  square: [['frequency', 'relative'], ['highLevel', 'relative'], ['lowLevel', 'swing'], ['dutyCycle', 'points'], ['riseTime', 'relative'], ['fallTime', 'relative']],
  pulse: [['frequency', 'relative'], ['highLevel', 'relative'], ['lowLevel', 'swing'], ['dutyCycle', 'points'], ['riseTime', 'relative'], ['fallTime', 'relative']],
  unknown: [['frequency', 'relative'], ['peakToPeak', 'relative'], ['dcOffset', 'swing']],
};

/** The golden reading's U is multiplied by this for the least half-width (see the header). */
const U_MULTIPLE = 3;
/** Significant digits of a drafted nominal: enough for a 0.1 % tolerance, few enough to read. */
export const NOMINAL_DIGITS = 4;

export interface DraftCheck {
  readonly measure: MeasurementId;
  /** One nominal when the conditions agree, else one per condition. */
  readonly nominal: number | Readonly<Record<string, number>>;
  /** A fraction of the nominal when `relative`, else absolute in `unit`. */
  readonly tolerance: number;
  readonly unit: string;
  readonly relative: boolean;
  readonly widened: boolean;
}

export interface DraftOutput {
  readonly name: string;
  readonly channel: number;
  readonly channelName: string;
  readonly shape: string;
  readonly checks: readonly DraftCheck[];
  /** Measurements left out, with why. */
  readonly skipped: readonly string[];
}

/** The checks a golden unit supports, per output (one output per channel of the captures). */
export function draftOutputs(golden: readonly GoldenCapture[], tolerance: number): DraftOutput[] {
  const first = golden[0]?.report;
  if (!first) throw new RangeError('draftOutputs: no golden captures');
  return first.channels.map((ch, i) => {
    const perCondition = golden.map((g) => ({ condition: g.condition, channel: g.report.channels[i] }));
    const checks: DraftCheck[] = [];
    const skipped: string[] = [];
    for (const [id, policy] of READINGS[ch.shape]) {
      const ms = perCondition.map((p) => ({ condition: p.condition, m: p.channel?.measurements[id], swing: p.channel?.measurements.peakToPeak?.value ?? null }));
      if (ms.every((x) => x.m === undefined)) continue;
      const withheld = ms.find((x) => x.m?.value === null || x.m?.value === undefined);
      if (withheld) {
        skipped.push(`${id}: ${withheld.m?.note ?? 'not reported'} (${withheld.condition})`);
        continue;
      }
      const check = draftCheck(id, policy, ms.map((x) => ({ condition: x.condition, value: x.m!.value as number, u: x.m!.uncertainty, swing: x.swing })), tolerance);
      if (check) checks.push(check);
      else skipped.push(`${id}: no swing to scale an offset tolerance from`);
    }
    return { name: outputName(ch, i), channel: i + 1, channelName: ch.name, shape: ch.shape, checks, skipped };
  });
}

function draftCheck(id: MeasurementId, given: Policy, values: readonly { condition: string; value: number; u: number | null; swing: number | null }[], tol: number): DraftCheck | null {
  const unit = MEASUREMENT_UNITS[id];
  const swing = values.find((v) => v.swing !== null)?.swing ?? null;
  // A level near 0 V (a pulse low, a centred peak) has no meaningful relative tolerance: scale it by the swing.
  const nearZero = unit === 'V' && swing !== null && values.some((v) => Math.abs(v.value) < 0.25 * swing);
  const policy = nearZero ? 'swing' : given;
  if (policy === 'swing' && swing === null) return null;
  const nominalOf = (v: number): number => roundTo(v, NOMINAL_DIGITS);
  const fromOption = (value: number): number => tol * (policy === 'swing' ? swing! : Math.abs(value));
  // Half-width per value: the option, or 3U (U = 2u) plus what rounding the nominal moved it, if larger.
  const least = (v: { value: number; u: number | null }): number => U_MULTIPLE * 2 * (v.u ?? 0) + Math.abs(v.value - nominalOf(v.value));
  const factor = Math.max(1, ...values.map((v) => least(v) / fromOption(v.value)));
  const widened = factor > 1 + 1e-9;
  const mean = values.reduce((s, v) => s + v.value, 0) / values.length;
  // Conditions agree when one nominal leaves each of them as far inside as its own would (3U rule).
  const agree = values.every((v) => Math.abs(v.value - mean) + least(v) <= factor * fromOption(v.value));
  const nominal = agree ? nominalOf(mean) : Object.fromEntries(values.map((v) => [v.condition, nominalOf(v.value)]));
  const relative = policy === 'relative';
  // Rounded up, never tighter than computed.
  const tolerance = relative ? roundUp(tol * factor, 2) : roundUp(Math.max(...values.map((v) => factor * fromOption(v.value))), 2);
  return { measure: id, nominal, tolerance, unit, relative, widened };
}

const roundTo = (x: number, digits: number): number => (x === 0 ? 0 : Number(x.toPrecision(digits)));

/** x rounded up (away from zero) to `digits` significant digits. */
function roundUp(x: number, digits: number): number {
  if (x === 0) return 0;
  const step = 10 ** (Math.floor(Math.log10(Math.abs(x))) - digits + 1);
  const up = Math.ceil(x / step - 1e-9) * step;
  return Number(up.toPrecision(digits));
}

function outputName(ch: ChannelReport, i: number): string {
  const clean = ch.name.trim().toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');
  return /^[a-z]/.test(clean) ? clean : `output${i + 1}`;
}

/** Value for the spec file: a number when the quantity has no unit (never a quoted string), else text such as "5.938 V". */
export const written = (value: number, unit: string): string | number => (unit === '' ? Number(value.toPrecision(NOMINAL_DIGITS)) : formatSpecQuantity(value, unit, NOMINAL_DIGITS));
