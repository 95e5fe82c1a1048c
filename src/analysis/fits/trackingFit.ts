/**
 * How an oscillator's frequency tracks its control: a straight line fitted by weighted least squares,
 * to log2 f against the control for an exponential law (slope in octaves per control unit), or to f
 * itself for a linear law (slope in Hz per control unit). The line is written about `origin`, so the
 * intercept is the fitted value at that control (the law's reference point).
 *
 * Weighted straight-line fit with known σ_i, closed form: Press, Teukolsky, Vetterling & Flannery,
 * *Numerical Recipes*, 3rd ed., §15.2, eqs. 15.2.4–15.2.10 (from memory; the same sums appear in
 * Bevington & Robinson, *Data Reduction and Error Analysis*, ch. 6). With S = Σw, Sx = Σwx, Sy = Σwy,
 * Sxx = Σwx², Sxy = Σwxy and Δ = S·Sxx − Sx²: b = (S·Sxy − Sx·Sy)/Δ, a = (Sxx·Sy − Sx·Sxy)/Δ,
 * var a = Sxx/Δ, var b = S/Δ, cov(a, b) = −Sx/Δ. The σ_i of log2 f is u_f/(f·ln 2) (JCGM 100:2008
 * §5.1.2). The parameter uncertainties are propagated from the steps' frequency uncertainties only;
 * how far the points leave the line is reported separately, as the deviations (linearity).
 * When any step lacks an uncertainty, every step weighs the same and the slope and intercept carry none.
 */
import { cents, centsUncertainty } from './cents.js';

export type TrackingLaw = 'exponential' | 'linear';

export interface TrackingPoint {
  readonly control: number;
  /** Measured frequency, Hz. */
  readonly frequency: number;
  /** Its standard uncertainty (k = 1), Hz; null when none was estimated. */
  readonly uncertainty: number | null;
}

export interface TrackingFitOptions {
  /** Control value the intercept refers to (default 0). */
  readonly origin?: number;
}

export interface TrackingFit {
  readonly law: TrackingLaw;
  readonly origin: number;
  /** Octaves per control unit (exponential) or Hz per control unit (linear). */
  readonly slope: number;
  /** log2 of the fitted frequency at `origin` (exponential) or that frequency in Hz (linear). */
  readonly intercept: number;
  /** Standard uncertainties (k = 1) and covariance of slope and intercept; null when unweighted. */
  readonly slopeUncertainty: number | null;
  readonly interceptUncertainty: number | null;
  readonly covariance: number | null;
  /** Each point's deviation from the fitted law in cents (positive = sharp); null where the law predicts ≤ 0 Hz. */
  readonly deviations: readonly (number | null)[];
  /** Each deviation's standard uncertainty from that point's frequency alone (cents). */
  readonly deviationUncertainties: readonly (number | null)[];
  readonly method: string;
}

export function trackingFit(points: readonly TrackingPoint[], law: TrackingLaw, options: TrackingFitOptions = {}): TrackingFit {
  const { origin = 0 } = options;
  checkPoints(points);
  const weighted = points.every((p) => p.uncertainty !== null && p.uncertainty > 0);
  const xs = points.map((p) => p.control - origin);
  const ys = points.map((p) => (law === 'exponential' ? Math.log2(p.frequency) : p.frequency));
  const ws = points.map((p) => (weighted ? 1 / sigmaOf(p, law) ** 2 : 1));
  let S = 0, Sx = 0, Sy = 0, Sxx = 0, Sxy = 0;
  for (let i = 0; i < xs.length; i++) {
    S += ws[i];
    Sx += ws[i] * xs[i];
    Sy += ws[i] * ys[i];
    Sxx += ws[i] * xs[i] * xs[i];
    Sxy += ws[i] * xs[i] * ys[i];
  }
  const delta = S * Sxx - Sx * Sx;
  const slope = (S * Sxy - Sx * Sy) / delta;
  const intercept = (Sxx * Sy - Sx * Sxy) / delta;
  const deviations = points.map((p, i) => deviation(p.frequency, intercept + slope * xs[i], law));
  return {
    law,
    origin,
    slope,
    intercept,
    slopeUncertainty: weighted ? Math.sqrt(S / delta) : null,
    interceptUncertainty: weighted ? Math.sqrt(Sxx / delta) : null,
    covariance: weighted ? -Sx / delta : null,
    deviations,
    deviationUncertainties: points.map((p) => (p.uncertainty === null ? null : centsUncertainty(p.frequency, p.uncertainty))),
    method: `${weighted ? 'weighted' : 'unweighted'} least-squares line through ${law === 'exponential' ? 'log2 f' : 'f'} against control, ${points.length} steps`,
  };
}

/** σ of the fitted ordinate: u_f/(f·ln 2) for log2 f, u_f for f. */
function sigmaOf(p: TrackingPoint, law: TrackingLaw): number {
  const u = p.uncertainty as number;
  return law === 'exponential' ? u / (p.frequency * Math.LN2) : u;
}

function deviation(frequency: number, fitted: number, law: TrackingLaw): number | null {
  if (law === 'exponential') return 1200 * (Math.log2(frequency) - fitted);
  return fitted > 0 ? cents(frequency, fitted) : null;
}

/** Caller bugs: fewer than two distinct controls, or a non-positive frequency, throw at once. */
function checkPoints(points: readonly TrackingPoint[]): void {
  for (const p of points) {
    if (!Number.isFinite(p.control)) throw new RangeError(`trackingFit: control ${p.control} is not finite`);
    if (!(p.frequency > 0) || !Number.isFinite(p.frequency)) throw new RangeError(`trackingFit: frequency ${p.frequency} must be positive`);
    if (p.uncertainty !== null && !(p.uncertainty >= 0)) throw new RangeError(`trackingFit: uncertainty ${p.uncertainty} must be ≥ 0 or null`);
  }
  if (new Set(points.map((p) => p.control)).size < 2) {
    throw new RangeError(`trackingFit: needs at least two distinct control values, got ${JSON.stringify(points.map((p) => p.control))}`);
  }
}
