/**
 * Is a stored JSON document still the shape the reports read? A row that was edited, cut short or
 * replaced (`[]` for a diagnosis, text that is not JSON) is reported as damaged, naming its row,
 * instead of reaching a renderer that would fail on it. Only what the reports and statistics rely on
 * is checked; the fingerprint covers everything else.
 */
import type { CalibrationIteration, Diagnosis, UnitVerdict } from '../types/index.js';

const STATEMENTS = new Set(['pass', 'conditional-pass', 'conditional-fail', 'fail', 'not-measured']);

type Parsed<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly problem: string };

const isObject = (x: unknown): x is Record<string, unknown> => typeof x === 'object' && x !== null && !Array.isArray(x);
const isArray = (x: unknown): x is unknown[] => Array.isArray(x);
const isText = (x: unknown): x is string => typeof x === 'string';
const isNumberOrNull = (x: unknown): boolean => x === null || (typeof x === 'number' && Number.isFinite(x));
const isStatement = (x: unknown): boolean => isText(x) && STATEMENTS.has(x);

function parse(text: unknown, what: string): Parsed<unknown> {
  if (!isText(text)) return { ok: false, problem: `its ${what} is not text` };
  try {
    return { ok: true, value: JSON.parse(text) as unknown };
  } catch {
    return { ok: false, problem: `its ${what} is not valid JSON` };
  }
}

function checkOf(k: unknown): boolean {
  return isObject(k) && isText(k.condition) && isText(k.output) && isText(k.measurement) && isText(k.unit) && isStatement(k.statement)
    && ['value', 'expandedUncertainty', 'lower', 'upper', 'nominal', 'margin'].every((f) => isNumberOrNull(k[f]));
}

export function parseVerdict(text: unknown): Parsed<UnitVerdict> {
  const p = parse(text, 'verdict');
  if (!p.ok) return p;
  const v = p.value;
  const ok = isObject(v) && isText(v.unit) && isStatement(v.statement) && isObject(v.spec) && isArray(v.conditions) && isArray(v.captures)
    && v.conditions.every((c) => isObject(c) && isText(c.condition) && isStatement(c.statement) && isArray(c.checks) && c.checks.every(checkOf))
    && v.captures.every((c) => isObject(c) && isText(c.path) && isText(c.sha256) && isObject(c.report) && isArray(c.report.channels));
  return ok ? { ok: true, value: v as unknown as UnitVerdict } : { ok: false, problem: 'its verdict is not the shape benchproof stores' };
}

export function parseDiagnosis(text: unknown): Parsed<Diagnosis> {
  const p = parse(text, 'diagnosis');
  if (!p.ok) return p;
  const d = p.value;
  const ok = isObject(d) && isArray(d.causes) && d.causes.every((c) => isObject(c) && isText(c.id) && isText(c.title) && typeof c.score === 'number')
    && (d.circuit === undefined || isArray(d.circuit));
  return ok ? { ok: true, value: d as unknown as Diagnosis } : { ok: false, problem: 'its diagnosis is not the shape benchproof stores' };
}

export function parseIteration(text: unknown): Parsed<CalibrationIteration> {
  const p = parse(text, 'calibration result');
  if (!p.ok) return p;
  const r = p.value;
  const ok = isObject(r) && isText(r.unit) && isStatement(r.statement) && typeof r.meetsLimits === 'boolean' && isArray(r.steps) && isArray(r.guidance)
    && isArray(r.notes) && isObject(r.tracking);
  return ok ? { ok: true, value: r as unknown as CalibrationIteration } : { ok: false, problem: 'its calibration result is not the shape benchproof stores' };
}
