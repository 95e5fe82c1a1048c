/**
 * Which part explains what the captures show: every observation is a deviation from the design (the
 * log ratio of each ramp slope to I/C, each turn of the triangle from its threshold as a fraction of the
 * swing, the log ratio of the logic high), and every candidate part moves them along a fixed direction
 * scaled by one unknown (its own deviation). Each candidate is fitted by weighted least squares and
 * judged by how much of the χ² = Σ(y/u)² it removes; the best is taken out and the rest fitted again, so
 * a second fault is found too. Candidates that remove the same χ² (to within max(4, 2 %) — a likelihood
 * ratio of e², common practice, no source) cannot be told apart by these captures.
 * Weighted least squares for one parameter: θ = Σ(a·y/u²)/Σ(a²/u²), u(θ) = 1/√Σ(a²/u²) (e.g. Taylor,
 * "An Introduction to Error Analysis", ch. 8 — from memory).
 */
import type { DesignSection } from '../design/index.js';
import type { CoreReading } from './coreReadings.js';
import { designSwing } from './circuitView.js';
import { coreFrequency, designEstimate } from './circuitFormulas.js';

export type ObservationKind = 'rise' | 'fall' | 'top' | 'bottom' | 'swing' | 'logicHigh' | 'frequency';

export interface Observation {
  readonly kind: ObservationKind;
  readonly condition: string;
  readonly y: number;
  readonly u: number;
  /** Nominal frequency here over the highest nominal frequency (1 when unknown). */
  readonly g: number;
  /** Share of the period the charging ramp takes by design, I_discharge/(I_charge + I_discharge) (½ when unknown). */
  readonly wc: number;
}

/** Relative uncertainty floor of an observation: 0.1 % (common practice, no source). */
const FLOOR = 1e-3;

export function observations(readings: readonly CoreReading[], design: DesignSection): Observation[] {
  const fMax = Math.max(0, ...readings.map((r) => r.fNominal ?? 0));
  const c = design.timingCapacitance?.nominal;
  const swing = designSwing(design)?.nominal;
  const { upperThreshold: up, lowerThreshold: dn, logicHigh: lh } = design;
  const out: Observation[] = [];
  for (const r of readings) {
    const g = r.fNominal && fMax > 0 ? r.fNominal / fMax : 1;
    const wc = r.charge && r.discharge ? r.discharge.value / (r.charge.value + r.discharge.value) : 0.5;
    const add = (kind: ObservationKind, y: number, u: number): void => {
      if (Number.isFinite(y)) out.push({ kind, condition: r.condition, y, u: Math.max(u, FLOOR), g, wc });
    };
    if (c && r.rise && r.charge) add('rise', Math.log(r.rise.value / (r.charge.value / c)), r.rise.u / r.rise.value);
    if (c && r.fall && r.discharge) add('fall', Math.log(r.fall.value / (r.discharge.value / c)), r.fall.u / r.fall.value);
    if (swing && up && dn && r.top && r.bottom) {
      add('top', (r.top.value - up.nominal) / swing, r.top.u / swing);
      add('bottom', (r.bottom.value - dn.nominal) / swing, r.bottom.u / swing);
    } else if (swing && r.swing) add('swing', Math.log(r.swing.value / swing), r.swing.u / r.swing.value);
    if (lh && lh.nominal > 0 && r.logicHigh && r.logicHigh.value > 0) add('logicHigh', Math.log(r.logicHigh.value / lh.nominal), r.logicHigh.u / r.logicHigh.value);
    // The frequency the design values give here: every part that moves a slope or the swing moves it too.
    const cd = design.timingCapacitance;
    const sd = designSwing(design);
    if (cd && sd && r.charge && r.discharge && r.frequency && r.frequency.value > 0) {
      const fd = coreFrequency(designEstimate(cd), designEstimate(sd), r.charge, r.discharge).value;
      add('frequency', Math.log(r.frequency.value / fd), r.frequency.u / r.frequency.value);
    }
  }
  return out;
}

export type PartId =
  | 'timing-capacitor'
  | 'reference-current'
  | 'charge-source'
  | 'discharge-sink'
  | 'current-mirror'
  | 'threshold-divider'
  | 'threshold-centre'
  | 'switching-delay'
  | 'logic-loading';

/**
 * How each part moves each observation per unit of its own deviation θ. The frequency follows from the
 * rest, 1/f = C·Vpp·(1/I_charge + 1/I_discharge): d ln f = d ln I_charge·w_c + d ln I_discharge·(1 − w_c)
 * − d ln C − d ln Vpp, with w_c = I_discharge/(I_charge + I_discharge) (differentiating the formula); a
 * part must explain it too, so a divider fault that would move the frequency does not fit a unit whose
 * frequency stayed on design.
 */
const DIRECTIONS: Readonly<Record<PartId, (o: Observation) => number>> = {
  'timing-capacitor': (o) => (o.kind === 'rise' || o.kind === 'fall' || o.kind === 'frequency' ? -1 : 0), // θ = ln(C/C0): slopes I/C fall
  'reference-current': (o) => (o.kind === 'rise' || o.kind === 'fall' || o.kind === 'frequency' ? 1 : 0), // θ = ln(I/I0) on both
  'charge-source': (o) => (o.kind === 'rise' ? 1 : o.kind === 'frequency' ? o.wc : 0),
  'discharge-sink': (o) => (o.kind === 'fall' ? 1 : o.kind === 'frequency' ? 1 - o.wc : 0),
  // θ = ln(I_charge/I_discharge), split evenly about their mean.
  'current-mirror': (o) => (o.kind === 'rise' ? 0.5 : o.kind === 'fall' ? -0.5 : o.kind === 'frequency' ? 0.5 * o.wc - 0.5 * (1 - o.wc) : 0),
  'threshold-divider': (o) => ({ top: 0.5, bottom: -0.5, swing: 1, frequency: -1 })[o.kind as 'top'] ?? 0, // θ = relative swing change
  'threshold-centre': (o) => (o.kind === 'top' || o.kind === 'bottom' ? 1 : 0), // θ = centre shift / swing
  // A fixed delay t_d lets each ramp run on by slope·t_d, and the slope grows with f: θ = swing growth at
  // the fastest condition; the period grows by 4·t_d, the same share as the swing.
  'switching-delay': (o) => ({ top: 0.5 * o.g, bottom: -0.5 * o.g, swing: o.g, frequency: -o.g })[o.kind as 'top'] ?? 0,
  'logic-loading': (o) => (o.kind === 'logicHigh' ? 1 : 0),
};

export const PART_IDS = Object.keys(DIRECTIONS) as PartId[];

export interface PartFit {
  readonly part: PartId;
  readonly theta: number;
  readonly uTheta: number;
  /** χ² removed by this part from the residual it was fitted to. */
  readonly reduction: number;
}

export interface FitStep {
  /** The best part first, then the ones the data cannot tell from it. */
  readonly group: readonly PartFit[];
  /** Share of the whole χ² that this step explains (0…1). */
  readonly share: number;
}

function fitOne(part: PartId, obs: readonly Observation[], y: readonly number[]): PartFit | null {
  let saa = 0;
  let say = 0;
  obs.forEach((o, i) => {
    const a = DIRECTIONS[part](o);
    saa += (a * a) / (o.u * o.u);
    say += (a * y[i]) / (o.u * o.u);
  });
  if (saa === 0) return null;
  const theta = say / saa;
  return { part, theta, uTheta: 1 / Math.sqrt(saa), reduction: theta * theta * saa };
}

/** Greedy attribution: at most `steps` rounds, each taking out the part that removes the most χ². */
export function attributeParts(obs: readonly Observation[], steps = 3): FitStep[] {
  let y = obs.map((o) => o.y);
  const total = obs.reduce((s, o) => s + (o.y / o.u) ** 2, 0);
  const out: FitStep[] = [];
  for (let k = 0; k < steps && total > 0; k++) {
    const fits = PART_IDS.map((p) => fitOne(p, obs, y)).filter((f): f is PartFit => f !== null).sort((a, b) => b.reduction - a.reduction);
    if (fits.length === 0 || fits[0].reduction <= 0) break;
    const best = fits[0];
    const margin = Math.max(4, 0.02 * best.reduction);
    out.push({ group: fits.filter((f) => best.reduction - f.reduction <= margin), share: best.reduction / total });
    y = y.map((v, i) => v - DIRECTIONS[best.part](obs[i]) * best.theta);
  }
  return out;
}
