/**
 * Frequency patterns across conditions. A triangle core runs at f = I/(2·C·Vpp) (charge current I,
 * timing capacitance C, swing Vpp; textbook relaxation-oscillator result, e.g. Sedra & Smith,
 * "Microelectronic Circuits", on triangle/square generators — from memory). Hence:
 * - a wrong C or reference current scales f by the same ratio at every condition;
 * - a fixed comparator/switching delay t_d lengthens every period: each ramp runs on for t_d past its
 *   threshold at its own slope and must come back at the other's, so the period grows by
 *   t_d·(2 + s_r/s_f + s_f/s_r) with s_r, s_f the ramp slopes' magnitudes — 4·t_d for matched ramps
 *   (closed form: f = f0/(1 + 4·t_d·f0)); the error grows with frequency. The unequal-slope form is
 *   checked against an ngspice triangle core with a delay line (test/ngspice/delayedComparator.test.ts);
 * - a fixed leakage or bias current matters most where the charge current is smallest: the low end.
 * A deviation counts when it passes a third of the frequency tolerance (0.5 % without one) and the
 * expanded uncertainty; both are common practice (no source).
 */
import type { Cause, CauseFact, CauseRemark } from '../types/index.js';
import type { CauseRule } from './rule.js';
import { scoreFrom } from './rule.js';
import type { FrequencyPoint, UnitFacts } from './unitFacts.js';
import { outputsShaped } from './unitFacts.js';
import { derivedFact, expected, frequencyFact, measuredFact, present, quantity } from './causeFacts.js';

function threshold(f: UnitFacts): number {
  return f.frequencyTolerance !== null ? f.frequencyTolerance / 3 : 0.005;
}

const significant = (p: FrequencyPoint, thr: number): boolean => Math.abs(p.error) > thr && Math.abs(p.error) * p.nominal > p.U;

export const timingScale: CauseRule = (f) => {
  const ps = f.frequency;
  const thr = threshold(f);
  if (ps.length < 2 || !ps.every((p) => significant(p, thr) && Math.sign(p.error) === Math.sign(ps[0].error))) return null;
  const ratios = ps.map((p) => 1 + p.error);
  const mean = ratios.reduce((s, r) => s + r, 0) / ratios.length;
  const spread = Math.max(...ratios) - Math.min(...ratios);
  if (spread > 0.25 * Math.abs(mean - 1)) return null;
  const facts: CauseFact[] = [...ps.map(frequencyFact), derivedFact('spread of the frequency ratio across conditions', quantity(spread * 100, '%'))];
  const remarks: CauseRemark[] = ['same-ratio-everywhere'];
  const c = f.design.timingCapacitance;
  if (c) {
    // f = I/(2·C·Vpp): a capacitor alone off by 1/mean explains the whole ratio (share 1).
    facts.push({ kind: 'part', part: 'timing capacitor', observed: quantity(c.nominal / mean, 'F'), design: { nominal: c.nominal, lower: c.lower, upper: c.upper, unit: 'F' }, shareExplained: 1, confirm: 'measure it out of circuit on a capacitance meter' });
  }
  const i = f.design.chargeCurrent;
  facts.push(
    i
      ? { kind: 'part', part: 'charge current', ...(i.at ? { condition: i.at } : {}), observed: quantity(i.nominal * mean, 'A'), design: { nominal: i.nominal, lower: i.lower, upper: i.upper, unit: 'A' }, shareExplained: 1, confirm: 'measure the charge current at one condition' }
      : { kind: 'part', part: 'reference current, relative change', observed: quantity((mean - 1) * 100, '%'), shareExplained: 1, confirm: 'measure the charge current at one condition' },
  );
  const swing = f.design.swing;
  const tri = outputsShaped(f, ['triangle']).find((o) => o.channel.measurements.peakToPeak?.value != null);
  const vpp = tri && swing ? measuredFact(tri, 'peakToPeak', expected(swing.nominal, 'V', 'design')) : null;
  if (vpp && swing) {
    facts.push(vpp);
    if (vpp.observed.value >= swing.lower && vpp.observed.value <= swing.upper) remarks.push('swing-not-the-cause');
  }
  return {
    id: 'timing-scale',
    title: 'timing capacitor value or reference current off (same frequency ratio at every condition)',
    score: scoreFrom(mean - 1, thr, 3 * thr),
    evidence: [],
    confirm: 'measure the timing capacitor out of circuit, then the charge current at one condition; f = I/(2·C·Vpp) says which of the two is off',
    where: 'timing capacitor; reference current source (exponential converter reference resistor, scale trim)',
    facts,
    remarks,
  };
};

export const switchingDelay: CauseRule = (f) => {
  const ps = f.frequency;
  const thr = threshold(f);
  if (ps.length < 2) return null;
  const lo = ps[0];
  const hi = ps[ps.length - 1];
  if (!(hi.error < 0 && significant(hi, thr) && Math.abs(hi.error) > 2 * Math.abs(lo.error) + thr / 2)) return null;
  if (!ps.every((p, i) => i === 0 || p.error <= ps[i - 1].error + thr / 2)) return null;
  // T = 1/f0 + k·t_d with k = 2 + r + 1/r (r the slope ratio there, k = 4 when the ramps match), so
  // t_d = (1/f − 1/f0)/k and u(t_d) = u(f)/(k·f²) (first-order propagation, GUM §5.1.2).
  const delays = ps
    .filter((p) => p.error < 0)
    .map((p) => {
      const k = delayFactor(f, p.condition);
      return derivedFact('switching delay per flip', quantity((1 / p.measured - 1 / p.nominal) / k, 's', p.U / (k * p.measured * p.measured)), { condition: p.condition });
    });
  const growth = swingGrowth(f);
  const remarks: CauseRemark[] = ['error-grows-with-frequency', 'period-longer-by-4td', ...(growth.length ? (['swing-grows-with-frequency'] as const) : [])];
  return {
    id: 'switching-delay',
    title: 'comparator and switching delay (error grows with frequency)',
    score: scoreFrom(hi.error, thr, 3 * thr),
    evidence: [],
    confirm: 'trigger on the triangle crossing a threshold and measure the time to the pulse edge at the highest condition; compare with the comparator datasheet delay',
    where: 'comparator, the switch that reverses the current, and their drive',
    facts: [...ps.map(frequencyFact), ...delays, ...growth],
    remarks,
  };
};

/**
 * How many delays one period gains: 2 + r + 1/r for a triangle whose rising and falling slopes stand
 * in the ratio r at that condition (each overrun at one slope is undone at the other), 4 when no
 * triangle's slope ratio was measured there (matched ramps).
 */
function delayFactor(f: UnitFacts, condition: string): number {
  const tri = outputsShaped(f, ['triangle']).find((o) => o.condition === condition);
  const r = tri?.channel.measurements.slopeRatio?.value;
  return typeof r === 'number' && Number.isFinite(r) && r > 0 ? 2 + r + 1 / r : 4;
}

/** The triangle overshooting its thresholds more at high frequency: ramps run on for t_d after each crossing. */
function swingGrowth(f: UnitFacts): CauseFact[] {
  const tri = outputsShaped(f, ['triangle']);
  const byCond = f.frequency.map((p) => ({ p, o: tri.find((o) => o.condition === p.condition && !o.clipped && o.saturated.length === 0) })).filter((x) => x.o);
  if (byCond.length < 2) return [];
  const firstAt = byCond[0].o!;
  const lastAt = byCond[byCond.length - 1].o!;
  const first = measuredFact(firstAt, 'peakToPeak');
  const last = measuredFact(lastAt, 'peakToPeak');
  if (!first || !last || last.observed.value - first.observed.value < 0.01 * first.observed.value) return [];
  const top = byCond[byCond.length - 1].p;
  const slope = 2 * first.observed.value * top.measured; // V/s of a symmetric ramp covering the low-end swing
  const overrun = derivedFact('ramp overrun past each threshold', quantity((last.observed.value - first.observed.value) / 2 / slope, 's'), { condition: top.condition });
  return [first, last, overrun].filter(present);
}

export const lowEndLeakage: CauseRule = (f) => {
  const ps = f.frequency;
  const thr = threshold(f);
  if (ps.length < 2) return null;
  const lo = ps[0];
  const hi = ps[ps.length - 1];
  if (!(significant(lo, thr) && Math.abs(lo.error) > 2 * Math.abs(hi.error) + thr / 2)) return null;
  const facts: CauseFact[] = ps.map(frequencyFact);
  const i = f.design.chargeCurrent;
  const ref = i?.at ? ps.find((p) => p.condition === i.at) : undefined;
  if (i && ref) {
    // The design charge current carried to the low end in proportion to the nominal frequency.
    const iLow = (i.nominal * lo.nominal) / ref.nominal;
    facts.push(derivedFact('fixed leakage current that would do this', quantity(Math.abs(lo.error) * iLow, 'A'), { condition: lo.condition, expected: expected(iLow, 'A', 'design') }));
  }
  const cause: Cause = {
    id: 'low-end-leakage',
    title: 'leakage or bias current (error at the low end)',
    score: scoreFrom(lo.error, thr, 3 * thr),
    evidence: [],
    confirm: 'at the lowest condition, hold the comparator and watch the integrator drift, or measure the charge current directly; compare with the op-amp input bias and capacitor/switch leakage',
    where: 'timing capacitor (leaky dielectric), current switch off-leakage, integrator op-amp input bias, board contamination',
    facts,
    remarks: ['error-largest-at-low-end'],
  };
  return cause;
};
