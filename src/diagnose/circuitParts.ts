/**
 * Each part the attribution can blame, in circuit words: what its fitted deviation means as a value on
 * the board (an effective capacitance, current, swing, delay or level), set against its design
 * tolerance, as data, and the independent measurement that confirms it.
 */
import type { CauseFact, FactQuantity } from '../types/index.js';
import type { DesignSection, DesignValue } from '../design/index.js';
import type { PartId } from './circuitFit.js';
import type { CoreReading } from './coreReadings.js';
import { designSwing } from './circuitView.js';
import { derivedFact, quantity } from './causeFacts.js';

export interface PartContext {
  readonly design: DesignSection;
  readonly readings: readonly CoreReading[];
}

export interface PartReading {
  /** The part's value on the board against its design first, then figures that go with it. */
  readonly facts: readonly CauseFact[];
  /** Deviation over the tolerance half-width (1 = at the edge of its tolerance); null without one. */
  readonly toleranceMultiple: number | null;
}

export interface PartText {
  readonly title: string;
  /** The part's name as a noun: 'timing capacitor'. */
  readonly short: string;
  /** The independent measurement that confirms or clears this part. */
  readonly measure: string;
  readonly where: string;
  read(theta: number, uTheta: number, ctx: PartContext): PartReading;
}

const halfRel = (d: DesignValue): number => (d.upper - d.lower) / 2 / Math.abs(d.nominal);
const multiple = (value: number, d: DesignValue | undefined): number | null => (d ? Math.abs(value - d.nominal) / ((d.upper - d.lower) / 2) : null);
const band = (d: DesignValue, unit: string): NonNullable<CauseFact['design']> => ({ nominal: d.nominal, lower: d.lower, upper: d.upper, unit });
/** A band about zero of half-width h: how far a shift may go. */
const zeroBand = (h: number, unit: string): NonNullable<CauseFact['design']> => ({ nominal: 0, lower: -h, upper: h, unit });

/** θ = ln(value/nominal) with u(θ): value and U = 2·u(θ)·value (first order, GUM §5.1.2). */
const logQuantity = (nominal: number, theta: number, uTheta: number, unit: string): FactQuantity => {
  const value = nominal * Math.exp(theta);
  return quantity(value, unit, 2 * uTheta * Math.abs(value));
};

function partFact(part: string, observed: FactQuantity, design?: CauseFact['design'], condition?: string): CauseFact {
  return { kind: 'part', part, ...(condition ? { condition } : {}), observed, ...(design ? { design } : {}) };
}

/** The condition where a design current holds (its `at`), or the first condition with readings. */
function refCondition(ctx: PartContext): string {
  return ctx.design.chargeCurrent?.at ?? ctx.readings[0]?.condition ?? '';
}

function current(which: 'charge' | 'discharge', theta: number, uTheta: number, ctx: PartContext): PartReading {
  const d = which === 'charge' ? ctx.design.chargeCurrent : (ctx.design.dischargeCurrent ?? ctx.design.chargeCurrent);
  const part = `${which} current`;
  if (!d) return { facts: [partFact(`${part}, relative change`, quantity(Math.expm1(theta) * 100, '%', 200 * uTheta))], toleranceMultiple: null };
  const observed = logQuantity(d.nominal, theta, uTheta, 'A');
  return { facts: [partFact(part, observed, band(d, 'A'), refCondition(ctx))], toleranceMultiple: multiple(observed.value, d) };
}

export const PARTS: Readonly<Record<PartId, PartText>> = {
  'timing-capacitor': {
    title: 'timing capacitor off its value',
    short: 'timing capacitor',
    measure: 'measure the timing capacitor out of circuit on a capacitance meter',
    where: 'timing capacitor (value, dielectric, a wrong part fitted)',
    read: (theta, u, ctx) => {
      const c = ctx.design.timingCapacitance!;
      const observed = logQuantity(c.nominal, theta, u, 'F');
      return { facts: [partFact('timing capacitor, effective', observed, band(c, 'F'))], toleranceMultiple: multiple(observed.value, c) };
    },
  },
  'reference-current': {
    title: 'reference current off (both currents by the same ratio)',
    short: 'reference current (both currents together)',
    measure: 'measure the charge current directly, as the voltage across its current-setting resistor',
    where: 'reference current source: exponential converter reference resistor, scale trim',
    read: (theta, u, ctx) => {
      const r = current('charge', theta, u, ctx);
      return { facts: [{ ...r.facts[0], part: ctx.design.chargeCurrent ? 'charge current, with the discharge current by the same ratio' : 'both currents, relative change' }], toleranceMultiple: r.toleranceMultiple };
    },
  },
  'charge-source': {
    title: 'charge current source off (the rising ramp alone)',
    short: 'charge current source',
    measure: 'measure the voltage across the charge current-setting resistor',
    where: 'charge current source: its transistor and emitter resistor',
    read: (theta, u, ctx) => current('charge', theta, u, ctx),
  },
  'discharge-sink': {
    title: 'discharge current sink off (the falling ramp alone)',
    short: 'discharge current sink',
    measure: 'measure the voltage across the discharge (sink) current-setting resistor',
    where: 'discharge current sink: its transistor and emitter resistor',
    read: (theta, u, ctx) => current('discharge', theta, u, ctx),
  },
  'current-mirror': {
    title: 'charge/discharge current mismatch (the sink does not mirror the source)',
    short: 'current mismatch between source and sink',
    measure: 'measure the voltage across the two emitter resistors of the current mirror at one condition; they should agree within 1 %',
    where: 'current mirror transistors and their emitter resistors',
    read: (theta, u, ctx) => {
      const { chargeCurrent: ic, dischargeCurrent: id } = ctx.design;
      // The two tolerances combined in quadrature (GUM §5.1.2, independent parts).
      const allowed = ic ? Math.hypot(halfRel(ic), halfRel(id ?? ic)) : null;
      // θ = ln(I_charge/I_discharge): the sink against the source is e^−θ − 1.
      const sink = Math.exp(-theta) - 1;
      const facts: CauseFact[] = [partFact('discharge current against the charge current', quantity(sink * 100, '%', 200 * u * Math.exp(-theta)), allowed ? zeroBand(allowed * 100, '%') : undefined)];
      const at = ctx.readings.find((r) => r.condition === refCondition(ctx) && r.rise && r.fall);
      const c = ctx.design.timingCapacitance?.nominal;
      // I = C·dV/dt of each ramp, taking the design C (capacitor law).
      if (at && c) {
        facts.push(derivedFact('charge current, C·dV/dt with the design C', quantity(c * at.rise!.value, 'A', 2 * c * at.rise!.u), { condition: at.condition }));
        facts.push(derivedFact('discharge current, C·dV/dt with the design C', quantity(c * at.fall!.value, 'A', 2 * c * at.fall!.u), { condition: at.condition }));
      }
      return { facts, toleranceMultiple: allowed ? Math.abs(sink) / allowed : null };
    },
  },
  'threshold-divider': {
    title: 'comparator threshold divider off (swing wrong, ramps right)',
    short: 'comparator threshold divider',
    measure: 'measure the comparator reference voltages and the divider resistors',
    where: 'comparator threshold divider; the logic levels that drive it',
    read: (theta, u, ctx) => {
      const s = designSwing(ctx.design)!;
      const value = s.nominal * (1 + theta);
      return { facts: [partFact('swing set by the thresholds, with the ramp slopes on design', quantity(value, 'V', 2 * u * s.nominal), band(s, 'V'))], toleranceMultiple: multiple(value, s) };
    },
  },
  'threshold-centre': {
    title: 'thresholds off centre: bias divider or buffer offset',
    short: 'shifted threshold centre',
    measure: 'measure the midpoint of the comparator thresholds (bias divider) with the core stopped',
    where: 'threshold bias divider; integrator or buffer op-amp offset',
    read: (theta, u, ctx) => {
      const swing = designSwing(ctx.design)!.nominal;
      const shift = theta * swing;
      const up = ctx.design.upperThreshold;
      const h = up ? (up.upper - up.lower) / 2 : null;
      return { facts: [partFact('shift of both turns, the swing unchanged', quantity(shift, 'V', 2 * u * swing), h ? zeroBand(h, 'V') : undefined)], toleranceMultiple: h ? Math.abs(shift) / h : null };
    },
  },
  'switching-delay': {
    title: 'comparator and switching delay (turns move out with frequency)',
    short: 'comparator and switching delay',
    measure: 'trigger on the triangle crossing a threshold and time the flip of the output; a capture at another condition also tells, as a delay’s overshoot grows with frequency',
    where: 'comparator, the switch that reverses the current, and their drive',
    read: (theta, u, ctx) => {
      const swing = designSwing(ctx.design)!.nominal;
      const fMax = Math.max(0, ...ctx.readings.map((r) => r.fNominal ?? 0));
      const top = ctx.readings.find((r) => r.fNominal === fMax)?.condition;
      const over = (theta * swing) / 2;
      const up = ctx.design.upperThreshold;
      const h = up ? (up.upper - up.lower) / 2 : null;
      const facts: CauseFact[] = [partFact('ramp overrun past each threshold', quantity(over, 'V', u * swing), h ? zeroBand(h, 'V') : undefined, top)];
      const delay = delayFromGrowth(ctx.readings) ?? delayFromFit(theta, u, fMax, ctx.readings.find((r) => r.condition === top));
      if (delay) facts.push(derivedFact('switching delay per flip', delay, top ? { condition: top } : {}));
      return { facts, toleranceMultiple: h ? Math.abs(over) / h : null };
    },
  },
  'logic-loading': {
    title: 'low logic high: loading of the output pull-up or divider',
    short: 'loading of the output stage',
    measure: 'measure the high level with the output jack unplugged (if it recovers, the load or pull-up divider is at fault), and the positive rail at the module',
    where: 'pull-up resistor and output divider of the pulse stage, what the jack drives, the positive rail',
    read: (theta, u, ctx) => {
      const d = ctx.design.logicHigh!;
      const observed = logQuantity(d.nominal, theta, u, 'V');
      const rail = ctx.design.positiveRail;
      const facts: CauseFact[] = [partFact('logic high', observed, band(d, 'V'))];
      if (rail) facts.push(derivedFact('logic high below the positive rail', quantity(rail.nominal - observed.value, 'V', observed.expandedUncertainty)));
      return { facts, toleranceMultiple: multiple(observed.value, d) };
    },
  },
};

/**
 * The delay from how the swing grows between the slowest and the fastest condition. Each ramp runs
 * on past its threshold for t_d at its own slope, so the swing is S0 + (s_r + s_f)·t_d at every
 * condition: t_d = ΔVpp / Δ(s_r + s_f), with the measured turns and slopes. Static threshold errors
 * (divider, centre) cancel in the difference. Null when the two conditions or their slopes are missing.
 */
function delayFromGrowth(readings: readonly CoreReading[]): FactQuantity | null {
  const usable = readings.filter((r) => r.top && r.bottom && r.rise && r.fall && r.fNominal);
  if (usable.length < 2) return null;
  const byF = [...usable].sort((a, b) => a.fNominal! - b.fNominal!);
  const lo = byF[0];
  const hi = byF[byF.length - 1];
  const span = (r: CoreReading) => r.top!.value - r.bottom!.value;
  const slopes = (r: CoreReading) => r.rise!.value + r.fall!.value;
  const dS = slopes(hi) - slopes(lo);
  if (!(dS > 0)) return null;
  const u = Math.hypot(hi.top!.u, hi.bottom!.u, lo.top!.u, lo.bottom!.u) / dS;
  return quantity((span(hi) - span(lo)) / dS, 's', 2 * u);
}

/**
 * The delay from the fitted swing growth θ at the fastest condition: θ·Vpp = (s_r + s_f)·t_d =
 * Vpp·f·(2 + r + 1/r)·t_d with r = s_r/s_f (4 for matched ramps; the frequency rule's law,
 * frequencyRules.ts). Used when the turns cannot be compared between two conditions.
 */
function delayFromFit(theta: number, u: number, fMax: number, reading: CoreReading | undefined): FactQuantity | null {
  if (!(fMax > 0)) return null;
  const r = reading?.rise && reading.fall && reading.fall.value > 0 ? reading.rise.value / reading.fall.value : NaN;
  const k = fMax * (Number.isFinite(r) && r > 0 ? 2 + r + 1 / r : 4);
  return quantity(theta / k, 's', (2 * u) / k);
}
