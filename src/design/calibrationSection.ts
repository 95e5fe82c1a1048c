/**
 * The meaning of the `calibration:` section: the tracked output, the law with its scale and reference
 * (or the range), the ordered steps with their labels and controls, the limits in cents and the file
 * pattern. Works on the raw parsed section and skips what zod already refused, so one run lists every
 * problem; the section it builds is used only when no issue was found.
 */
import type { CalibrationLaw, CalibrationLawKind, ErrorCode, TrimAdjustment } from '../types/index.js';
import { controlLabel, parseCents, parseControl, parseLinearScale, parseOctaveScale } from './calibrationValues.js';
import type { CalibrationSection, CalibrationStep } from './calibrationTypes.js';
import { DEFAULT_CALIBRATION_PATTERN } from './calibrationTypes.js';
import { nearestName as nearest } from '../types/index.js';
import { parseQuantity } from './quantity.js';
import { formatPath } from './specIssues.js';
import type { SpecIssue, SpecPath } from './specIssues.js';
import type { SpecOutput } from './specTypes.js';

type Obj = Record<string, unknown>;
const obj = (x: unknown): Obj => (x !== null && typeof x === 'object' && !Array.isArray(x) ? (x as Obj) : {});
const isValue = (x: unknown): x is string | number => typeof x === 'string' || typeof x === 'number';
const ROOT = ['calibration'];
const ALL_TRIMS: readonly TrimAdjustment[] = ['scale', 'offset', 'high-frequency'];

export function resolveCalibration(raw: unknown, outputs: readonly SpecOutput[], issues: SpecIssue[]): CalibrationSection {
  const top = obj(raw);
  const bad = (path: SpecPath, problem: string, expected: string, fix: string, code: ErrorCode = 'spec.bad-value'): void => {
    issues.push({ code, path, problem: `${formatPath(path)}: ${problem}`, expected, fix });
  };
  const out = trackedOutput(top.output, outputs, issues);
  const kind = (typeof top.law === 'string' ? top.law : 'exponential') as CalibrationLawKind;
  const steps = resolveSteps(top.steps, kind, bad);
  const law = resolveLaw(top, kind, bad);
  const limits = obj(top.limits);
  const errorCents = isValue(limits.error) ? parseCents(limits.error) : 0;
  if (errorCents === null) bad([...ROOT, 'limits', 'error'], `${JSON.stringify(limits.error)} is not a number of cents`, 'a positive number of cents, e.g. "5 cents"', 'write the limit as e.g. `error: 5 cents`');
  const linearityCents = isValue(limits.linearity) ? parseCents(limits.linearity) : undefined;
  if (linearityCents === null) bad([...ROOT, 'limits', 'linearity'], `${JSON.stringify(limits.linearity)} is not a number of cents`, 'a positive number of cents, e.g. "3 cents"', 'write the limit as e.g. `linearity: 3 cents`');
  const pattern = typeof top.pattern === 'string' ? top.pattern : DEFAULT_CALIBRATION_PATTERN;
  checkStepPattern(pattern, bad);
  const trims = Array.isArray(top.trims) ? ALL_TRIMS.filter((t) => (top.trims as unknown[]).includes(t)) : kind === 'exponential' ? ALL_TRIMS : ALL_TRIMS.slice(0, 2);
  return {
    output: out?.name ?? '',
    channel: out?.channel ?? 1,
    pattern,
    law,
    steps,
    limits: { errorCents: errorCents ?? 0, ...(typeof linearityCents === 'number' ? { linearityCents } : {}) },
    trims,
  };
}

function trackedOutput(raw: unknown, outputs: readonly SpecOutput[], issues: SpecIssue[]): SpecOutput | undefined {
  if (raw === undefined) return outputs[0];
  const found = outputs.find((o) => o.name === raw);
  if (!found && typeof raw === 'string') {
    const near = nearest(raw, outputs.map((o) => o.name));
    const path = [...ROOT, 'output'];
    issues.push({ code: 'spec.unknown-output', path, problem: `${formatPath(path)}: no output named "${raw}"`, expected: `one of the outputs: ${outputs.map((o) => o.name).join(', ')}`, fix: near ? `did you mean "${near}"?` : 'name an output from `outputs:`' });
  }
  return found;
}

type Bad = (path: SpecPath, problem: string, expected: string, fix: string, code?: ErrorCode) => void;

function resolveSteps(raw: unknown, kind: CalibrationLawKind, bad: Bad): CalibrationStep[] {
  const list = Array.isArray(raw) ? raw : [];
  const steps = list.map((s, index): CalibrationStep => {
    const path = [...ROOT, 'steps', index];
    const given = obj(s);
    const controlRaw = isValue(s) ? s : given.control;
    const control = isValue(controlRaw) ? parseControl(controlRaw) : null;
    const label = typeof given.label === 'string' ? given.label : isValue(controlRaw) ? controlLabel(controlRaw) : String(index + 1);
    if (isValue(controlRaw) && control === null && !(typeof s === 'string' && kind === 'range')) {
      bad(isValue(s) ? path : [...path, 'control'], `${JSON.stringify(controlRaw)} is not a control value`, 'a control value such as "2 V" or a bare number', 'write the control as e.g. `2 V`, or give `{ label: …, control: … }`');
    }
    // A plain word in a range calibration is a labelled knob position with no control value.
    return { index, label: control === null && typeof s === 'string' ? s.trim() : label, control: control?.value ?? null };
  });
  // A label the user wrote is fixed by renaming; one taken from the control value means the value
  // itself was entered twice, so the fix is the value (or removing the step), not a `label:`.
  const written = list.map((s) => typeof obj(s).label === 'string');
  const seen = new Map<string, number>();
  steps.forEach((s) => {
    const path = [...ROOT, 'steps', s.index];
    const first = seen.get(s.label.toLowerCase());
    if (first !== undefined) {
      if (written[s.index]) bad(path, `step label "${s.label}" is used twice (steps ${first + 1} and ${s.index + 1})`, 'a different label for each step', 'give this step its own `label:`', 'spec.duplicate-step');
      else bad(path, `step ${s.index + 1} repeats step ${first + 1} ("${s.label}")`, 'each control value once, in the order the steps are taken', `change step ${s.index + 1} to the control value it is taken at, or delete it if it was entered twice`, 'spec.duplicate-step');
    }
    if (first === undefined) seen.set(s.label.toLowerCase(), s.index);
    if (kind !== 'range' && s.control === null) bad(path, `step "${s.label}" has no control value, which a ${kind} law needs`, 'a control value such as "2 V"', 'add `control:` to the step', 'spec.missing-field');
  });
  if (kind !== 'range' && new Set(steps.map((s) => s.control)).size < 2 && steps.length >= 2) {
    bad([...ROOT, 'steps'], 'the steps need at least two different control values to fit a law', 'steps spread across the control range', 'list steps at different control values, e.g. 0 V … 5 V');
  }
  return steps;
}

function resolveLaw(top: Obj, kind: CalibrationLawKind, bad: Bad): CalibrationLaw {
  const frequency = (x: unknown, path: SpecPath): number | null => {
    const q = isValue(x) ? parseQuantity(x) : null;
    if (q && (q.unit === 'Hz' || q.unit === '') && q.value > 0) return q.value;
    if (x !== undefined) bad(path, `${JSON.stringify(x)} is not a frequency`, 'a positive frequency, e.g. "65.41 Hz"', 'write the frequency with its unit, e.g. `65.41 Hz`');
    return null;
  };
  if (kind === 'range') {
    const range = obj(top.range);
    if (top.range === undefined) bad([...ROOT, 'range'], 'missing: a range law needs the frequencies at both ends', 'a map with `low` and `high`', 'add `range: { low: 20 Hz, high: 5.12 kHz }`', 'spec.missing-field');
    const low = frequency(range.low, [...ROOT, 'range', 'low']);
    const high = frequency(range.high, [...ROOT, 'range', 'high']);
    return { kind, controlUnit: '', ...(low !== null ? { lowFrequency: low } : {}), ...(high !== null ? { highFrequency: high } : {}) };
  }
  const scaleRaw = top.scale;
  const scale = isValue(scaleRaw) ? (kind === 'exponential' ? parseOctaveScale(scaleRaw) : parseLinearScale(scaleRaw)) : null;
  if (!isValue(scaleRaw)) bad([...ROOT, 'scale'], `missing: a ${kind} law needs its scale`, kind === 'exponential' ? 'e.g. "1 octave/V"' : 'e.g. "100 Hz/V"', `add \`scale: ${kind === 'exponential' ? '1 octave/V' : '100 Hz/V'}\``, 'spec.missing-field');
  else if (!scale) bad([...ROOT, 'scale'], `${JSON.stringify(scaleRaw)} is not a ${kind} scale`, kind === 'exponential' ? 'octaves per volt: "1 octave/V" or "1 V/octave"' : 'Hz per volt, e.g. "100 Hz/V"', 'write the scale with its unit');
  const ref = obj(top.reference);
  if (top.reference === undefined) bad([...ROOT, 'reference'], `missing: a ${kind} law needs a reference point`, 'a map with `control` and `frequency`', 'add e.g. `reference: { control: 0 V, frequency: 65.41 Hz }`', 'spec.missing-field');
  const control = isValue(ref.control) ? parseControl(ref.control) : null;
  if (isValue(ref.control) && !control) bad([...ROOT, 'reference', 'control'], `${JSON.stringify(ref.control)} is not a control value`, 'e.g. "0 V"', 'write the control as e.g. `0 V`');
  const refFrequency = frequency(ref.frequency, [...ROOT, 'reference', 'frequency']);
  return {
    kind,
    controlUnit: scale?.controlUnit === 'V' || control?.unit === 'V' ? 'V' : '',
    ...(scale ? { scale: scale.value } : {}),
    ...(control ? { referenceControl: control.value } : {}),
    ...(refFrequency !== null ? { referenceFrequency: refFrequency } : {}),
  };
}

function checkStepPattern(pattern: string, bad: Bad): void {
  const tokens = [...pattern.matchAll(/\{([^}]*)\}/g)].map((m) => m[1]);
  const path = [...ROOT, 'pattern'];
  const expected = 'a pattern with {step} and optionally {unit}, e.g. "{unit}_cv{step}.csv"';
  for (const t of tokens) if (t !== 'unit' && t !== 'step') bad(path, `unknown token {${t}}`, expected, 'use only {unit} and {step}', 'spec.bad-pattern');
  if (!tokens.includes('step')) bad(path, 'no {step} token', expected, 'add {step} where the step label sits in the file name', 'spec.bad-pattern');
  if (tokens.length !== new Set(tokens).size) bad(path, 'a token appears twice', expected, 'keep each token once', 'spec.bad-pattern');
}
