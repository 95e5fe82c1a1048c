/**
 * Every check of a spec against the captures of each unit: a CheckVerdict per check and condition,
 * rolled up into condition and unit statements. A measurement that is withheld, not reported, or not
 * captured at all is "not measured" with the reason, and a unit with one is never a pass.
 *
 * U = 2u (k = 2, GUM §6.2–6.3). When the analysis gives no uncertainty (u null) the check is decided
 * with no guard band and says so in its note: we neither invent a U nor refuse a decision we can make.
 * A measurement that found nothing above (or below) a level carries that bound instead of a value, and
 * the check is decided on it (decideBound): a clean unit passes an upper limit on hum.
 * A channel whose output saturates inside the scope's range (a circuit flat top, analysis/flatTops.ts)
 * fails every check of a quantity the flat top changes: the value is real but describes a fault.
 */
import { BenchError, MEASUREMENT_UNITS } from '../types/index.js';
import type { CheckedCapture, CheckVerdict, ConditionVerdict, FlatTop, Measurement, MeasurementBound, UnitVerdict } from '../types/index.js';
import { decideBound, decideCheck, worstStatement } from './decideCheck.js';
import { formatQuantity } from './quantity.js';
import type { Spec, SpecCheck } from './specTypes.js';

/** Group captures by unit (first-seen order) and decide each unit against the spec. */
export function decideUnits(spec: Spec, captures: readonly CheckedCapture[]): UnitVerdict[] {
  const units = [...new Set(captures.map((c) => c.unit))];
  return units.map((unit) => decideUnit(spec, unit, captures.filter((c) => c.unit === unit)));
}

export function decideUnit(spec: Spec, unit: string, captures: readonly CheckedCapture[]): UnitVerdict {
  refuseDuplicates(captures);
  // A condition (or, with one file per output, an output at a condition) with no capture at all is
  // waiting, not failed: the unit is INCOMPLETE until it lands.
  const waitingFor: string[] = [];
  const conditions: ConditionVerdict[] = spec.conditions.map((cond) => {
    if (!captures.some((c) => c.condition === cond.name)) {
      waitingFor.push(cond.name);
      const note = `waiting for a capture at condition "${cond.name}"`;
      return { condition: cond.name, statement: 'not-measured', checks: cond.checks.map((check) => waitingCheck(check, cond.name, note)), waiting: true };
    }
    const checks = cond.checks.map((check) => (outputCaptured(captures, cond.name, check.output) ? decideOne(spec, check, cond.name, captures) : waitingCheck(check, cond.name)));
    for (const output of new Set(checks.filter((k) => k.waiting).map((k) => k.output))) waitingFor.push(`${cond.name} (${output})`);
    return { condition: cond.name, statement: worstStatement(checks.map((c) => c.statement)), checks };
  });
  const captured = conditions.flatMap((c) => c.checks).filter((k) => !k.waiting);
  return {
    schemaVersion: 1,
    unit,
    spec: { name: spec.name, revision: spec.revision, sha256: spec.sha256, ...(spec.description ? { description: spec.description } : {}) },
    decisionRule: spec.decision,
    statement: worstStatement(conditions.map((c) => c.statement)),
    conditions,
    captures,
    state: waitingFor.length ? 'incomplete' : 'complete',
    waitingFor,
    soFar: worstStatement(captured.map((k) => k.statement)),
  };
}

const outputCaptured = (captures: readonly CheckedCapture[], condition: string, output: string): boolean =>
  captures.some((c) => c.condition === condition && c.outputs.some((o) => o.output === output));

/**
 * A check nobody has captured for yet: not measured (so the unit can never read as a pass), marked
 * waiting, with a note that says so rather than a reason the unit is at fault.
 */
function waitingCheck(check: SpecCheck, condition: string, note = `waiting for a capture of output "${check.output}" at condition "${condition}"`): CheckVerdict {
  return {
    ...checkIdentity(check, condition),
    value: null,
    expandedUncertainty: null,
    guard: 0,
    margin: null,
    statement: 'not-measured',
    note,
    waiting: true,
  };
}

function refuseDuplicates(captures: readonly CheckedCapture[]): void {
  const seen = new Map<string, string>();
  for (const c of captures) {
    for (const o of c.outputs) {
      const key = `${c.condition}\u0000${o.output}`;
      const first = seen.get(key);
      if (first !== undefined) {
        throw new BenchError({
          code: 'check.duplicate-capture',
          file: c.path,
          problem: `unit ${c.unit} has two captures of output "${o.output}" at condition "${c.condition}": ${first} and ${c.path}`,
          expected: 'one capture per unit, condition and output',
          fix: 'leave out the capture you do not want checked',
        });
      }
      seen.set(key, c.path);
    }
  }
}

function findMeasurement(check: SpecCheck, condition: string, captures: readonly CheckedCapture[]): { m?: Measurement; missing?: string; flats?: readonly FlatTop[] } {
  const capture = captures.find((c) => c.condition === condition && c.outputs.some((o) => o.output === check.output));
  if (!capture) return { missing: `no capture of output "${check.output}" at condition "${condition}" was given` };
  const channelName = capture.outputs.find((o) => o.output === check.output)?.channel;
  const channel = capture.report.channels.find((ch) => ch.name === channelName);
  const m = channel?.measurements[check.measurement];
  if (!m) return { missing: `the analysis reports no ${check.measurement} for channel "${channelName}" (recognised as ${channel?.shape ?? 'unknown'})` };
  return { m, flats: (channel?.flatTops ?? []).filter((t) => t.cause === 'circuit') };
}

/** Measurements a flat top on each side changes: its own level, and everything taken over the whole swing. */
const SATURATION_AFFECTED: Readonly<Record<FlatTop['side'] | 'both', readonly string[]>> = {
  high: ['maximum', 'highLevel'],
  low: ['minimum', 'lowLevel'],
  both: ['peakToPeak', 'amplitude', 'dcOffset', 'rms', 'acRms', 'linearity', 'thd', 'shapeError', 'evenOddRatio', 'sinad', 'enob', 'sfdr'],
};

/** The circuit saturating is a fault: a check of a quantity the flat top changes fails, whatever its value. */
function saturationNote(flats: readonly FlatTop[] | undefined, id: string, unit: string): string | null {
  const hit = (flats ?? []).filter((t) => SATURATION_AFFECTED[t.side].includes(id) || SATURATION_AFFECTED.both.includes(id));
  if (hit.length === 0) return null;
  const where = hit.map((t) => `${t.side === 'high' ? 'top' : 'bottom'} at ${formatQuantity(t.level, unit || 'V', 4)} for ${Number((100 * t.share).toPrecision(2))} % of each cycle`).join(', ');
  return `the output saturates (flat ${where}, inside the scope's range): this value describes the clipped waveform, so the check fails`;
}

/** What every verdict of a check carries, whatever was measured: which check, and its limits. */
function checkIdentity(check: SpecCheck, condition: string) {
  return {
    output: check.output,
    condition,
    measurement: check.measurement,
    unit: MEASUREMENT_UNITS[check.measurement],
    lower: check.limit.lower,
    upper: check.limit.upper,
    nominal: check.limit.nominal,
  };
}

function decideOne(spec: Spec, check: SpecCheck, condition: string, captures: readonly CheckedCapture[]): CheckVerdict {
  const base = checkIdentity(check, condition);
  const { m, missing, flats } = findMeasurement(check, condition, captures);
  if (m && m.value === null && m.bound) return decideOnBound(check, base, m, m.bound);
  if (!m || m.value === null) {
    const note = missing ?? `withheld: ${m?.note ?? m?.reason ?? 'no reason given'}`;
    return { ...base, value: null, expandedUncertainty: null, guard: 0, margin: null, statement: 'not-measured', note, ...(check.hint ? { hint: check.hint } : {}) };
  }
  const U = m.uncertainty === null ? null : 2 * m.uncertainty;
  const decided = decideCheck(m.value, U ?? 0, check.limit, spec.decision);
  const saturated = saturationNote(flats, check.measurement, m.unit);
  const d = saturated ? { ...decided, statement: 'fail' as const } : decided;
  const notes: string[] = saturated ? [saturated] : [];
  if (U === null) notes.push('no uncertainty estimate: decided without a guard band');
  const { lower, upper } = check.limit;
  if (spec.decision !== 'simple' && U !== null && lower !== null && upper !== null && upper - lower <= 2 * U) {
    notes.push(`the guard band (±${formatQuantity(U, base.unit, 3)}) covers the whole tolerance: only a longer or cleaner capture can show a pass`);
  }
  return {
    ...base,
    value: m.value,
    expandedUncertainty: U,
    guard: d.guard,
    margin: d.margin,
    statement: d.statement,
    ...(notes.length ? { note: notes.join('; ') } : {}),
    ...(check.hint && d.statement !== 'pass' ? { hint: check.hint } : {}),
  };
}

type Base = Pick<CheckVerdict, 'output' | 'condition' | 'measurement' | 'unit' | 'lower' | 'upper' | 'nominal'>;

/** A check decided on a bound: pass or fail when the bound settles it, else not measured with the bound shown. */
function decideOnBound(check: SpecCheck, base: Base, m: Measurement, bound: MeasurementBound): CheckVerdict {
  const d = decideBound(bound, check.limit);
  const rel = bound.kind === 'upper' ? '<' : '>';
  const shown = `${rel} ${formatQuantity(bound.value, base.unit, 3)}`;
  const note = d
    ? `nothing detected: ${shown} (${m.method ?? m.note ?? 'detection bound'}); decided on that bound`
    : `nothing detected, but the bound (${shown}) does not settle the limit: ${m.note ?? 'capture with less noise'}`;
  return {
    ...base,
    value: null,
    bound,
    expandedUncertainty: null,
    guard: 0,
    margin: d ? d.margin : null,
    statement: d ? d.statement : 'not-measured',
    note,
    ...(check.hint && d?.statement !== 'pass' ? { hint: check.hint } : {}),
  };
}
