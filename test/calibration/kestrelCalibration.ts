/**
 * Test helpers: the demo spec's calibration, and captures of a Kestrel VCO (fictional, demo only)
 * synthesized at the frequencies a mis-trimmed unit would run at, measured by the real analysis.
 */
import { readFileSync } from 'node:fs';
import { measureCapture } from '../../src/analysis/index.js';
import { calibrationOf, calibrationReading, parseSpec } from '../../src/design/index.js';
import type { Spec, StepReading } from '../../src/design/index.js';
import { synthesize } from '../../src/syntheticCaptures/index.js';
import type { Measurement } from '../../src/types/index.js';
import { captureOf } from '../analysis/captureOf.js';

export const SPEC_FILE = 'samples/fh210-spec.yaml';
export const specText = (): string => readFileSync(SPEC_FILE, 'utf8');
export const kestrelSpec = (): Spec => parseSpec(specText(), SPEC_FILE);

/** A spec with its calibration section swapped for `section` (YAML text, two-space indented keys). */
export function specWith(section: string): Spec {
  const base = specText().split('\ncalibration:')[0];
  return parseSpec(`${base}\ncalibration:\n${section}`, 'test-spec.yaml');
}

/** Reading of a triangle synthesized at `frequency`, measured with measureCapture (seeded noise). */
export function measuredReading(spec: Spec, stepIndex: number, frequency: number, seed: number): StepReading {
  const section = calibrationOf(spec);
  const signal = synthesize({ shape: 'triangle', frequency, amplitude: 3, sampleRate: frequency * 50.37, samples: 50 * 24, noise: 0.005, bits: 10, fullScale: 8, phase: 0.3, seed });
  const report = measureCapture(captureOf([signal]));
  return calibrationReading(section, section.steps[stepIndex], report);
}

/** A reading with a given frequency and standard uncertainty, without a capture (for decision tests). */
export function givenReading(spec: Spec, stepIndex: number, frequency: number | null, uncertainty: number | null = frequency === null ? null : frequency * 1e-5): StepReading {
  const section = calibrationOf(spec);
  const m: Measurement = frequency === null ? { value: null, unit: 'Hz', uncertainty: null, reason: 'too-few-cycles', note: 'fewer than two cycles' } : { value: frequency, unit: 'Hz', uncertainty };
  return { step: section.steps[stepIndex], capture: `step${stepIndex}.csv`, sha256: '0'.repeat(64), frequency: m, symmetry: null, peakToPeak: null };
}

/** Frequency of a unit with scale k octave/V, `offsetCents` at 0 V, and a switching delay t_d (s). */
export const unitFrequency = (control: number, k: number, offsetCents: number, delay = 0): number => {
  const ideal = 65.41 * 2 ** (k * control + offsetCents / 1200);
  return 1 / (1 / ideal + 4 * delay);
};
