/**
 * Shape patterns of the triangle and the levels of the pulse.
 * - Ramp slopes are I/C, so the slope ratio is the charge/discharge current ratio; a ratio other than
 *   the design's (1 for matched currents) also skews the symmetry and the pulse duty (rising share 1/(1 + ratio)) and brings even
 *   harmonics, which a symmetric triangle lacks (Fourier series, REFERENCES.md §4).
 * - The swing and peaks are the comparator thresholds; the mean is where they are centred.
 * - A trace flat at one level inside the scope's range is saturation (output stage or rail); at the
 *   scope's full scale it is the vertical setting (analysis/flatTops.ts tells them apart).
 * Thresholds: a 2 % slope mismatch, −45 dBc for H2, 2 % of the swing for an offset, 1 point of duty
 * (common practice, no source); always also beyond the measurement's expanded uncertainty.
 */
import type { CauseFact, CauseRemark } from '../types/index.js';
import type { CauseRule } from './rule.js';
import { scoreFrom } from './rule.js';
import type { OutputAt } from './unitFacts.js';
import { checkOf, expandedOf, outputsShaped, valueOf } from './unitFacts.js';
import { derivedFact, expected, frequencyFact, measuredFact, present, quantity } from './causeFacts.js';

/** The unit levels are in: the channel's level measurements say it (SI, V) where the column named none. */
const levelUnit = (o: OutputAt): string => o.channel.measurements.maximum?.unit || o.channel.unit;

const failing = (o: OutputAt, id: Parameters<typeof checkOf>[1]): boolean => {
  const k = checkOf(o, id);
  return k !== undefined && k.value !== null && k.statement !== 'pass';
};

export const currentMismatch: CauseRule = (f) => {
  const tri = outputsShaped(f, ['triangle', 'sawtooth']).filter((o) => !o.clipped);
  // A design with unequal currents expects their ratio, not 1 (slopes are I/C, so C cancels).
  const ic = f.design.chargeCurrent?.nominal;
  const id = f.design.dischargeCurrent?.nominal ?? ic;
  const ratioDesign = ic && id ? ic / id : 1;
  const ratios = tri
    .map((o) => ({ o, r: valueOf(o.channel, 'slopeRatio'), U: expandedOf(o.channel, 'slopeRatio') }))
    .filter((x): x is { o: OutputAt; r: number; U: number } => x.r !== null);
  const off = ratios.filter((x) => Math.abs(x.r / ratioDesign - 1) > Math.max(0.02, x.U / ratioDesign));
  if (off.length === 0 || off.length < ratios.length / 2) return null;
  const mean = off.reduce((s, x) => s + x.r, 0) / off.length / ratioDesign;
  const facts: CauseFact[] = off.map((x) => measuredFact(x.o, 'slopeRatio', expected(ratioDesign, '', 'design'))).filter(present);
  facts.push(derivedFact('charge current against its share of the discharge current', quantity((mean - 1) * 100, '%'), { averagedOver: off.length }));
  const remarks: CauseRemark[] = [];
  // The rising share of the period is 1/(1 + ratio) (slopes are I/C over the same swing).
  const expectedDuty = 100 / (1 + mean * ratioDesign);
  const pulses = outputsShaped(f, ['pulse', 'square']).filter((o) => valueOf(o.channel, 'dutyCycle') !== null);
  if (pulses.some((o) => Math.abs(valueOf(o.channel, 'dutyCycle')! - 50) > 1)) {
    facts.push(...pulses.map((o) => measuredFact(o, 'dutyCycle', expected(expectedDuty, '%', 'predicted'))).filter(present));
    remarks.push('duty-follows-slopes');
  }
  const h2 = tri.map((o) => ({ o, h: o.channel.harmonics.find((h) => h.n === 2) })).filter((x) => x.h && x.h.dbc > -45);
  if (h2.length) {
    facts.push(...h2.map((x) => derivedFact('2nd harmonic', quantity(x.h!.dbc, 'dBc'), { output: x.o.output, condition: x.o.condition })));
    remarks.push('no-even-harmonics');
  }
  return {
    id: 'current-mismatch',
    title: 'charge/discharge current mismatch (current mirror or source/sink matching)',
    score: scoreFrom(mean - 1, 0.02, 0.06),
    evidence: [],
    confirm: 'measure the voltage across the charge and the discharge current-setting resistors (or the mirror emitter resistors) at one condition; they should agree within 1 %',
    where: 'current mirror transistors and their emitter resistors, the source/sink pair that charges the timing capacitor',
    facts,
    remarks,
  };
};

export const thresholdLevels: CauseRule = (f) => {
  // A flat side is the output saturating, not a threshold: its swing says nothing of the divider.
  const tri = outputsShaped(f, ['triangle']).filter((o) => !o.clipped && o.saturated.length === 0);
  const design = f.design.swing?.nominal;
  // The lowest condition first: there the ramps overshoot the thresholds least (switching delay).
  const lowest = f.frequency.length ? tri.find((o) => o.condition === f.frequency[0].condition) : tri[0];
  if (!lowest) return null;
  const vpp = valueOf(lowest.channel, 'peakToPeak');
  const nominal = checkOf(lowest, 'peakToPeak')?.nominal ?? design ?? null;
  if (vpp === null || nominal === null) return null;
  const dev = vpp / nominal - 1;
  if (!(failing(lowest, 'peakToPeak') || Math.abs(dev) > 0.03) || Math.abs(vpp - nominal) <= expandedOf(lowest.channel, 'peakToPeak')) return null;
  const facts: (CauseFact | null)[] = [measuredFact(lowest, 'peakToPeak', expected(nominal, 'V', 'nominal'))];
  const remarks: CauseRemark[] = ['swing-set-by-thresholds'];
  const up = f.design.upperThreshold;
  const dn = f.design.lowerThreshold;
  if (up && dn) facts.push(measuredFact(lowest, 'maximum', expected(up.nominal, 'V', 'design')), measuredFact(lowest, 'minimum', expected(dn.nominal, 'V', 'design')));
  const freq = f.frequency[0];
  if (freq && Math.abs(freq.error + dev) < Math.abs(dev) / 2) {
    facts.push(frequencyFact(freq));
    remarks.push('frequency-follows-swing');
  }
  return {
    id: 'threshold-levels',
    title: 'comparator threshold divider or logic level (swing or peaks off)',
    score: scoreFrom(dev, 0.03, 0.1),
    evidence: [],
    confirm: 'measure the comparator reference voltages and the pulse output levels that feed the threshold divider; compare the divider resistors with the design',
    where: 'comparator threshold divider; the logic levels that drive it',
    facts: facts.filter(present),
    remarks,
  };
};

export const offsetBias: CauseRule = (f) => {
  const tri = outputsShaped(f, ['triangle']).filter((o) => !o.clipped && o.saturated.length === 0);
  const offs = tri
    .map((o) => ({ o, v: valueOf(o.channel, 'dcOffset'), swing: valueOf(o.channel, 'peakToPeak'), U: expandedOf(o.channel, 'dcOffset'), bad: failing(o, 'dcOffset') }))
    .filter((x) => x.v !== null && x.swing !== null);
  const off = offs.filter((x) => (x.bad || Math.abs(x.v!) > 0.02 * x.swing!) && Math.abs(x.v!) > x.U);
  if (off.length === 0 || off.length < offs.length / 2) return null;
  const worst = off.reduce((a, b) => (Math.abs(b.v!) > Math.abs(a.v!) ? b : a));
  const centre = f.design.upperThreshold && f.design.lowerThreshold ? (f.design.upperThreshold.nominal + f.design.lowerThreshold.nominal) / 2 : 0;
  return {
    id: 'offset-bias',
    title: 'DC offset: bias divider or amplifier offset',
    score: scoreFrom(worst.v! / worst.swing!, 0.02, 0.08),
    evidence: [],
    confirm: 'measure the midpoint of the comparator thresholds (bias divider) and the integrator op-amp output offset with the core stopped',
    where: 'threshold bias divider; integrator or buffer op-amp offset',
    facts: off.map((x) => measuredFact(x.o, 'dcOffset', expected(centre, 'V', 'design'))).filter(present),
  };
};

/**
 * The circuit saturating: a flat top inside the scope's range. The core can run on (frequency and
 * slopes on design) while only the output clips; that, with one side flat, is what sets it apart
 * from a threshold fault, which moves both turns and the frequency together.
 */
export const saturation: CauseRule = (f) => {
  const flat = f.outputs.filter((o) => o.saturated.length > 0);
  if (flat.length === 0) return null;
  const facts: CauseFact[] = [];
  for (const o of flat) {
    for (const t of o.saturated) {
      const part = t.side === 'high' ? 'flat top' : 'flat bottom';
      facts.push(derivedFact(`${part} level`, quantity(t.level, levelUnit(o)), { output: o.output, condition: o.condition }));
      facts.push(derivedFact(`${part}, share of each cycle`, quantity(t.share * 100, '%'), { output: o.output, condition: o.condition }));
    }
  }
  const remarks: CauseRemark[] = [];
  const onDesign = f.frequency.filter((p) => f.frequencyTolerance !== null && Math.abs(p.error) <= f.frequencyTolerance);
  if (f.frequency.length > 0 && onDesign.length === f.frequency.length) {
    facts.push(...f.frequency.map(frequencyFact));
    remarks.push('core-runs-on');
  }
  if (flat.every((o) => o.saturated.length === 1)) remarks.push('one-side-flat');
  const up = f.design.positiveRail;
  const down = f.design.negativeRail;
  if (up && down) {
    facts.push({ kind: 'part', part: 'positive rail', observed: quantity(up.nominal, 'V'), design: { nominal: up.nominal, lower: up.lower, upper: up.upper, unit: 'V' } });
    facts.push({ kind: 'part', part: 'negative rail', observed: quantity(down.nominal, 'V'), design: { nominal: down.nominal, lower: down.lower, upper: down.upper, unit: 'V' } });
    remarks.push('flat-inside-rails');
  }
  return {
    id: 'saturation',
    title: 'output stage or rail saturation (flat tops inside the scope’s range)',
    score: 1,
    evidence: [],
    confirm: 'measure the supply rails at the output buffer under load and the buffer’s input at the same instant; if the input still rises while the output stays flat, the buffer’s output swing (or its supply) is the limit',
    where: 'output buffer op-amp and its supply rails; gain or offset of the output stage; the load on the output jack',
    facts,
    remarks,
  };
};

/** The trace ran off the scope's screen: nothing about the circuit, but the values there are withheld. */
export const scopeClipping: CauseRule = (f) => {
  const clipped = f.outputs.filter((o) => o.clipped);
  if (clipped.length === 0) return null;
  const facts: CauseFact[] = clipped.flatMap((o) =>
    (o.channel.flatTops ?? [])
      .filter((t) => t.cause === 'scope-range')
      .map((t) => derivedFact(t.fullScaleFrom === 'preamble' ? 'full scale the capture states' : 'full scale from the converter’s end code', quantity(t.level, levelUnit(o)), { output: o.output, condition: o.condition })),
  );
  // Clipped by a warning alone, no flat level known: the extremes the trace reached say where.
  for (const o of clipped) {
    if (facts.some((x) => x.output === o.output && x.condition === o.condition)) continue;
    facts.push(...(['maximum', 'minimum'] as const).map((id) => measuredFact(o, id)).filter(present));
  }
  return {
    id: 'scope-range',
    title: 'trace clipped at the scope’s full scale (vertical setting)',
    score: 0.9,
    evidence: [],
    confirm: 'set more volts per division (or move the vertical offset) so the whole swing fits on screen, and capture again',
    where: 'the scope channel’s vertical range and offset',
    facts,
    remarks: ['levels-withheld'],
  };
};
