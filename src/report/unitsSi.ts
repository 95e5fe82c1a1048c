/**
 * Numbers with SI units for records and batch reports: engineering prefixes (k, M, m, µ, n, p) for
 * base units, and a value with its expanded uncertainty rounded as JCGM 100:2008 (GUM) §7.2.6 advises:
 * the uncertainty to two significant digits, the value to the same decimal place.
 */

const PREFIXED = new Set(['Hz', 's', 'V', 'A', 'V/s', 'F', 'Ω']);
const PREFIXES: Readonly<Record<number, string>> = { [-12]: 'p', [-9]: 'n', [-6]: 'µ', [-3]: 'm', 0: '', 3: 'k', 6: 'M', 9: 'G' };

/** Engineering exponent (multiple of 3, −12…9) for showing `v` in `unit`; 0 for units without prefixes. */
export function prefixExponent(v: number, unit: string): number {
  if (!PREFIXED.has(unit) || v === 0 || !Number.isFinite(v)) return 0;
  const e = Math.floor(Math.log10(Math.abs(v)) / 3) * 3;
  return Math.min(9, Math.max(-12, e));
}

function join(num: string, exp: number, unit: string): string {
  const u = `${PREFIXES[exp] ?? ''}${unit}`;
  if (u === '') return num;
  return unit === '%' ? `${num} %` : `${num} ${u}`;
}

/** `261.63 Hz`, `2.0930 kHz`, `14.8 µA`; `—` for null. `digits` significant digits (default 5). */
export function formatQuantity(v: number | null | undefined, unit: string, digits = 5): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  const exp = prefixExponent(v, unit);
  return join(trimExponent(v / 10 ** exp, digits), exp, unit);
}

function trimExponent(x: number, digits: number): string {
  const s = x.toPrecision(digits);
  if (!s.includes('e')) return s;
  // toPrecision switches to e-notation for large/small magnitudes; keep it readable without a prefix.
  return Number(s).toString();
}

/**
 * `261.630 Hz ± 0.010 Hz`: U to two significant digits (GUM §7.2.6), the value to the same place. The
 * prefix steps down towards the base unit while it would need more than three decimals (2093.000 Hz,
 * not 2.093000 kHz).
 */
export function formatMeasured(v: number | null | undefined, U: number | null | undefined, unit: string): string {
  if (v === null || v === undefined || !Number.isFinite(v)) return '—';
  if (U === null || U === undefined || !Number.isFinite(U) || U <= 0) return formatQuantity(v, unit);
  // The prefix fits the larger of value and U, so a small value with a wide U reads `−0.1 mV ± 1.8 mV`.
  let exp = prefixExponent(Math.max(Math.abs(v), U), unit);
  const decimalsAt = (e: number): number => Math.max(0, 1 - Math.floor(Math.log10(U / 10 ** e)));
  while (decimalsAt(exp) > 3 && exp > 0) exp -= 3;
  const decimals = decimalsAt(exp);
  if (decimals > 12) return formatQuantity(v, unit);
  const scale = 10 ** exp;
  const unitText = join('', exp, unit).trim();
  const tail = unitText ? ` ${unitText}` : '';
  return `${(v / scale).toFixed(decimals)}${tail} ± ${(U / scale).toFixed(decimals)}${tail}`;
}

/** A limit as written in a spec: up to six significant digits, trailing zeros dropped (`5.7 V`, `2.0511 kHz`). */
export function formatLimit(v: number, unit: string): string {
  const exp = prefixExponent(v, unit);
  return join(String(Number((v / 10 ** exp).toPrecision(6))), exp, unit);
}

/** Limits as `lower … upper`, `≥ lower` or `≤ upper`. */
export function formatLimits(lower: number | null, upper: number | null, unit: string): string {
  if (lower !== null && upper !== null) return `${formatLimit(lower, unit)} … ${formatLimit(upper, unit)}`;
  if (lower !== null) return `≥ ${formatLimit(lower, unit)}`;
  if (upper !== null) return `≤ ${formatLimit(upper, unit)}`;
  return 'no limits';
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
  return v === null || !Number.isFinite(v) ? '—' : v.toFixed(3);
}

export function formatBytes(n: number): string {
  if (n < 1024) return `${n} B`;
  if (n < 1024 ** 2) return `${(n / 1024).toFixed(1)} KiB`;
  return `${(n / 1024 ** 2).toFixed(1)} MiB`;
}

const LABELS: Readonly<Record<string, string>> = {
  peakToPeak: 'peak-to-peak',
  highLevel: 'high state level',
  lowLevel: 'low state level',
  dcOffset: 'DC offset',
  rms: 'RMS',
  acRms: 'AC RMS',
  riseSlope: 'rising slope',
  fallSlope: 'falling slope',
  slopeRatio: 'slope ratio',
  dutyCycle: 'duty cycle',
  riseTime: 'rise time',
  fallTime: 'fall time',
  thd: 'THD',
  snr: 'SNR',
  sinad: 'SINAD',
  sfdr: 'SFDR',
  enob: 'ENOB',
  humFrequency: 'hum frequency',
  humLevel: 'hum level',
  shapeError: 'shape error',
  evenOddRatio: 'even/odd ratio',
};

/** The trade's name for a measurement id (`peakToPeak` → `peak-to-peak`); unknown ids as they are. */
export function measurementLabel(id: string): string {
  return LABELS[id] ?? id;
}
