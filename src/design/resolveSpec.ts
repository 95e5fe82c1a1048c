/**
 * The meaning of a spec file: measurement ids, units, limits merged per condition, references
 * between sections, the file-name pattern. Works on the raw parsed file and skips what zod already
 * refused (wrong types), so one run lists every problem. The Spec it builds is used only when no
 * issue was found.
 */
import { MEASUREMENT_IDS, MEASUREMENT_UNITS, isBenchError, isMeasurementId } from '../types/index.js';
import type { DecisionRule, MeasurementId, ReadingSettings, Shape } from '../types/index.js';
import { readingSettings } from '../capture/index.js';
import type { HarmonicSet } from '../analysis/index.js';
import { parseQuantity, valueIn } from './quantity.js';
import { fieldsAt, hasLimit, mergeFields, resolveLimit } from './limits.js';
import type { FieldSet } from './limits.js';
import { nearestName as nearest } from '../types/index.js';
import { formatPath } from './specIssues.js';
import type { SpecIssue, SpecPath } from './specIssues.js';
import { DEFAULT_CONDITION, DEFAULT_PATTERN } from './specTypes.js';
import type { Spec, SpecCheck, SpecCondition, SpecOutput } from './specTypes.js';
import { resolveDesign } from './resolveDesign.js';
import { checkPattern } from './capturePattern.js';
import { resolveCalibration } from './calibrationSection.js';

type Obj = Record<string, unknown>;
const obj = (x: unknown): Obj => (x !== null && typeof x === 'object' && !Array.isArray(x) ? (x as Obj) : {});
const list = (x: unknown): unknown[] => (Array.isArray(x) ? x : []);
const text = (x: unknown): string | undefined => (typeof x === 'string' ? x : typeof x === 'number' ? String(x) : undefined);

interface BaseCheck {
  readonly output: string;
  readonly measurement: MeasurementId;
  readonly fields: FieldSet;
  readonly path: SpecPath;
  readonly hint?: string;
}

export function resolveSpec(raw: unknown, file: string, sha256: string, issues: SpecIssue[]): Spec {
  const top = obj(raw);
  const outputs = resolveOutputs(obj(top.outputs), issues);
  const base = baseChecks(obj(top.outputs), issues);
  const conditionNames = Object.keys(obj(top.conditions));
  const conditions = conditionNames.length === 0
    ? [{ name: DEFAULT_CONDITION, checks: mergeChecks(base, {}, DEFAULT_CONDITION, issues) }]
    : conditionNames.map((name) => resolveCondition(name, obj(obj(top.conditions)[name]), base, outputs, issues));
  if (Object.keys(obj(top.outputs)).length > 0 && conditions.every((c) => c.checks.length === 0) && issues.length === 0) {
    issues.push({ code: 'spec.no-checks', path: ['outputs'], problem: 'outputs: the spec has no checks, so no unit could ever fail it', expected: 'at least one check with a limit', fix: 'add `checks:` to an output, e.g. `- measure: frequency` with nominal and tolerance' });
  }
  const pattern = text(obj(top.captures).pattern) ?? DEFAULT_PATTERN;
  checkPattern(pattern, conditionNames.length > 1, ['captures', 'pattern'], issues);
  const design = top.design === undefined ? undefined : resolveDesign(obj(top.design), conditionNames, issues);
  const reading = obj(top.captures).reading === undefined ? undefined : resolveReading(obj(top.captures).reading, file, issues);
  const harmonicSet = top.harmonics === undefined ? undefined : resolveHarmonics(obj(top.harmonics), issues);
  return {
    format: 1,
    file,
    sha256,
    name: text(top.name) ?? '',
    revision: text(top.revision) ?? '',
    ...(typeof top.description === 'string' ? { description: top.description } : {}),
    pattern,
    decision: (text(top.decision) ?? 'guarded') as DecisionRule,
    outputs,
    conditions,
    ...(design ? { design } : {}),
    ...(reading ? { reading } : {}),
    ...(harmonicSet ? { harmonicSet } : {}),
    ...(top.calibration !== undefined ? { calibration: resolveCalibration(top.calibration, outputs, issues) } : {}),
  };
}

function resolveOutputs(raw: Obj, issues: SpecIssue[]): SpecOutput[] {
  const tags = new Map<string, string>();
  return Object.entries(raw).map(([name, o]) => {
    const out = obj(o);
    const fileTag = text(out.fileTag) ?? name;
    const clash = tags.get(fileTag);
    if (clash !== undefined) {
      issues.push({ code: 'spec.duplicate-tag', path: ['outputs', name], problem: `${formatPath(['outputs', name])}: file tag "${fileTag}" is also used by output "${clash}"`, expected: 'a different fileTag for each output', fix: `give output "${name}" its own \`fileTag:\`` });
    }
    tags.set(fileTag, name);
    return {
      name,
      channel: typeof out.channel === 'number' || typeof out.channel === 'string' ? out.channel : 1,
      ...(typeof out.shape === 'string' ? { shape: out.shape as Shape } : {}),
      fileTag,
      ...(typeof out.description === 'string' ? { description: out.description } : {}),
    };
  });
}

function measurementOf(raw: unknown, path: SpecPath, issues: SpecIssue[]): MeasurementId | undefined {
  if (typeof raw !== 'string') return undefined;
  if (isMeasurementId(raw)) return raw;
  const near = nearest(raw, MEASUREMENT_IDS);
  issues.push({
    code: 'spec.unknown-measurement',
    path,
    problem: `${formatPath(path)}: "${raw}" is not a measurement benchproof makes`,
    expected: `one of ${MEASUREMENT_IDS.join(', ')}`,
    fix: near ? `did you mean "${near}"?` : 'pick a measurement id from the list above',
  });
  return undefined;
}

function baseChecks(raw: Obj, issues: SpecIssue[]): BaseCheck[] {
  const out: BaseCheck[] = [];
  for (const [output, o] of Object.entries(raw)) {
    const seen = new Set<string>();
    list(obj(o).checks).forEach((c, i) => {
      const path = ['outputs', output, 'checks', i];
      const measurement = measurementOf(obj(c).measure, [...path, 'measure'], issues);
      if (!measurement) return;
      if (seen.has(measurement)) {
        issues.push({ code: 'spec.duplicate-check', path, problem: `${formatPath(path)}: ${measurement} is checked twice on output "${output}"`, expected: 'each measurement once per output', fix: 'merge the two checks into one (use min/max for a band)' });
      }
      seen.add(measurement);
      const hint = obj(c).hint;
      out.push({ output, measurement, fields: fieldsAt(c, path), path, ...(typeof hint === 'string' ? { hint } : {}) });
    });
  }
  return out;
}

function resolveCondition(name: string, raw: Obj, base: BaseCheck[], outputs: readonly SpecOutput[], issues: SpecIssue[]): SpecCondition {
  const expect = obj(raw.expect);
  const extra: BaseCheck[] = [];
  const overrides: Record<string, FieldSet> = {};
  for (const [output, perOutput] of Object.entries(expect)) {
    const opath = ['conditions', name, 'expect', output];
    if (!outputs.some((o) => o.name === output)) {
      const near = nearest(output, outputs.map((o) => o.name));
      issues.push({ code: 'spec.unknown-output', path: opath, atKey: true, problem: `${formatPath(opath)}: no output named "${output}"`, expected: `one of the outputs: ${outputs.map((o) => o.name).join(', ')}`, fix: near ? `did you mean "${near}"?` : 'use an output name from `outputs:`' });
      continue;
    }
    for (const [m, limit] of Object.entries(obj(perOutput))) {
      const path = [...opath, m];
      const measurement = measurementOf(m, path, issues);
      if (!measurement) continue;
      const fields = fieldsAt(limit, path);
      overrides[`${output}\u0000${measurement}`] = fields;
      if (!base.some((b) => b.output === output && b.measurement === measurement)) extra.push({ output, measurement, fields: {}, path });
    }
  }
  const checks = mergeChecks([...base, ...extra], overrides, name, issues);
  return { name, ...(text(raw.setting) !== undefined ? { setting: text(raw.setting) } : {}), checks };
}

function mergeChecks(base: readonly BaseCheck[], overrides: Record<string, FieldSet>, condition: string, issues: SpecIssue[]): SpecCheck[] {
  const out: SpecCheck[] = [];
  for (const b of base) {
    const over = overrides[`${b.output}\u0000${b.measurement}`] ?? {};
    const fields = mergeFields(b.fields, over);
    const unit = MEASUREMENT_UNITS[b.measurement];
    const where = hasLimit(over) ? (over.nominal ?? over.tolerance ?? over.min ?? over.max)!.path.slice(0, -1) : b.path;
    const found: SpecIssue[] = [];
    const limit = resolveLimit(fields, unit, b.measurement, where, found);
    for (const f of found) {
      const missing = f.code === 'spec.no-nominal' || f.code === 'spec.no-limit';
      issues.push(missing && condition !== DEFAULT_CONDITION && !hasLimit(over) ? { ...f, problem: `${f.problem} for condition "${condition}"`, fix: `${f.fix} (e.g. under conditions.${condition}.expect.${b.output}.${b.measurement})` } : f);
    }
    if (limit) out.push({ output: b.output, measurement: b.measurement, unit, limit, ...(b.hint ? { hint: b.hint } : {}) });
  }
  return out;
}

/**
 * `harmonics:`: a design specified over a fixed harmonic count or a bandwidth (audio-band designs
 * commonly state THD up to 20 kHz; common practice, no source); one of the two, never both. Without
 * it every harmonic below Nyquist counts.
 */
function resolveHarmonics(raw: Obj, issues: SpecIssue[]): HarmonicSet | undefined {
  const count = typeof raw.count === 'number' ? raw.count : undefined;
  if (raw.bandwidth === undefined) return count === undefined ? undefined : { harmonics: count };
  const q = typeof raw.bandwidth === 'string' || typeof raw.bandwidth === 'number' ? parseQuantity(raw.bandwidth) : null;
  const hz = q === null ? null : valueIn(q, 'Hz');
  if (hz === null || !(hz > 0)) {
    issues.push({ code: 'spec.wrong-unit', path: ['harmonics', 'bandwidth'], problem: `harmonics.bandwidth: "${String(raw.bandwidth)}" is not a positive frequency`, expected: 'a frequency with its unit, e.g. "20 kHz"', fix: 'write the bandwidth with Hz, kHz or MHz, e.g. bandwidth: 20 kHz' });
    return undefined;
  }
  if (count !== undefined) {
    issues.push({ code: 'spec.limit-conflict', path: ['harmonics'], problem: 'harmonics: both `count` and `bandwidth` are given, and they may disagree', expected: 'one of `count` or `bandwidth`', fix: 'keep the one your design states and delete the other' });
    return undefined;
  }
  return { bandwidth: hz };
}

/** `captures.reading`: the capture reader's own rules check it, each mistake a spec issue. */
function resolveReading(raw: unknown, file: string, issues: SpecIssue[]): ReadingSettings | undefined {
  try {
    const { name: _name, ...settings } = readingSettings(raw, file, 'captures.reading');
    return settings;
  } catch (e) {
    if (!isBenchError(e)) throw e;
    for (const f of [e, ...(e.issues ?? [])]) {
      issues.push({ code: 'spec.bad-value', path: ['captures', 'reading'], problem: f.problem, expected: f.expected, fix: 'correct the setting under captures.reading (README, "Reading options and profiles")' });
    }
    return undefined;
  }
}
