/**
 * Trim guidance for one calibration iteration, as data (report words it): which adjustment moves which figure,
 * which way and by how much. The adjustments of a control law, and the order a technician trims them:
 * - scale changes the octaves per volt (exponential) or Hz per volt (linear); it pivots about 0 V
 *   control, so the frequency at 0 V stays where it is;
 * - offset (tune) shifts every step by the same number of cents (exponential) or Hz (linear);
 * - high-frequency compensation lifts the top of the range, where switching delays make the core run
 *   flat; it is set last, after scale and offset.
 * (Common practice for exponential VCOs, no source; the pivot at 0 V is an assumption stated in the
 * guidance notes.) When the top step leaves the line through the lower steps by more than the
 * linearity limit (or half the error limit), scale and offset are read from the lower steps and the
 * top is left to the high-frequency compensation. A trim is suggested only when its effect (across
 * the range, in cents) exceeds both twice its standard uncertainty and half the error limit (our
 * choice: a smaller error leaves room within the limits, and a smaller move is hard to set reliably
 * with a trimmer).
 */
import { centsUncertainty, trackingFit } from '../analysis/index.js';
import type { TrackingFit } from '../analysis/index.js';
import type { CalibrationDecision, Spec } from '../design/index.js';
import type { CalibrationIteration, CalibrationStepResult, TrimAdvice, TrimBasis, TrimRemark } from '../types/index.js';
import { driftRemarks } from './trimNotes.js';
import { leave, offsetAdvice, scaleAdvice } from './trimWords.js';

type Measured = CalibrationStepResult & { frequency: number; control: number };

export function guideTrim(spec: Spec, decision: CalibrationDecision): CalibrationIteration {
  const trims = spec.calibration?.trims ?? [];
  const all = decision.law.kind === 'exponential' ? exponentialAdvice(decision) : decision.law.kind === 'linear' ? linearAdvice(decision) : rangeAdvice(decision);
  const guidance = all.advice.filter((a) => trims.includes(a.adjustment));
  // Words for `text` and the remarks' `notes` are written by report (describeIteration).
  return { ...decision, guidance, remarks: [...all.remarks, ...driftRemarks(decision.tracking)] };
}

interface Advice {
  readonly advice: TrimAdvice[];
  readonly remarks: TrimRemark[];
}

const measuredSteps = (d: CalibrationDecision): Measured[] => d.steps.filter((s): s is Measured => s.frequency !== null && s.control !== null);
const fitOf = (steps: readonly Measured[], law: 'exponential' | 'linear'): TrackingFit =>
  trackingFit(steps.map((s) => ({ control: s.control, frequency: s.frequency, uncertainty: s.frequencyUncertainty })), law);
const significant = (effect: number, u: number | null, floor: number): boolean => Math.abs(effect) > Math.max(2 * (u ?? 0), floor);

function exponentialAdvice(d: CalibrationDecision): Advice {
  const steps = measuredSteps(d);
  if (new Set(steps.map((s) => s.control)).size < 2) return { advice: [], remarks: [{ code: 'too-few-steps' }] };
  const k = d.law.scale as number;
  const floor = d.limits.errorCents / 2;
  const sorted = [...steps].sort((a, b) => a.control - b.control);
  const top = sorted[sorted.length - 1];
  const lower = sorted.length >= 4 ? fitOf(sorted.slice(0, -1), 'exponential') : null;
  const topDev = lower ? 1200 * (Math.log2(top.frequency) - (lower.intercept + lower.slope * top.control)) : 0;
  const uTop = top.frequencyUncertainty === null ? 0 : centsUncertainty(top.frequency, top.frequencyUncertainty);
  const hfFlag = lower !== null && significant(topDev, uTop, d.limits.linearityCents ?? d.limits.errorCents / 2);
  const basis = hfFlag && lower ? lower : fitOf(steps, 'exponential');
  const width = (hfFlag ? sorted[sorted.length - 2].control : top.control) - sorted[0].control;
  const below = hfFlag ? { below: stepName(top, d) } : {};
  const scaleCents = 1200 * (basis.slope - k) * width;
  const scaleBasis: TrimBasis = {
    figures: [
      { name: 'fitted-scale', value: basis.slope, unit: `octave/${d.law.controlUnit || 'unit'}` },
      { name: 'scale-error', value: (1200 * (basis.slope - k)) / k, unit: 'cents per octave' },
    ],
    ...below,
  };
  const advice: TrimAdvice[] = [
    significant(scaleCents, basis.slopeUncertainty === null ? null : 1200 * basis.slopeUncertainty * width, floor) ? scaleAdvice(100 * (k / basis.slope - 1), scaleBasis) : leave('scale', scaleBasis),
  ];
  const e0 = 1200 * (basis.intercept - (Math.log2(d.law.referenceFrequency as number) - k * (d.law.referenceControl ?? 0)));
  const u0 = basis.interceptUncertainty === null ? null : 1200 * basis.interceptUncertainty;
  const offsetBasis: TrimBasis = { figures: [{ name: 'offset', value: e0, unit: 'cents' }], at: { control: 0, controlUnit: d.law.controlUnit }, afterScale: true };
  advice.push(significant(e0, u0, floor) ? offsetAdvice(-e0, 'cents', offsetBasis) : leave('offset', offsetBasis));
  const hfBasis: TrimBasis = lower ? { figures: [{ name: 'top-step-deviation', value: topDev, unit: 'cents' }], topStep: stepName(top, d) } : { figures: [], undecided: 'too-few-steps' };
  advice.push(hfFlag ? { adjustment: 'high-frequency', action: topDev < 0 ? 'raise' : 'lower', amount: Math.abs(topDev), unit: 'cents', text: '', basis: hfBasis } : leave('high-frequency', hfBasis));
  return { advice, remarks: [{ code: 'pivot-at-zero' }] };
}

function linearAdvice(d: CalibrationDecision): Advice {
  const steps = measuredSteps(d);
  if (new Set(steps.map((s) => s.control)).size < 2) return { advice: [], remarks: [{ code: 'too-few-steps' }] };
  const h = d.law.scale as number;
  const fit = fitOf(steps, 'linear');
  const sorted = [...steps].sort((a, b) => a.control - b.control);
  const width = sorted[sorted.length - 1].control - sorted[0].control;
  const top = sorted[sorted.length - 1].frequency;
  // Effects in cents at the top step, so one floor (a fifth of the error limit) serves both trims.
  const toCents = (hz: number): number => (1200 / Math.LN2) * (hz / top);
  const floor = d.limits.errorCents / 2;
  const scaleOk = !significant(toCents((fit.slope - h) * width), fit.slopeUncertainty === null ? null : toCents(fit.slopeUncertainty * width), floor);
  const e0 = fit.intercept - (d.law.referenceFrequency as number) + h * (d.law.referenceControl ?? 0);
  const offsetOk = !significant(toCents(e0), fit.interceptUncertainty === null ? null : toCents(fit.interceptUncertainty), floor);
  const scaleBasis: TrimBasis = {
    figures: [
      { name: 'fitted-scale', value: fit.slope, unit: `Hz/${d.law.controlUnit || 'unit'}` },
      { name: 'scale-error', value: 100 * (fit.slope / h - 1), unit: '%' },
    ],
  };
  const offsetBasis: TrimBasis = { figures: [{ name: 'offset', value: e0, unit: 'Hz' }], at: { control: 0, controlUnit: d.law.controlUnit }, afterScale: true };
  return {
    advice: [scaleOk ? leave('scale', scaleBasis) : scaleAdvice(100 * (h / fit.slope - 1), scaleBasis), offsetOk ? { ...leave('offset', offsetBasis), unit: 'Hz' } : offsetAdvice(-e0, 'Hz', offsetBasis)],
    remarks: [{ code: 'pivot-at-zero' }],
  };
}

function rangeAdvice(d: CalibrationDecision): Advice {
  const { span, expectedSpan, offset } = d.tracking;
  const floor = d.limits.errorCents / 2;
  const advice: TrimAdvice[] = [];
  if (span && expectedSpan) {
    const endCents = 1200 * (expectedSpan - span.value);
    const spanBasis: TrimBasis = {
      figures: [
        { name: 'span', value: span.value, unit: 'octaves' },
        { name: 'expected-span', value: expectedSpan, unit: 'octaves' },
      ],
    };
    advice.push(significant(endCents, span.uncertainty === null ? null : 1200 * span.uncertainty, floor) ? scaleAdvice(100 * (expectedSpan / span.value - 1), spanBasis) : leave('scale', spanBasis));
  }
  if (offset) {
    const offsetBasis: TrimBasis = { figures: [{ name: 'offset', value: offset.value, unit: 'cents' }], at: 'low-end', afterScale: true };
    advice.push(significant(offset.value, offset.uncertainty, floor) ? offsetAdvice(-offset.value, 'cents', offsetBasis) : leave('offset', offsetBasis));
  }
  return { advice, remarks: advice.length ? [] : [{ code: 'range-ends-missing' }] };
}

const unitOf = (d: CalibrationDecision): string => (d.law.controlUnit ? ` ${d.law.controlUnit}` : '');
/** The step's label as the file names use it: its control value and unit ('2 V'). */
const stepName = (s: Measured, d: CalibrationDecision): string => `${Number(s.control.toPrecision(6))}${unitOf(d)}`;
