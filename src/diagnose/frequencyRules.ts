/**
 * Frequency patterns across conditions. A triangle core runs at f = I/(2·C·Vpp) (charge current I,
 * timing capacitance C, swing Vpp; textbook relaxation-oscillator result, e.g. Sedra & Smith,
 * "Microelectronic Circuits", on triangle/square generators — from memory). Hence:
 * - a wrong C or reference current scales f by the same ratio at every condition;
 * - a fixed comparator/switching delay t_d adds 4·t_d to every period (each of the two ramps runs on
 *   for t_d past its threshold and must come back), so the error −4·t_d·f grows
 *   with frequency (closed form: f = f0/(1 + 2·t_d·f0));
 * - a fixed leakage or bias current matters most where the charge current is smallest: the low end.
 * A deviation counts when it passes a third of the frequency tolerance (0.5 % without one) and the
 * expanded uncertainty; both are common practice (no source).
 */
import type { Cause, CauseFact } from '../types/index.js';
import { formatQuantity } from '../design/index.js';
import type { CauseRule } from './rule.js';
import { scoreFrom } from './rule.js';
import type { FrequencyPoint, UnitFacts } from './unitFacts.js';
import { num, outputsShaped, pct, valueOf } from './unitFacts.js';

function threshold(f: UnitFacts): number {
  return f.frequencyTolerance !== null ? f.frequencyTolerance / 3 : 0.005;
}

const significant = (p: FrequencyPoint, thr: number): boolean => Math.abs(p.error) > thr && Math.abs(p.error) * p.nominal > p.U;
const listing = (ps: readonly FrequencyPoint[]): string => ps.map((p) => `${pct(p.error)} at ${p.condition} (${formatQuantity(p.measured, 'Hz', 5)} for ${formatQuantity(p.nominal, 'Hz', 5)})`).join(', ');

export const timingScale: CauseRule = (f) => {
  const ps = f.frequency;
  const thr = threshold(f);
  if (ps.length < 2 || !ps.every((p) => significant(p, thr) && Math.sign(p.error) === Math.sign(ps[0].error))) return null;
  const ratios = ps.map((p) => 1 + p.error);
  const mean = ratios.reduce((s, r) => s + r, 0) / ratios.length;
  const spread = Math.max(...ratios) - Math.min(...ratios);
  if (spread > 0.25 * Math.abs(mean - 1)) return null;
  const evidence = [
    `frequency off by the same ratio at every condition: ×${ratios.map((r) => num(r, 4)).join(', ×')} (spread ${(spread * 100).toFixed(2)} %)`,
    `errors ${listing(ps)}`,
  ];
  const c = f.design.timingCapacitance;
  const facts: CauseFact[] = [];
  if (c) {
    const needed = c.nominal / mean;
    // f = I/(2·C·Vpp): a capacitor alone off by 1/mean explains the whole ratio (share 1).
    facts.push({ part: 'timing capacitor', observed: { value: needed, unit: 'F' }, design: { nominal: c.nominal, lower: c.lower, upper: c.upper, unit: 'F' }, shareExplained: 1, confirm: 'measure it out of circuit on a capacitance meter' });
    evidence.push(`f = I/(2·C·Vpp): ×${num(mean, 4)} needs C ≈ ${formatQuantity(needed, 'F', 3)} (${pct(needed / c.nominal - 1, 1)}; design ${formatQuantity(c.nominal, 'F', 3)}, ${formatQuantity(c.lower, 'F', 3)} … ${formatQuantity(c.upper, 'F', 3)}) or the reference current ${pct(mean - 1, 1)}`);
  }
  const swings = outputsShaped(f, ['triangle']).map((o) => valueOf(o.channel, 'peakToPeak')).filter((v): v is number => v !== null);
  const swing = f.design.swing;
  if (swing && swings.length) evidence.push(`triangle swing ${formatQuantity(swings[0], 'V', 4)} against ${formatQuantity(swing.nominal, 'V', 3)} design, so the thresholds do not explain it`);
  return {
    id: 'timing-scale',
    title: 'timing capacitor value or reference current off (same frequency ratio at every condition)',
    score: scoreFrom(mean - 1, thr, 3 * thr),
    evidence,
    confirm: `measure the timing capacitor out of circuit${c ? ` (design ${formatQuantity(c.nominal, 'F', 3)})` : ''}, then the charge current at one condition; f = I/(2·C·Vpp) says which of the two is off`,
    where: 'timing capacitor; reference current source (exponential converter reference resistor, scale trim)',
    ...(facts.length ? { facts } : {}),
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
  const delays = ps.filter((p) => p.error < 0).map((p) => ({ c: p.condition, td: (1 / p.measured - 1 / p.nominal) / 4 }));
  const evidence = [`frequency error grows with frequency: ${listing(ps)}`, `each period is longer by 4·t_d: t_d ≈ ${delays.map((d) => `${formatQuantity(d.td, 's', 3)} at ${d.c}`).join(', ')}`];
  const swing = swingGrowth(f);
  if (swing) evidence.push(swing);
  return {
    id: 'switching-delay',
    title: 'comparator and switching delay (error grows with frequency)',
    score: scoreFrom(hi.error, thr, 3 * thr),
    evidence,
    confirm: 'trigger on the triangle crossing a threshold and measure the time to the pulse edge at the highest condition; compare with the comparator datasheet delay',
    where: 'comparator, the switch that reverses the current, and their drive',
  };
};

/** The triangle overshooting its thresholds more at high frequency: ramps run on for t_d after each crossing. */
function swingGrowth(f: UnitFacts): string | null {
  const tri = outputsShaped(f, ['triangle']);
  const byCond = f.frequency.map((p) => ({ p, vpp: tri.find((o) => o.condition === p.condition && !o.clipped && o.saturated.length === 0)?.channel })).filter((x) => x.vpp);
  if (byCond.length < 2) return null;
  const first = valueOf(byCond[0].vpp!, 'peakToPeak');
  const last = valueOf(byCond[byCond.length - 1].vpp!, 'peakToPeak');
  if (first === null || last === null || last - first < 0.01 * first) return null;
  const top = byCond[byCond.length - 1].p;
  const slope = 2 * first * top.measured; // V/s of a symmetric ramp covering the low-end swing
  return `triangle swing grows with frequency, ${formatQuantity(first, 'V', 4)} → ${formatQuantity(last, 'V', 4)}: ramps run past the thresholds for ≈ ${formatQuantity((last - first) / 2 / slope, 's', 2)} at ${top.condition}`;
}

export const lowEndLeakage: CauseRule = (f) => {
  const ps = f.frequency;
  const thr = threshold(f);
  if (ps.length < 2) return null;
  const lo = ps[0];
  const hi = ps[ps.length - 1];
  if (!(significant(lo, thr) && Math.abs(lo.error) > 2 * Math.abs(hi.error) + thr / 2)) return null;
  const evidence = [`frequency error is largest at the low end and shrinks with frequency: ${listing(ps)}`];
  const i = f.design.chargeCurrent;
  const ref = i?.at ? ps.find((p) => p.condition === i.at) : undefined;
  if (i && ref) {
    const iLow = (i.nominal * lo.nominal) / ref.nominal;
    evidence.push(`a fixed current of ≈ ${formatQuantity(Math.abs(lo.error) * iLow, 'A', 2)} against the ${formatQuantity(iLow, 'A', 3)} charge current at ${lo.condition} would do this`);
  }
  const cause: Cause = {
    id: 'low-end-leakage',
    title: 'leakage or bias current (error at the low end)',
    score: scoreFrom(lo.error, thr, 3 * thr),
    evidence,
    confirm: `at ${lo.condition}, hold the comparator and watch the integrator drift, or measure the charge current directly; compare with the op-amp input bias and capacitor/switch leakage`,
    where: 'timing capacitor (leaky dielectric), current switch off-leakage, integrator op-amp input bias, board contamination',
  };
  return cause;
};
