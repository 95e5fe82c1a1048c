/**
 * Tolerance limits from what the user wrote: nominal ± tolerance (absolute with a unit, or %), or
 * min and/or max (one-sided allowed). A condition may override the output's limit; fields are merged
 * before resolving, and each problem points at the field it came from.
 *
 * A tolerance in % is relative to the nominal, except for checks whose value is itself a percentage
 * (duty cycle, symmetry, THD …): there "1 %" means one percentage point, which is what a bench user
 * means by "duty 50 % ± 1 %". A % tolerance on a level in dB has no meaning and is refused.
 */
import { parseQuantity, valueIn } from './quantity.js';
import type { SpecIssue, SpecPath } from './specIssues.js';
import { formatPath } from './specIssues.js';
import type { Limit } from './specTypes.js';
import { impossibleLimit } from './physicalRange.js';
import type { ErrorCode } from '../types/index.js';

export type LimitKey = 'nominal' | 'tolerance' | 'min' | 'max';
export interface Sourced {
  readonly raw: string | number;
  readonly path: SpecPath;
}
export type FieldSet = Partial<Record<LimitKey, Sourced>>;

const KEYS: readonly LimitKey[] = ['nominal', 'tolerance', 'min', 'max'];

/** The limit fields present in a raw object, each with its path. */
export function fieldsAt(raw: unknown, path: SpecPath): FieldSet {
  const out: Partial<Record<LimitKey, Sourced>> = {};
  if (raw === null || typeof raw !== 'object') return out;
  for (const k of KEYS) {
    const v = (raw as Record<string, unknown>)[k];
    if (typeof v === 'string' || typeof v === 'number') out[k] = { raw: v, path: [...path, k] };
  }
  return out;
}

export function hasLimit(f: FieldSet): boolean {
  return KEYS.some((k) => f[k] !== undefined);
}

/** A condition's fields over the output's: min/max replace the whole limit, nominal/tolerance fill in. */
export function mergeFields(base: FieldSet, over: FieldSet): FieldSet {
  if (over.min || over.max) return over;
  if (over.nominal || over.tolerance) return { nominal: over.nominal ?? base.nominal, tolerance: over.tolerance ?? base.tolerance };
  return base;
}

export const UNIT_EXAMPLES: Readonly<Record<string, string>> = {
  Hz: '261.63 Hz',
  V: '6 V',
  s: '20 µs',
  '%': '50 %',
  dB: '-40 dB',
  dBc: '-40 dBc',
  'V/s': '25 kV/s',
  bits: '8 bits',
  A: '14.8 µA',
  F: '4.7 nF',
  '': '1.0',
};

/** A value in the given SI unit, or undefined after recording an issue. */
export function readValue(f: Sourced, unit: string, what: string, issues: SpecIssue[]): number | undefined {
  const q = parseQuantity(f.raw);
  const p = formatPath(f.path);
  const example = UNIT_EXAMPLES[unit] ?? `a number in ${unit}`;
  const v = q ? valueIn(q, unit) : null;
  if (q && v !== null) return v;
  issues.push({
    code: q ? 'spec.wrong-unit' : 'spec.bad-value',
    path: f.path,
    problem: q ? `${p}: "${f.raw}" is in ${q.unit}, but ${what} is in ${unit || 'no unit'}` : `${p}: "${f.raw}" is not a number with a unit`,
    expected: `a value in ${unit || 'no unit (a plain number)'}, e.g. "${example}"`,
    fix: `write ${p} as e.g. "${example}"`,
  });
  return undefined;
}

function readTolerance(f: Sourced, unit: string, nominal: number, what: string, issues: SpecIssue[]): number | undefined {
  const text = typeof f.raw === 'string' ? f.raw.trim().replace(/^(±|\+\/-)\s*/, '') : f.raw;
  const q = parseQuantity(text);
  const p = formatPath(f.path);
  let abs: number | undefined;
  if (q && q.unit === '%' && unit !== '%') {
    if (unit === 'dB' || unit === 'dBc' || nominal === 0) {
      issues.push({
        code: 'spec.bad-tolerance',
        path: f.path,
        problem: `${p}: a tolerance in % has no meaning for ${what} ${unit === 'dB' || unit === 'dBc' ? `in ${unit}` : 'around a nominal of 0'}`,
        expected: `an absolute tolerance in ${unit}, e.g. "3 ${unit}"`,
        fix: `write ${p} in ${unit}, or give min/max instead`,
      });
      return undefined;
    }
    abs = (Math.abs(nominal) * q.value) / 100;
  } else {
    abs = readValue({ raw: text, path: f.path }, unit, what, issues);
  }
  if (abs === undefined) return undefined;
  if (abs > 0) return abs;
  issues.push({ code: 'spec.bad-tolerance', path: f.path, problem: `${p}: a tolerance must be more than zero`, expected: 'a positive tolerance, e.g. "1.5 %"', fix: `write ${p} as a positive value` });
  return undefined;
}

/** Resolve merged fields into limits; undefined after recording issues (pointing at `where` when nothing was given). */
export function resolveLimit(f: FieldSet, unit: string, what: string, where: SpecPath, issues: SpecIssue[]): Limit | undefined {
  const at = formatPath(where);
  const fail = (code: ErrorCode, problem: string, fix: string): undefined => {
    issues.push({ code, path: where, problem: `${at}: ${problem}`, expected: 'min, max, or nominal with tolerance', fix });
    return undefined;
  };
  if (f.tolerance && (f.min || f.max)) return fail('spec.limit-conflict', 'both a tolerance and min/max are given', 'keep either the tolerance or min/max');
  const nominal = f.nominal ? readValue(f.nominal, unit, what, issues) : null;
  if (f.min || f.max) {
    const lower = f.min ? readValue(f.min, unit, what, issues) : null;
    const upper = f.max ? readValue(f.max, unit, what, issues) : null;
    if (lower === undefined || upper === undefined || nominal === undefined) return undefined;
    if (lower !== null && upper !== null && lower >= upper) return fail('spec.limit-order', `min (${f.min?.raw}) is not below max (${f.max?.raw})`, 'swap min and max');
    return inRange({ lower, upper, nominal }, unit, what, fail);
  }
  if (!f.nominal && !f.tolerance) return fail('spec.no-limit', 'no limit given', 'add `nominal:` with `tolerance:`, or `min:`/`max:`');
  if (!f.tolerance) return fail('spec.no-tolerance', `nominal ${f.nominal?.raw} has no tolerance`, 'add `tolerance:` (e.g. "2 %"), or give min/max');
  if (!f.nominal) return fail('spec.no-nominal', `tolerance ${f.tolerance.raw} has no nominal`, 'add `nominal:` here or in every condition\'s `expect`');
  if (nominal === undefined || nominal === null) return undefined;
  const tol = readTolerance(f.tolerance, unit, nominal, what, issues);
  if (tol === undefined) return undefined;
  return inRange({ lower: nominal - tol, upper: nominal + tol, nominal }, unit, what, fail);
}

/**
 * Beyond 1e15 in SI units no bench quantity lies (a 1 PHz signal, a 1 PV swing); such a value is a
 * typo, and left in it overflows the circuit figures computed from it (found by spec fuzzing).
 */
export const MAX_MAGNITUDE = 1e15;

function inRange(l: Limit, unit: string, what: string, fail: (code: ErrorCode, problem: string, fix: string) => undefined): Limit | undefined {
  // A nominal or a window the quantity can never take (a duty cycle of 500 %, a negative frequency).
  const impossible = impossibleLimit(what, l.lower, l.upper, l.nominal);
  if (impossible !== null) return fail('spec.out-of-range', `${impossible} (in ${unit || 'no unit'})`, 'check the value, its sign and its unit for a typo');
  const worst = Math.max(...[l.lower, l.upper, l.nominal].map((x) => (x === null ? 0 : Math.abs(x))));
  if (worst <= MAX_MAGNITUDE) return l;
  return fail('spec.out-of-range', `a limit of ${worst.toExponential(2)} ${unit} is beyond any bench quantity (at most ${MAX_MAGNITUDE.toExponential(0)} ${unit})`, 'check the value and its unit prefix for a typo');
}
