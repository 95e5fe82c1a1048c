/** Words and numbers shared by the calibration renderers (terminal, Markdown, HTML), so they cannot drift apart. */
import type { CalibrationIteration, CalibrationLaw, CalibrationLimits, CalibrationStepResult, TrackingFigures } from '../types/index.js';
import { formatMeasured, formatQuantity, measurementLabel } from './reportNumbers.js';

/** "+3.9" / "−15.6": a signed number with a true minus sign. */
export function signed(x: number, digits = 1): string {
  const t = Math.abs(x).toFixed(digits);
  return Number(t) === 0 ? t : `${x < 0 ? '−' : '+'}${t}`;
}

/**
 * "−97.1 ± 0.3 cents" with the expanded uncertainty U = 2u (k = 2), through the one formatter: U
 * rounded up to two significant digits and the value to the same place (GUM §7.2.6), signed.
 */
export function centsText(v: number | null, u: number | null): string {
  if (v === null) return '—';
  if (u === null || !(u > 0)) return `${signed(v)} cents`;
  const text = formatMeasured(v, 2 * u, 'cents');
  return v > 0 && !/^0(\.0*)? /.test(text) ? `+${text}` : text;
}

const control = (v: number, law: CalibrationLaw): string => `${Number(v.toPrecision(6))}${law.controlUnit ? ` ${law.controlUnit}` : ''}`;

export function lawText(law: CalibrationLaw): string {
  const ref = law.referenceControl !== undefined && law.referenceFrequency !== undefined ? `, ${formatQuantity(law.referenceFrequency, 'Hz')} at ${control(law.referenceControl, law)}` : '';
  if (law.kind === 'exponential') return `exponential, ${law.scale} octave/${law.controlUnit || 'unit'}${ref}`;
  if (law.kind === 'linear') return `linear, ${formatQuantity(law.scale ?? null, 'Hz')}/${law.controlUnit || 'unit'}${ref}`;
  return `range, ${formatQuantity(law.lowFrequency ?? null, 'Hz')} to ${formatQuantity(law.highFrequency ?? null, 'Hz')}`;
}

export function limitsText(limits: CalibrationLimits): string {
  return `error within ±${limits.errorCents} cents${limits.linearityCents !== undefined ? `, linearity within ±${limits.linearityCents} cents` : ''}`;
}

export function stepControl(s: CalibrationStepResult, law: CalibrationLaw): string {
  return s.control === null ? '—' : control(s.control, law);
}

/** Per-step cells: step, control, measured ± U, expected, error ± U, from the fitted law, symmetry, p-p. */
export function stepCells(s: CalibrationStepResult, law: CalibrationLaw): string[] {
  return [
    s.label,
    stepControl(s, law),
    s.frequency === null ? '—' : formatMeasured(s.frequency, s.frequencyUncertainty === null ? null : 2 * s.frequencyUncertainty, 'Hz'),
    s.expected === null ? '—' : `${Number(s.expected.toPrecision(6))} Hz`,
    centsText(s.cents, s.centsUncertainty),
    s.deviation === null ? '—' : signed(s.deviation),
    s.symmetry === null ? '—' : `${s.symmetry.toFixed(1)} %`,
    s.peakToPeak === null ? '—' : `${s.peakToPeak.toFixed(2)} V`,
  ];
}

export const STEP_HEAD = ['step', 'control', `${measurementLabel('frequency')} ± U (k = 2)`, 'expected', 'error ± U (k = 2)', 'from fit (cents)', measurementLabel('symmetry'), measurementLabel('peakToPeak')];

/** The overall figures as label/value pairs, in reading order; uncertainties shown as U (k = 2). */
export function figurePairs(it: CalibrationIteration): [string, string][] {
  const t: TrackingFigures = it.tracking;
  const withU = (v: number, u: number | null, digits: number): string => (u === null || u <= 0 ? v.toFixed(digits) : formatMeasured(v, 2 * u, ''));
  const pairs: [string, string][] = [];
  if (t.scale) {
    const err = t.scaleError ? `, i.e. ${signed(t.scaleError.value, t.scaleError.unit === '%' ? 2 : 1)} ${t.scaleError.unit === '%' ? '%' : 'cents per octave'}` : '';
    pairs.push(['fitted scale', `${withU(t.scale.value, t.scale.uncertainty, 5)} ${t.scale.unit}${err}`]);
  } else if (t.scaleError) pairs.push(['span error', `${signed(t.scaleError.value, 2)} %`]);
  if (t.offset) pairs.push(['offset', `${centsText(t.offset.value, t.offset.uncertainty)} ${it.law.kind === 'range' ? 'at the low end' : `at ${it.law.referenceControl ?? 0}${it.law.controlUnit ? ` ${it.law.controlUnit}` : ''}`}`]);
  if (t.linearity) pairs.push(['linearity', `worst ${signed(t.linearity.value)} cents from the fitted law, at step ${t.linearity.step}`]);
  if (t.span) pairs.push(['span', `${withU(t.span.value, t.span.uncertainty, 3)} octaves${t.expectedSpan !== null ? ` (${t.expectedSpan.toFixed(3)} expected)` : ''}`]);
  if (t.symmetry) pairs.push(['symmetry', `${t.symmetry.first.toFixed(1)} % → ${t.symmetry.last.toFixed(1)} % (range ${t.symmetry.min.toFixed(1)} … ${t.symmetry.max.toFixed(1)} %)`]);
  if (t.amplitude) pairs.push(['amplitude', `${t.amplitude.first.toFixed(2)} → ${t.amplitude.last.toFixed(2)} Vpp (range ${t.amplitude.min.toFixed(2)} … ${t.amplitude.max.toFixed(2)} Vpp)`]);
  return pairs;
}

/** One sentence on the outcome. */
export function outcomeText(it: CalibrationIteration): string {
  const outside = it.steps.filter((s) => s.statement !== null && s.statement !== 'pass' && s.statement !== 'conditional-pass').length;
  const decided = it.steps.filter((s) => s.statement !== null).length;
  if (it.meetsLimits) return `meets the calibration limits (${limitsText(it.limits)})`;
  const lin = it.tracking.linearityStatement !== null && it.tracking.linearityStatement !== 'pass' && it.tracking.linearityStatement !== 'conditional-pass' ? '; linearity outside its limit' : '';
  return `does not meet the calibration limits: ${outside} of ${decided} steps outside ±${it.limits.errorCents} cents${lin}`;
}
