/**
 * The structure of a spec file (zod). Values stay as written here (a number, or text such as
 * "2.5 kHz"); units, limits and cross-references are checked afterwards by resolveSpec, so a file
 * with both kinds of mistake gets them all listed in one run.
 */
import { z } from 'zod';
import { SHAPES } from '../types/index.js';
import { CALIBRATION_EXPECTS, calibrationSchema } from './calibrationSchema.js';

const value = z.union([z.number(), z.string()]);

const limitFields = {
  nominal: value.optional(),
  tolerance: value.optional(),
  min: value.optional(),
  max: value.optional(),
};

const check = z.strictObject({
  measure: z.string(),
  ...limitFields,
  hint: z.string().optional(),
});

const output = z.strictObject({
  channel: z.union([z.string().min(1), z.number().int().min(1)]),
  shape: z.enum(SHAPES as [string, ...string[]]).optional(),
  fileTag: z.string().min(1).optional(),
  description: z.string().optional(),
  checks: z.array(check).optional(),
});

const condition = z.strictObject({
  setting: z.union([z.string(), z.number()]).optional(),
  expect: z.record(z.string(), z.record(z.string(), z.strictObject(limitFields))).optional(),
});

const designValue = z.strictObject({ ...limitFields, at: z.string().optional() });

const design = z.strictObject({
  timingCapacitance: designValue.optional(),
  chargeCurrent: designValue.optional(),
  dischargeCurrent: designValue.optional(),
  swing: designValue.optional(),
  upperThreshold: designValue.optional(),
  lowerThreshold: designValue.optional(),
  positiveRail: designValue.optional(),
  negativeRail: designValue.optional(),
  logicHigh: designValue.optional(),
  logicLow: designValue.optional(),
});

export const specFileSchema = z.strictObject({
  format: z.literal(1).optional(),
  name: z.string().min(1),
  revision: z.union([z.string().min(1), z.number()]),
  description: z.string().optional(),
  captures: z.strictObject({ pattern: z.string().min(1).optional(), reading: z.record(z.string(), z.unknown()).optional() }).optional(),
  decision: z.enum(['guarded', 'guarded-binary', 'simple']).optional(),
  outputs: z.record(z.string(), output),
  conditions: z.record(z.string(), condition).optional(),
  design: design.optional(),
  calibration: calibrationSchema.optional(),
  harmonics: z.strictObject({ count: z.number().int().min(2).max(100_000).optional(), bandwidth: z.union([z.string(), z.number()]).optional() }).optional(),
});

export type SpecFile = z.infer<typeof specFileSchema>;
export type SpecFileCheck = z.infer<typeof check>;
export type LimitFields = { nominal?: string | number; tolerance?: string | number; min?: string | number; max?: string | number };

/** What each field expects, in words, for error messages (keyed by the field's own name). */
export const FIELD_EXPECTS: Readonly<Record<string, string>> = {
  format: 'the number 1',
  name: 'the module name, e.g. "FH-210 Kestrel VCO"',
  revision: 'the design revision, e.g. "C"',
  description: 'free text',
  captures: 'a map with `pattern` and/or `reading`',
  reading: 'reading settings for the captures, as in a reading profile (README, "Reading options and profiles")',
  pattern: 'a file-name pattern such as "{unit}_{condition}.csv"',
  decision: 'guarded, guarded-binary or simple',
  outputs: 'a map of named outputs, each with `channel` and `checks`',
  conditions: 'a map of named control settings',
  channel: 'a channel name as in the CSV header, or its 1-based number',
  shape: SHAPES.join(', '),
  fileTag: 'the name of the output as it appears in capture file names',
  checks: 'a list of checks, each with `measure` and a limit',
  measure: 'a measurement id such as frequency, peakToPeak or dutyCycle',
  nominal: 'a value with its unit, e.g. "261.63 Hz"',
  tolerance: 'an absolute tolerance with its unit ("40 mV") or a percentage ("1.5 %")',
  min: 'a value with its unit, e.g. "48 %"',
  max: 'a value with its unit, e.g. "52 %"',
  hint: 'free text about likely causes',
  setting: 'the control setting in words, e.g. "control voltage 2 V"',
  expect: 'a map of output → measurement → limit',
  design: 'design values (timingCapacitance, chargeCurrent, swing, thresholds, rails, logic levels)',
  at: 'the name of a condition',
  harmonics: 'the harmonics THD, SINAD and the other sums take: `count` (harmonics 1 to N) or `bandwidth` (e.g. "20 kHz"); every harmonic below Nyquist when absent',
  count: 'a whole number of harmonics, 2 or more',
  bandwidth: 'a frequency with its unit, e.g. "20 kHz"',
  output: 'the name of a spec output, e.g. triangle',
  ...CALIBRATION_EXPECTS,
};
