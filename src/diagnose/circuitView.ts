/**
 * The circuit view: at each condition, the core's figures back-computed from the captures and set
 * against the spec's design section — effective charge and discharge currents (I = C·|dV/dt|), the
 * effective timing capacitance (C = I/|dV/dt|), the comparator thresholds where the triangle turned,
 * the frequency the design values predict (1/f = C·Vpp·(1/I_charge + 1/I_discharge)) against the
 * measured one, and the output's logic levels against the design and the rails. Formulas and their
 * uncertainty propagation are in circuitFormulas.ts. Uncertainties here are expanded, U = 2u (k = 2).
 */
import type { CircuitFigure, CircuitView } from '../types/index.js';
import type { DesignSection, DesignValue } from '../design/index.js';
import type { Estimate } from './circuitFormulas.js';
import { capacitanceFromRamps, coreFrequency, currentFromSlope, designEstimate } from './circuitFormulas.js';
import type { CoreReading } from './coreReadings.js';

interface Band {
  readonly nominal: number;
  readonly lower: number;
  readonly upper: number;
}

const bandOf = (d: DesignValue | undefined, k = 1): Band | undefined => d && { nominal: d.nominal * k, lower: d.lower * k, upper: d.upper * k };

function figure(id: string, label: string, x: Estimate, unit: string, band?: Band, note?: string): CircuitFigure {
  const base = { id, label, value: x.value, unit, uncertainty: 2 * x.u };
  const noteField = note ? { note } : {};
  if (!band) return { ...base, ...noteField };
  return {
    ...base,
    design: band.nominal,
    designTolerance: (band.upper - band.lower) / 2,
    ...(band.nominal !== 0 ? { deviation: (x.value / band.nominal - 1) * 100 } : {}),
    withinTolerance: x.value >= band.lower && x.value <= band.upper,
    ...noteField,
  };
}

/** The design swing: given, or the span between the designed thresholds. */
export function designSwing(design: DesignSection): DesignValue | undefined {
  if (design.swing) return design.swing;
  const { upperThreshold: up, lowerThreshold: dn } = design;
  if (!up || !dn) return undefined;
  return { nominal: up.nominal - dn.nominal, unit: 'V', lower: up.lower - dn.upper, upper: up.upper - dn.lower };
}

function currentFigures(r: CoreReading, design: DesignSection): CircuitFigure[] {
  const figures: CircuitFigure[] = [];
  const c = design.timingCapacitance;
  const kc = r.charge && design.chargeCurrent ? r.charge.value / design.chargeCurrent.nominal : 1;
  const dd = design.dischargeCurrent ?? design.chargeCurrent;
  const kd = r.discharge && dd ? r.discharge.value / dd.nominal : 1;
  const taking = 'taking C from the design; its tolerance dominates U';
  const ich = c && r.rise ? currentFromSlope(r.rise, designEstimate(c)) : null;
  const idis = c && r.fall ? currentFromSlope(r.fall, designEstimate(c)) : null;
  if (ich) figures.push(figure('chargeCurrent', 'charge current, C·dV/dt of the rising ramp', ich, 'A', r.charge ? bandOf(design.chargeCurrent, kc) : undefined, taking));
  if (idis) figures.push(figure('dischargeCurrent', 'discharge current, C·dV/dt of the falling ramp', idis, 'A', r.discharge ? bandOf(dd, kd) : undefined, taking));
  if (r.rise && r.fall) {
    const ratio = r.fall.value / r.rise.value;
    const u = ratio * Math.hypot(r.rise.u / r.rise.value, r.fall.u / r.fall.value);
    const designed = design.chargeCurrent && dd ? dd.nominal / design.chargeCurrent.nominal - 1 : undefined;
    const tol = design.chargeCurrent && dd ? Math.hypot(halfRel(design.chargeCurrent), halfRel(dd)) : undefined;
    const band = designed !== undefined && tol !== undefined ? { nominal: designed * 100, lower: (designed - tol) * 100, upper: (designed + tol) * 100 } : undefined;
    figures.push(figure('sinkVsSource', 'discharge vs charge current (slope ratio; C cancels)', { value: (ratio - 1) * 100, u: u * 100 }, '%', band));
  }
  if (r.rise && r.fall && r.charge && r.discharge && c) {
    const ceff = capacitanceFromRamps(r.charge, r.discharge, r.rise, r.fall);
    figures.push(figure('timingCapacitance', 'timing capacitance, I/(dV/dt) from both ramps', ceff, 'F', bandOf(c), 'taking the design currents at this condition'));
  }
  return figures;
}

const halfRel = (d: DesignValue): number => (d.upper - d.lower) / 2 / Math.abs(d.nominal);

function levelFigures(r: CoreReading, design: DesignSection): CircuitFigure[] {
  const figures: CircuitFigure[] = [];
  const swing = designSwing(design);
  if (r.top) figures.push(figure('upperThreshold', 'upper threshold, where the triangle turns down', r.top, 'V', bandOf(design.upperThreshold)));
  if (r.bottom) figures.push(figure('lowerThreshold', 'lower threshold, where the triangle turns up', r.bottom, 'V', bandOf(design.lowerThreshold)));
  if (r.swing) figures.push(figure('swing', 'triangle swing between the turns', r.swing, 'V', bandOf(swing)));
  const rail = design.positiveRail;
  if (r.logicHigh) {
    figures.push(figure('logicHigh', 'output logic high', r.logicHigh, 'V', bandOf(design.logicHigh)));
    // Headroom below the rail: U of the level alone (the rail's nominal is taken as exact).
    if (rail) figures.push(figure('railHeadroom', 'logic high below the positive rail', { value: rail.nominal - r.logicHigh.value, u: r.logicHigh.u }, 'V'));
  }
  if (r.logicLow) figures.push(figure('logicLow', 'output logic low', r.logicLow, 'V', bandOf(design.logicLow)));
  return figures;
}

function frequencyFigures(r: CoreReading, design: DesignSection): CircuitFigure[] {
  const c = design.timingCapacitance;
  const swing = designSwing(design);
  if (!c || !swing || !r.charge || !r.discharge) return [];
  const fx = coreFrequency(designEstimate(c), designEstimate(swing), r.charge, r.discharge);
  const matched = Math.abs(r.charge.value / r.discharge.value - 1) < 1e-9;
  const how = matched ? 'f = I/(2·C·Vpp)' : '1/f = C·Vpp·(1/I_charge + 1/I_discharge)';
  const figures = [figure('designFrequency', `frequency from the design values, ${how}`, fx, 'Hz', undefined, 'U from the design tolerances')];
  if (r.frequency) {
    const f = figure('frequency', 'measured frequency vs the design values', r.frequency, 'Hz');
    figures.push({ ...f, design: fx.value, deviation: (r.frequency.value / fx.value - 1) * 100 });
  }
  return figures;
}

export function circuitView(readings: readonly CoreReading[], design: DesignSection): CircuitView[] {
  return readings
    .map((r) => {
      const figures = [...currentFigures(r, design), ...frequencyFigures(r, design), ...levelFigures(r, design)];
      // Words for `summary` are written by report from the figures and gaps.
      return { condition: r.condition, figures, summary: [], ...(r.gaps.length ? { gaps: r.gaps } : {}) };
    })
    .filter((v) => v.figures.length > 0);
}
