/**
 * Which calibration step each capture belongs to: by the section's file-name pattern (`{step}` and
 * optionally `{unit}`, e.g. `FK-0104_cv3.csv`), or, when no file name fits the pattern, by the order
 * the files were given in. Every file is mapped before any is read, so a misnamed file fails at once.
 */
import { BenchError } from '../types/index.js';
import type { CalibrationSection, CalibrationStep } from './calibrationTypes.js';
import type { Spec } from './specTypes.js';

export interface CalibrationPlanEntry {
  readonly step: CalibrationStep;
  readonly path: string;
}

const baseName = (path: string): string => path.split(/[\\/]/).pop() ?? path;
const escape = (s: string): string => s.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

/** The spec's calibration section, or a BenchError saying how to add one. */
export function calibrationOf(spec: Spec): CalibrationSection {
  if (spec.calibration) return spec.calibration;
  throw new BenchError({
    code: 'calibration.no-section',
    file: spec.file,
    problem: 'the spec has no `calibration:` section, so there is no law to calibrate against',
    expected: 'a `calibration:` section with law, steps and limits',
    fix: 'add one (see the `calibration:` section of samples/fh210-spec.yaml)',
  });
}

/** The step a file name stands for, and the unit it names (when the pattern has {unit}); null when it does not fit. */
export function matchCalibrationName(section: CalibrationSection, path: string): { step: CalibrationStep; unit?: string } | null {
  let source = '';
  const labels = [...section.steps].map((s) => s.label).sort((a, b) => b.length - a.length).map(escape).join('|');
  for (const part of section.pattern.split(/(\{[^}]*\})/)) {
    if (part === '{unit}') source += '(?<unit>[^/\\\\]+?)';
    else if (part === '{step}') source += `(?<step>${labels})`;
    else source += escape(part);
  }
  if (/\.csv$/i.test(section.pattern)) source += '(?:\\.gz)?';
  const m = new RegExp(`^${source}$`, 'i').exec(baseName(path));
  const label = m?.groups?.step;
  const step = section.steps.find((s) => s.label.toLowerCase() === label?.toLowerCase());
  if (!step) return null;
  return { step, ...(m?.groups?.unit !== undefined ? { unit: m.groups.unit } : {}) };
}

export function planCalibration(spec: Spec, files: readonly string[], unit: string): CalibrationPlanEntry[] {
  const section = calibrationOf(spec);
  const matches = files.map((f) => matchCalibrationName(section, f));
  if (matches.every((m) => m === null)) return inStepOrder(spec, section, files);
  const unmatched = files.findIndex((_, i) => matches[i] === null);
  if (unmatched >= 0) throw unmatchedError(spec, section, files[unmatched]);
  const byStep = new Map<number, string>();
  files.forEach((path, i) => {
    const m = matches[i]!;
    if (m.unit !== undefined && m.unit.toLowerCase() !== unit.toLowerCase()) {
      throw new BenchError({ code: 'calibration.other-unit', file: path, problem: `the file name names unit ${m.unit}, but this calibration is of ${unit}`, expected: `captures of ${unit} only`, fix: `leave this file out, or run a calibration of ${m.unit} with --unit ${m.unit}` });
    }
    const twice = byStep.get(m.step.index);
    if (twice !== undefined) {
      throw new BenchError({ code: 'calibration.duplicate-step', file: path, problem: `a second capture for step "${m.step.label}" (the first is ${twice})`, expected: 'one capture per step', fix: 'give only the capture taken after the latest trim' });
    }
    byStep.set(m.step.index, path);
  });
  const missing = section.steps.filter((s) => !byStep.has(s.index));
  if (missing.length > 0) {
    throw new BenchError({ code: 'calibration.missing-step', file: '-', problem: `no capture for step${missing.length > 1 ? 's' : ''} ${missing.map((s) => `"${s.label}"`).join(', ')}`, expected: `one capture for each of the ${section.steps.length} steps of ${spec.file}`, fix: `capture the missing step${missing.length > 1 ? 's' : ''}, named e.g. ${exampleName(section, missing[0], unit)}` });
  }
  return section.steps.map((step) => ({ step, path: byStep.get(step.index)! }));
}

function inStepOrder(spec: Spec, section: CalibrationSection, files: readonly string[]): CalibrationPlanEntry[] {
  if (files.length !== section.steps.length) {
    throw new BenchError({
      code: 'calibration.step-count',
      file: '-',
      problem: `${files.length} capture${files.length === 1 ? '' : 's'} given in order, but ${spec.file} lists ${section.steps.length} steps`,
      expected: `one capture per step, in step order (${section.steps.map((s) => s.label).join(', ')}), or files named after "${section.pattern}"`,
      fix: `give ${section.steps.length} captures, or name them like ${exampleName(section, section.steps[0], 'FK-0104')}`,
    });
  }
  return section.steps.map((step, i) => ({ step, path: files[i] }));
}

function unmatchedError(spec: Spec, section: CalibrationSection, path: string): BenchError {
  return new BenchError({
    code: 'calibration.name-unmatched',
    file: path,
    problem: `the file name "${baseName(path)}" does not fit the calibration pattern "${section.pattern}" of ${spec.file}, while other files do`,
    expected: `names like ${exampleName(section, section.steps[0], 'FK-0104')}, with a step among ${section.steps.map((s) => s.label).join(', ')}`,
    fix: 'rename the file to fit the pattern (or give every capture in step order, none named after the pattern)',
  });
}

function exampleName(section: CalibrationSection, step: CalibrationStep, unit: string): string {
  return section.pattern.replace('{unit}', unit).replace('{step}', step.label);
}
