/**
 * The tracking figures of one iteration: the law fitted to the measured steps (analysis/trackingFit),
 * expressed against the spec's law: scale and its error (cents per octave for an exponential law, %
 * for a linear one), offset at the reference control (cents), worst deviation from the fitted law
 * (linearity), span in octaves, and how symmetry and amplitude move across the range.
 * Uncertainties (k = 1) follow by first-order propagation (JCGM 100:2008 §5.1.2).
 */
import { centsUncertainty, spanOctaves, trackingFit } from '../analysis/index.js';
import type { TrackingFit } from '../analysis/index.js';
import type { CalibrationDrift, CalibrationFigure, CalibrationLaw, CalibrationStepResult, TrackingFigures } from '../types/index.js';

export type StepFigures = Omit<CalibrationStepResult, 'deviation' | 'statement'>;

const hyp = (a: number | null, b: number | null): number | null => (a === null || b === null ? null : Math.hypot(a, b));

export function trackingFigures(law: CalibrationLaw, steps: readonly StepFigures[]): { figures: TrackingFigures; deviations: (number | null)[] } {
  const fit = lawFit(law, steps);
  const deviations = steps.map(() => null as number | null);
  const deviationU = steps.map(() => null as number | null);
  fit?.used.forEach((i, k) => {
    deviations[i] = fit.fit.deviations[k];
    deviationU[i] = fit.fit.deviationUncertainties[k];
  });
  const measured = steps.filter((s) => s.frequency !== null);
  const first = measured[0];
  const last = measured[measured.length - 1];
  const span = measured.length >= 2 ? spanFigure(first, last) : null;
  const expectedSpan = measured.length >= 2 && first.expected !== null && last.expected !== null ? spanOctaves(first.expected, last.expected) : null;
  const figures: TrackingFigures = {
    method: fit ? fit.fit.method : law.kind === 'range' ? 'range law: errors at both ends and the span between them' : 'fewer than two measured steps: no fit',
    ...(fit ? fittedFigures(law, fit.fit) : rangeFigures(law, first, span, expectedSpan)),
    linearity: worstDeviation(steps, deviations, deviationU),
    linearityStatement: null,
    span,
    expectedSpan,
    symmetry: drift(steps.map((s) => s.symmetry), '%'),
    amplitude: drift(steps.map((s) => s.peakToPeak), 'V'),
  };
  return { figures, deviations };
}

function lawFit(law: CalibrationLaw, steps: readonly StepFigures[]): { fit: TrackingFit; used: number[] } | null {
  if (law.kind === 'range') return null;
  const used = steps.flatMap((s, i) => (s.frequency !== null && s.control !== null ? [i] : []));
  if (new Set(used.map((i) => steps[i].control)).size < 2) return null;
  const points = used.map((i) => ({ control: steps[i].control as number, frequency: steps[i].frequency as number, uncertainty: steps[i].frequencyUncertainty }));
  return { fit: trackingFit(points, law.kind, { origin: law.referenceControl ?? 0 }), used };
}

type Fitted = Pick<TrackingFigures, 'scale' | 'scaleError' | 'offset'>;

function fittedFigures(law: CalibrationLaw, fit: TrackingFit): Fitted {
  const nominal = law.scale as number;
  const fRef = law.referenceFrequency as number;
  const per = law.controlUnit || 'control unit';
  if (law.kind === 'exponential') {
    return {
      scale: { value: fit.slope, uncertainty: fit.slopeUncertainty, unit: `octave/${per}` },
      scaleError: { value: (1200 * (fit.slope - nominal)) / nominal, uncertainty: fit.slopeUncertainty === null ? null : (1200 * fit.slopeUncertainty) / nominal, unit: 'cents/octave' },
      offset: { value: 1200 * (fit.intercept - Math.log2(fRef)), uncertainty: fit.interceptUncertainty === null ? null : 1200 * fit.interceptUncertainty, unit: 'cents' },
    };
  }
  const atRef = fit.intercept;
  return {
    scale: { value: fit.slope, uncertainty: fit.slopeUncertainty, unit: `Hz/${per}` },
    scaleError: { value: 100 * (fit.slope / nominal - 1), uncertainty: fit.slopeUncertainty === null ? null : (100 * fit.slopeUncertainty) / Math.abs(nominal), unit: '%' },
    offset: atRef > 0 ? { value: 1200 * Math.log2(atRef / fRef), uncertainty: fit.interceptUncertainty === null ? null : centsUncertainty(atRef, fit.interceptUncertainty), unit: 'cents' } : null,
  };
}

/** Range law: the offset is the error at the first step, the scale error the span's relative error. */
function rangeFigures(law: CalibrationLaw, first: StepFigures | undefined, span: CalibrationFigure | null, expectedSpan: number | null): Fitted {
  if (law.kind !== 'range') return { scale: null, scaleError: null, offset: null };
  const offset = first?.cents != null ? { value: first.cents, uncertainty: first.centsUncertainty, unit: 'cents' } : null;
  const scaleError =
    span && expectedSpan ? { value: 100 * (span.value / expectedSpan - 1), uncertainty: span.uncertainty === null ? null : (100 * span.uncertainty) / Math.abs(expectedSpan), unit: '%' } : null;
  return { scale: null, scaleError, offset };
}

function spanFigure(first: StepFigures, last: StepFigures): CalibrationFigure {
  const u = hyp(first.centsUncertainty, last.centsUncertainty);
  return { value: spanOctaves(first.frequency as number, last.frequency as number), uncertainty: u === null ? null : u / 1200, unit: 'octaves' };
}

function worstDeviation(steps: readonly StepFigures[], deviations: readonly (number | null)[], u: readonly (number | null)[]): TrackingFigures['linearity'] {
  let worst = -1;
  deviations.forEach((d, i) => {
    if (d !== null && (worst < 0 || Math.abs(d) > Math.abs(deviations[worst] as number))) worst = i;
  });
  // Two points always lie on their line: a deviation needs at least three fitted steps to mean anything.
  if (worst < 0 || deviations.filter((d) => d !== null).length < 3) return null;
  return { value: deviations[worst] as number, uncertainty: u[worst], unit: 'cents', step: steps[worst].label };
}

function drift(values: readonly (number | null)[], unit: string): CalibrationDrift | null {
  const xs = values.filter((v): v is number => v !== null);
  if (xs.length < 2) return null;
  return { first: xs[0], last: xs[xs.length - 1], min: Math.min(...xs), max: Math.max(...xs), unit };
}
