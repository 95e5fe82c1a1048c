/**
 * Each part the attribution can blame, in circuit words: what its fitted deviation means as a value on
 * the board (an effective capacitance, current, swing, delay or level), set against its design
 * tolerance, and the independent measurement that confirms it.
 */
import type { DesignSection, DesignValue } from '../design/index.js';
import { formatQuantity } from '../design/index.js';
import type { PartId } from './circuitFit.js';
import type { CoreReading } from './coreReadings.js';
import { designSwing } from './circuitView.js';

export interface PartContext {
  readonly design: DesignSection;
  readonly readings: readonly CoreReading[];
}

export interface PartReading {
  /** The part's value on the board, against its design, in words. */
  readonly figure: string;
  /** Deviation over the tolerance half-width (1 = at the edge of its tolerance); null without one. */
  readonly toleranceMultiple: number | null;
  /** The same reading as data (value on the board, design band), for parts moved to facts. */
  readonly observed?: { readonly value: number; readonly unit: string; readonly design?: { readonly nominal: number; readonly lower: number; readonly upper: number } };
}

export interface PartText {
  readonly title: string;
  readonly short: string;
  /** The independent measurement that confirms or clears this part. */
  readonly measure: string;
  readonly where: string;
  read(theta: number, uTheta: number, ctx: PartContext): PartReading;
}

const q = (v: number, unit: string, digits = 4): string => formatQuantity(v, unit, digits);
const halfRel = (d: DesignValue): number => (d.upper - d.lower) / 2 / Math.abs(d.nominal);
const tolText = (d: DesignValue): string => `${Number((halfRel(d) * 100).toPrecision(3))} %`;

function position(value: number, d: DesignValue, noun: string): string {
  if (value > d.upper) return `consistent with ${noun} above its tolerance`;
  if (value < d.lower) return `consistent with ${noun} below its tolerance`;
  const x = (value - d.nominal) / ((d.upper - d.lower) / 2);
  if (x > 0.5) return `consistent with ${noun} at the top of its tolerance`;
  if (x < -0.5) return `consistent with ${noun} at the bottom of its tolerance`;
  return `${noun} within its tolerance`;
}

const multiple = (value: number, d: DesignValue | undefined): number | null => (d ? Math.abs(value - d.nominal) / ((d.upper - d.lower) / 2) : null);
const pm = (x: number, digits = 1): string => `${x >= -0.5 * 10 ** -(digits + 2) ? '+' : '−'}${Math.abs(x * 100).toFixed(digits)} %`;

/** The condition where a design current holds (its `at`), or the first condition with readings. */
function refCondition(ctx: PartContext): string {
  return ctx.design.chargeCurrent?.at ?? ctx.readings[0]?.condition ?? '';
}

function current(which: 'charge' | 'discharge', theta: number, ctx: PartContext): PartReading {
  const d = which === 'charge' ? ctx.design.chargeCurrent : (ctx.design.dischargeCurrent ?? ctx.design.chargeCurrent);
  if (!d) return { figure: `${which} current ${pm(Math.expm1(theta))}`, toleranceMultiple: null };
  const value = d.nominal * Math.exp(theta);
  return { figure: `${which} current ${q(value, 'A')} at ${refCondition(ctx)} vs ${q(d.nominal, 'A')} ± ${tolText(d)} (${pm(Math.expm1(theta))})`, toleranceMultiple: multiple(value, d) };
}

export const PARTS: Readonly<Record<PartId, PartText>> = {
  'timing-capacitor': {
    title: 'timing capacitor off its value',
    short: 'the timing capacitor',
    measure: 'measure the timing capacitor out of circuit on a capacitance meter',
    where: 'timing capacitor (value, dielectric, a wrong part fitted)',
    read: (theta, _u, ctx) => {
      const c = ctx.design.timingCapacitance!;
      const value = c.nominal * Math.exp(theta);
      return {
        figure: `capacitance ${q(value, 'F')} effective vs ${q(c.nominal, 'F', 3)} ± ${tolText(c)} — ${position(value, c, 'a capacitor')}`,
        toleranceMultiple: multiple(value, c),
        observed: { value, unit: 'F', design: { nominal: c.nominal, lower: c.lower, upper: c.upper } },
      };
    },
  },
  'reference-current': {
    title: 'reference current off (both currents by the same ratio)',
    short: 'the reference current (both currents together)',
    measure: 'measure the charge current directly, as the voltage across its current-setting resistor',
    where: 'reference current source: exponential converter reference resistor, scale trim',
    read: (theta, _u, ctx) => {
      const r = current('charge', theta, ctx);
      const d = ctx.design.chargeCurrent;
      return { figure: `both currents ${pm(Math.expm1(theta))}: ${r.figure.replace('charge current ', '')}${d ? ` — ${position(d.nominal * Math.exp(theta), d, 'a reference current')}` : ''}`, toleranceMultiple: r.toleranceMultiple };
    },
  },
  'charge-source': {
    title: 'charge current source off (the rising ramp alone)',
    short: 'the charge current source',
    measure: 'measure the voltage across the charge current-setting resistor',
    where: 'charge current source: its transistor and emitter resistor',
    read: (theta, _u, ctx) => current('charge', theta, ctx),
  },
  'discharge-sink': {
    title: 'discharge current sink off (the falling ramp alone)',
    short: 'the discharge current sink',
    measure: 'measure the voltage across the discharge (sink) current-setting resistor',
    where: 'discharge current sink: its transistor and emitter resistor',
    read: (theta, _u, ctx) => current('discharge', theta, ctx),
  },
  'current-mirror': {
    title: 'charge/discharge current mismatch (the sink does not mirror the source)',
    short: 'a current mismatch between source and sink',
    measure: 'measure the voltage across the two emitter resistors of the current mirror at one condition; they should agree within 1 %',
    where: 'current mirror transistors and their emitter resistors',
    read: (theta, _u, ctx) => {
      const { chargeCurrent: ic, dischargeCurrent: id } = ctx.design;
      const allowed = ic ? Math.hypot(halfRel(ic), halfRel(id ?? ic)) : null;
      const sink = Math.exp(-theta) - 1;
      const at = ctx.readings.find((r) => r.condition === refCondition(ctx) && r.rise && r.fall);
      const c = ctx.design.timingCapacitance?.nominal;
      const amps = at && c ? `charging at ${q(c * at.rise!.value, 'A')}, discharging at ${q(c * at.fall!.value, 'A')} at ${at.condition} (taking C = ${q(c, 'F', 3)}): ` : '';
      return {
        figure: `${amps}the sink runs ${Math.abs(sink * 100).toFixed(1)} % ${sink > 0 ? 'hot' : 'cold'} against the source${allowed ? ` (the current tolerances allow ± ${(allowed * 100).toFixed(1)} %)` : ''}`,
        toleranceMultiple: allowed ? Math.abs(sink) / allowed : null,
      };
    },
  },
  'threshold-divider': {
    title: 'comparator threshold divider off (swing wrong, ramps right)',
    short: 'the comparator threshold divider',
    measure: 'measure the comparator reference voltages and the divider resistors',
    where: 'comparator threshold divider; the logic levels that drive it',
    read: (theta, _u, ctx) => {
      const s = designSwing(ctx.design)!;
      const value = s.nominal * (1 + theta);
      return { figure: `swing ${q(value, 'V')} effective vs ${q(s.nominal, 'V', 3)} ± ${tolText(s)} with the ramp slopes on design — ${position(value, s, 'a threshold divider')}`, toleranceMultiple: multiple(value, s) };
    },
  },
  'threshold-centre': {
    title: 'thresholds off centre: bias divider or buffer offset',
    short: 'a shifted threshold centre',
    measure: 'measure the midpoint of the comparator thresholds (bias divider) with the core stopped',
    where: 'threshold bias divider; integrator or buffer op-amp offset',
    read: (theta, _u, ctx) => {
      const shift = theta * designSwing(ctx.design)!.nominal;
      const up = ctx.design.upperThreshold;
      return { figure: `both turns moved by ${q(shift, 'V', 3)}, the swing unchanged`, toleranceMultiple: up ? Math.abs(shift) / ((up.upper - up.lower) / 2) : null };
    },
  },
  'switching-delay': {
    title: 'comparator and switching delay (turns move out with frequency)',
    short: 'comparator and switching delay',
    measure: 'trigger on the triangle crossing a threshold and time the flip of the output; a capture at another condition also tells, as a delay’s overshoot grows with frequency',
    where: 'comparator, the switch that reverses the current, and their drive',
    read: (theta, _u, ctx) => {
      const swing = designSwing(ctx.design)!.nominal;
      const fMax = Math.max(0, ...ctx.readings.map((r) => r.fNominal ?? 0));
      const over = (theta * swing) / 2;
      const up = ctx.design.upperThreshold;
      // Overshoot per side = slope·t_d with the symmetric slope 2·Vpp·f at the fastest condition.
      const delay = fMax > 0 ? ` ≈ ${q(theta / (4 * fMax), 's', 2)} of delay per flip` : '';
      return { figure: `ramps run ${q(over, 'V', 3)} past each threshold at the fastest condition${delay}`, toleranceMultiple: up ? Math.abs(over) / ((up.upper - up.lower) / 2) : null };
    },
  },
  'logic-loading': {
    title: 'low logic high: loading of the output pull-up or divider',
    short: 'loading of the output stage',
    measure: 'measure the high level with the output jack unplugged (if it recovers, the load or pull-up divider is at fault), and the positive rail at the module',
    where: 'pull-up resistor and output divider of the pulse stage, what the jack drives, the positive rail',
    read: (theta, _u, ctx) => {
      const d = ctx.design.logicHigh!;
      const value = d.nominal * Math.exp(theta);
      const rail = ctx.design.positiveRail;
      const railText = rail ? `, ${q(rail.nominal - value, 'V', 3)} below the ${q(rail.nominal, 'V', 3)} rail` : '';
      return { figure: `logic high ${q(value, 'V')} vs ${q(d.nominal, 'V', 3)} ± ${tolText(d)}${railText}`, toleranceMultiple: multiple(value, d) };
    },
  },
};
