/**
 * `spec init`: a starter spec from captures of a known-good unit. Every measurement that applies gets
 * a check, nominal from the capture, tolerance from the option; a value that changes between
 * conditions (frequency) gets its nominal per condition. A tolerance that would leave a golden value
 * less than 2U inside its limits is widened, with a comment, so the golden unit passes its own spec
 * under guarded acceptance rather than only conditionally.
 * Quantities that are "smaller is better" (overshoot, jitter, THD, hum) have no nominal to copy and are
 * left for the user, as the header says.
 */
import { MEASUREMENT_UNITS } from '../types/index.js';
import type { ChannelReport, MeasureReport, MeasurementId } from '../types/index.js';
import { formatQuantity } from './quantity.js';

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

/** How each measurement is turned into a check: relative to its nominal, in % points, or absolute from the swing. */
const POLICY: Partial<Record<MeasurementId, 'relative' | 'points' | 'swing'>> = {
  frequency: 'relative',
  peakToPeak: 'relative',
  amplitude: 'relative',
  maximum: 'relative',
  minimum: 'relative',
  highLevel: 'relative',
  lowLevel: 'swing',
  dcOffset: 'swing',
  rms: 'relative',
  acRms: 'relative',
  riseSlope: 'relative',
  fallSlope: 'relative',
  slopeRatio: 'relative',
  symmetry: 'points',
  dutyCycle: 'points',
  riseTime: 'relative',
  fallTime: 'relative',
};

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
    for (const id of Object.keys(POLICY) as MeasurementId[]) {
      const ms = perCondition.map((p) => ({ condition: p.condition, m: p.channel?.measurements[id], swing: p.channel?.measurements.peakToPeak?.value ?? null }));
      if (ms.every((x) => x.m === undefined)) continue;
      const withheld = ms.find((x) => x.m?.value === null || x.m?.value === undefined);
      if (withheld) {
        skipped.push(`${id}: ${withheld.m?.note ?? 'not reported'} (${withheld.condition})`);
        continue;
      }
      const check = draftCheck(id, ms.map((x) => ({ condition: x.condition, value: x.m!.value as number, u: x.m!.uncertainty, swing: x.swing })), tolerance);
      if (check) checks.push(check);
      else skipped.push(`${id}: no swing to scale an offset tolerance from`);
    }
    return { name: outputName(ch, i), channel: i + 1, channelName: ch.name, shape: ch.shape, checks, skipped };
  });
}

function draftCheck(id: MeasurementId, values: readonly { condition: string; value: number; u: number | null; swing: number | null }[], tol: number): DraftCheck | null {
  const unit = MEASUREMENT_UNITS[id];
  const swing = values.find((v) => v.swing !== null)?.swing ?? null;
  // A level near 0 V (a pulse low, a centred peak) has no meaningful relative tolerance: scale it by the swing.
  const nearZero = unit === 'V' && swing !== null && values.some((v) => Math.abs(v.value) < 0.25 * swing);
  const policy = nearZero ? 'swing' : POLICY[id]!;
  if (policy === 'swing' && swing === null) return null;
  const fromOption = (value: number): number => tol * (policy === 'swing' ? swing! : Math.abs(value));
  // Widen by the smallest factor that leaves every golden value 2U inside its limits (U = 2u, k = 2).
  const factor = Math.max(1, ...values.map((v) => (4 * (v.u ?? 0)) / fromOption(v.value)));
  const widened = factor > 1 + 1e-9;
  const mean = values.reduce((s, v) => s + v.value, 0) / values.length;
  const agree = values.every((v) => Math.abs(v.value - mean) <= (factor * fromOption(v.value)) / 4);
  const nominal = agree ? mean : Object.fromEntries(values.map((v) => [v.condition, v.value]));
  const relative = policy === 'relative';
  const tolerance = relative ? tol * factor : Math.max(...values.map((v) => factor * fromOption(v.value)));
  return { measure: id, nominal, tolerance, unit, relative, widened };
}

function outputName(ch: ChannelReport, i: number): string {
  const clean = ch.name.trim().toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '');
  return /^[a-z]/.test(clean) ? clean : `output${i + 1}`;
}

/** Value text for the spec file: six significant digits, read back within 1e-5 relative. */
export const written = (value: number, unit: string): string => (unit === '' ? String(Number(value.toPrecision(6))) : formatQuantity(value, unit, 6));
