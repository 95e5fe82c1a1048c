/**
 * Numbers with SI units for records and batch reports, through the one shared formatter
 * (`src/types/quantityText.ts`), plus times, dates, fractions and sizes.
 */

import {
  formatInPrefix,
  formatLimitsIn,
  formatMarginIn,
  formatMeasured as measuredText,
  formatSignificant,
  group,
  measurementLabel as labelOf,
  prefixExponent as prefixFor,
} from '../types/index.js';

/** Engineering exponent (multiple of 3, −12…9) for showing `v` in `unit`; 0 for units without prefixes. */
export function prefixExponent(v: number, unit: string): number {
  return prefixFor(v, unit);
}

/** `261.63 Hz`, `2093 Hz`, `14.8 µA`; `—` for null. `digits` significant digits (default 5), trailing zeros dropped. */
export function formatQuantity(v: number | null | undefined, unit: string, digits = 5): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return formatSignificant(v, unit, digits);
}

/** `261.630 Hz ± 0.010 Hz`: U rounded up to two significant digits (GUM §7.2.6), the value to the same place; `—` for null. */
export function formatMeasured(v: number | null | undefined, U: number | null | undefined, unit: string): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  return measuredText(v, U === undefined ? null : U, unit);
}

/** The prefix a measured value is shown in (from the larger of value and U), for its limits and margin. */
export function valueExponent(v: number | null | undefined, U: number | null | undefined, unit: string): number | undefined {
  if (v === null || v === undefined || !Number.isFinite(v)) return undefined;
  return prefixFor(Math.max(Math.abs(v), U !== null && U !== undefined && U > 0 ? U : 0), unit);
}

/** A limit as written in a spec, in the prefix given (the measured value's) or its own. */
export function formatLimit(v: number, unit: string, exponent?: number): string {
  return formatInPrefix(v, unit, exponent ?? prefixFor(v, unit));
}

/** Limits as `lower … upper`, `≥ lower` or `≤ upper`, in the prefix given or that of the larger limit. */
export function formatLimits(lower: number | null, upper: number | null, unit: string, exponent?: number): string {
  const e = exponent ?? prefixFor(Math.max(Math.abs(lower ?? 0), Math.abs(upper ?? 0)), unit);
  return formatLimitsIn(lower, upper, unit, e);
}

/** The magnitude that sets one prefix for a row of batch statistics: the largest of its limits and values. */
export function scaleOf(m: { mean: number | null; min: number | null; max: number | null; lower: number | null; upper: number | null }): number | null {
  const xs = [m.mean, m.min, m.max, m.lower, m.upper].filter((x): x is number => x !== null && Number.isFinite(x)).map(Math.abs);
  return xs.length ? Math.max(...xs) : null;
}

/** Batch statistics of one measurement, all in one prefix (from `scaleOf`) so the columns compare: `digits` significant digits; `—` for null. */
export function formatStat(v: number | null, unit: string, mean: number | null, digits = 6): string {
  if (v === null || !Number.isFinite(v)) return '—';
  return formatInPrefix(v, unit, prefixFor(mean ?? v, unit), digits);
}

/** A margin, always signed, in the prefix given or its own. */
export function formatMargin(m: number | null, unit: string, exponent?: number): string {
  return m === null || !Number.isFinite(m) ? '—' : formatMarginIn(m, unit, exponent ?? prefixFor(m, unit));
}

/**
 * A stored time (UTC) shown in the local time zone with its offset, `2026-03-02 10:15 +01:00`, so the
 * bench reads its own clock and the instant stays unambiguous; at offset zero it reads `… 09:15 UTC`.
 * The offset is the zone's at that instant (summer time included). `offsetMinutes` (east of UTC)
 * overrides the zone, for documents that must show one fixed offset.
 */
export function formatTime(iso: string, offsetMinutes?: number): string {
  const d = new Date(iso);
  if (Number.isNaN(d.getTime())) return iso;
  const offset = offsetMinutes ?? -d.getTimezoneOffset();
  const shifted = new Date(d.getTime() + offset * 60_000).toISOString();
  const sign = offset < 0 ? '-' : '+';
  const hh = String(Math.floor(Math.abs(offset) / 60)).padStart(2, '0');
  const mm = String(Math.abs(offset) % 60).padStart(2, '0');
  return `${shifted.slice(0, 10)} ${shifted.slice(11, 16)} ${offset === 0 ? 'UTC' : `${sign}${hh}:${mm}`}`;
}

export function formatDate(iso: string): string {
  return formatTime(iso).slice(0, 10);
}

/** `83 %` style yield, `—` with no units. */
export function formatFraction(f: number | null, digits = 1): string {
  return f === null ? '—' : `${(100 * f).toFixed(digits)} %`;
}

/** A plain number for a statistic without unit (Cp, Cpk): 3 decimals, `—` for null. */
export function formatIndex(v: number | null): string {
  // The house minus sign and digit groups (one formatter): '−0.082', '35 777.000'.
  return v === null || !Number.isFinite(v) ? '—' : group(v.toFixed(3));
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 ** 2) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 ** 2).toFixed(1)} MiB`;
}

/** The one display name of a measurement id (`src/types/measurementLabels.ts`); unknown ids as they are. */
export function measurementLabel(id: string): string {
  return labelOf(id);
}
