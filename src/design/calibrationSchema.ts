/**
 * The structure of the spec's `calibration:` section (zod): which output is tracked, the control law,
 * the ordered steps and the limits. Values stay as written ("65.41 Hz", "1 octave/V", "5 cents");
 * calibrationSection.ts gives them meaning and checks the references.
 */
import { z } from 'zod';

const value = z.union([z.number(), z.string()]);

const step = z.union([
  z.number(),
  z.string().min(1),
  z.strictObject({ label: z.string().min(1).optional(), control: value.optional() }),
]);

export const calibrationSchema = z.strictObject({
  output: z.string().min(1).optional(),
  pattern: z.string().min(1).optional(),
  law: z.enum(['exponential', 'linear', 'range']),
  scale: value.optional(),
  reference: z.strictObject({ control: value, frequency: value }).optional(),
  range: z.strictObject({ low: value, high: value }).optional(),
  steps: z.array(step).min(2),
  limits: z.strictObject({ error: value, linearity: value.optional() }),
  trims: z.array(z.enum(['scale', 'offset', 'high-frequency'])).optional(),
});

/** What each calibration field expects, in words, for error messages. */
export const CALIBRATION_EXPECTS: Readonly<Record<string, string>> = {
  calibration: 'a map with law, steps and limits (and scale, reference or range as the law needs)',
  law: 'exponential, linear or range',
  scale: 'the law\'s scale: "1 octave/V" (or "1 V/octave") for exponential, "100 Hz/V" for linear',
  reference: 'a map with `control` and `frequency`, e.g. { control: 0 V, frequency: 65.41 Hz }',
  range: 'a map with `low` and `high` frequencies, e.g. { low: 20 Hz, high: 5.12 kHz }',
  low: 'the frequency at the first step, e.g. "20 Hz"',
  high: 'the frequency at the last step, e.g. "5.12 kHz"',
  steps: 'a list of at least two steps: control values ("0 V", "1 V" …) or { label, control }',
  label: 'the step\'s name as it appears in capture file names',
  control: 'a control value, e.g. "2 V" or a bare number',
  frequency: 'a frequency, e.g. "65.41 Hz"',
  limits: 'a map with `error` (and optionally `linearity`), in cents',
  error: 'the largest error from the law at any step, e.g. "5 cents"',
  linearity: 'the largest deviation from the fitted law, e.g. "3 cents"',
  trims: 'the adjustments the unit has: scale, offset, high-frequency',
};
