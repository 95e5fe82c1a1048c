/**
 * Trim guidance for one calibration iteration, in general words: which adjustment moves which figure,
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
import type { CalibrationIteration, CalibrationStepResult, TrimAdvice } from '../types/index.js';
import { driftNotes } from './trimNotes.js';
import { leave, offsetAdvice, scaleAdvice, signed } from './trimWords.js';

type Measured = CalibrationStepResult & { frequency: number; control: number };

export function guideTrim(spec: Spec, decision: CalibrationDecision): CalibrationIteration {
  const trims = spec.calibration?.trims ?? [];
  const all = decision.law.kind === 'exponential' ? exponentialAdvice(decision) : decision.law.kind === 'linear' ? linearAdvice(decision) : rangeAdvice(decision);
  const guidance = all.advice.filter((a) => trims.includes(a.adjustment));
  return { ...decision, guidance, notes: [...decision.notes, ...all.notes, ...driftNotes(decision.tracking)] };
}

interface Advice {
  readonly advice: TrimAdvice[];
  readonly notes: string[];
}

const measuredSteps = (d: CalibrationDecision): Measured[] => d.steps.filter((s): s is Measured => s.frequency !== null && s.control !== null);
const fitOf = (steps: readonly Measured[], law: 'exponential' | 'linear'): TrackingFit =>
  trackingFit(steps.map((s) => ({ control: s.control, frequency: s.frequency, uncertainty: s.frequencyUncertainty })), law);
const significant = (effect: number, u: number | null, floor: number): boolean => Math.abs(effect) > Math.max(2 * (u ?? 0), floor);

function exponentialAdvice(d: CalibrationDecision): Advice {
  const steps = measuredSteps(d);
  if (new Set(steps.map((s) => s.control)).size < 2) return { advice: [], notes: ['no guidance: fewer than two steps were measured'] };
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
  const where = hfFlag ? `, read from the steps below ${stepName(top, d)}` : '';
  const scaleCents = 1200 * (basis.slope - k) * width;
  const advice: TrimAdvice[] = [
    significant(scaleCents, basis.slopeUncertainty === null ? null : 1200 * basis.slopeUncertainty * width, floor)
      ? scaleAdvice(100 * (k / basis.slope - 1), `the fitted scale is ${basis.slope.toFixed(4)} octave/${d.law.controlUnit || 'unit'}, ${signed((1200 * (basis.slope - k)) / k, 1)} cents per octave${where}`)
      : leave('scale', `${signed((1200 * (basis.slope - k)) / k, 1)} cents per octave${where}`),
  ];
  const e0 = 1200 * (basis.intercept - (Math.log2(d.law.referenceFrequency as number) - k * (d.law.referenceControl ?? 0)));
  const u0 = basis.interceptUncertainty === null ? null : 1200 * basis.interceptUncertainty;
  advice.push(significant(e0, u0, floor) ? offsetAdvice(-e0, 'cents', `at 0${unitOf(d)}, after the scale trim`) : leave('offset', `${signed(e0, 1)} cents at 0${unitOf(d)}`));
  advice.push(hfFlag ? hfAdvice(stepName(top, d), topDev) : leave('high-frequency', lower ? `the top step lies ${signed(topDev, 1)} cents from the line through the others` : 'fewer than four steps: cannot be told from scale'));
  return { advice, notes: ['the scale trim is taken to pivot about 0 V control (common practice); re-capture every step after each trim'] };
}

function hfAdvice(top: string, topDev: number): TrimAdvice {
  const action = topDev < 0 ? 'raise' : 'lower';
  const amount = Math.abs(topDev);
  return {
    adjustment: 'high-frequency',
    action,
    amount,
    unit: 'cents',
    text: `high-frequency compensation: ${action} until the ${top} step moves ${topDev < 0 ? 'up' : 'down'} by ${amount.toFixed(1)} cents (it lies ${amount.toFixed(1)} cents ${topDev < 0 ? 'below' : 'above'} the line through the lower steps); set it last`,
  };
}

function linearAdvice(d: CalibrationDecision): Advice {
  const steps = measuredSteps(d);
  if (new Set(steps.map((s) => s.control)).size < 2) return { advice: [], notes: ['no guidance: fewer than two steps were measured'] };
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
  return {
    advice: [
      scaleOk ? leave('scale', `${signed(100 * (fit.slope / h - 1), 2)} %`) : scaleAdvice(100 * (h / fit.slope - 1), `the fitted scale is ${fit.slope.toPrecision(5)} Hz/${d.law.controlUnit || 'unit'}`),
      offsetOk ? leave('offset', `${signed(e0, 2)} Hz at 0${unitOf(d)}`) : offsetAdvice(-e0, 'Hz', `at 0${unitOf(d)}, after the scale trim`),
    ],
    notes: ['the scale trim is taken to pivot about 0 V control (common practice); re-capture every step after each trim'],
  };
}

function rangeAdvice(d: CalibrationDecision): Advice {
  const { span, expectedSpan, offset } = d.tracking;
  const floor = d.limits.errorCents / 2;
  const advice: TrimAdvice[] = [];
  if (span && expectedSpan) {
    const endCents = 1200 * (expectedSpan - span.value);
    advice.push(
      significant(endCents, span.uncertainty === null ? null : 1200 * span.uncertainty, floor)
        ? scaleAdvice(100 * (expectedSpan / span.value - 1), `the span is ${span.value.toFixed(3)} octaves; ${expectedSpan.toFixed(3)} wanted`)
        : leave('scale', `span ${span.value.toFixed(3)} octaves`),
    );
  }
  if (offset) advice.push(significant(offset.value, offset.uncertainty, floor) ? offsetAdvice(-offset.value, 'cents', 'at the low end, after the scale trim') : leave('offset', `${signed(offset.value, 1)} cents at the low end`));
  return { advice, notes: advice.length ? [] : ['no guidance: the ends of the range were not both measured'] };
}

const unitOf = (d: CalibrationDecision): string => (d.law.controlUnit ? ` ${d.law.controlUnit}` : '');
const stepName = (s: Measured, d: CalibrationDecision): string => `${Number(s.control.toPrecision(6))}${unitOf(d)}`;
