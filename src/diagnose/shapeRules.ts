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
import { formatQuantity } from '../design/index.js';
import type { CauseRule } from './rule.js';
import { scoreFrom } from './rule.js';
import type { OutputAt } from './unitFacts.js';
import { checkOf, expandedOf, num, outputsShaped, valueOf } from './unitFacts.js';

const failing = (o: OutputAt, id: Parameters<typeof checkOf>[1]): boolean => {
  const k = checkOf(o, id);
  return k !== undefined && k.value !== null && k.statement !== 'pass';
};

export const currentMismatch: CauseRule = (f) => {
  const tri = outputsShaped(f, ['triangle', 'sawtooth']).filter((o) => !o.clipped);
  // A design with unequal currents expects their ratio, not 1 (slopes are I/C, so C cancels).
  const ic = f.design.chargeCurrent?.nominal;
  const id = f.design.dischargeCurrent?.nominal ?? ic;
  const expected = ic && id ? ic / id : 1;
  const ratios = tri
    .map((o) => ({ c: o.condition, r: valueOf(o.channel, 'slopeRatio'), U: expandedOf(o.channel, 'slopeRatio') }))
    .filter((x): x is { c: string; r: number; U: number } => x.r !== null);
  const off = ratios.filter((x) => Math.abs(x.r / expected - 1) > Math.max(0.02, x.U / expected));
  if (off.length === 0 || off.length < ratios.length / 2) return null;
  const mean = off.reduce((s, x) => s + x.r, 0) / off.length / expected;
  const evidence = [`slope ratio rise/fall ${off.map((x) => `${num(x.r, 4)} at ${x.c}`).join(', ')} (the design's currents give ${num(expected, 4)}): charge current ≈ ${num((mean - 1) * 100, 2)} % ${mean > 1 ? 'above' : 'below'} its share against the discharge current`];
  const expectedDuty = 100 / (1 + mean * expected);
  const duties = outputsShaped(f, ['pulse', 'square']).map((o) => ({ c: o.condition, d: valueOf(o.channel, 'dutyCycle') })).filter((x) => x.d !== null);
  if (duties.some((x) => Math.abs(x.d! - 50) > 1)) evidence.push(`pulse duty ${duties.map((x) => `${num(x.d!, 3)} %`).join(', ')}, as the slopes predict (${num(expectedDuty, 3)} % or its complement)`);
  const h2 = tri.map((o) => ({ c: o.condition, h: o.channel.harmonics.find((h) => h.n === 2) })).filter((x) => x.h && x.h.dbc > -45);
  if (h2.length) evidence.push(`2nd harmonic of the triangle at ${h2.map((x) => `${num(x.h!.dbc, 3)} dBc (${x.c})`).join(', ')}; a symmetric triangle has no even harmonics`);
  return {
    id: 'current-mismatch',
    title: 'charge/discharge current mismatch (current mirror or source/sink matching)',
    score: scoreFrom(mean - 1, 0.02, 0.06),
    evidence,
    confirm: 'measure the voltage across the charge and the discharge current-setting resistors (or the mirror emitter resistors) at one condition; they should agree within 1 %',
    where: 'current mirror transistors and their emitter resistors, the source/sink pair that charges the timing capacitor',
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
  const evidence = [`triangle swing ${formatQuantity(vpp, 'V', 4)} at ${lowest.condition} against ${formatQuantity(nominal, 'V', 4)} (${num(dev * 100, 3)} %); the swing is set by the comparator thresholds`];
  const hi = valueOf(lowest.channel, 'maximum');
  const lo = valueOf(lowest.channel, 'minimum');
  const up = f.design.upperThreshold;
  const dn = f.design.lowerThreshold;
  if (hi !== null && lo !== null && up && dn) evidence.push(`peaks ${formatQuantity(hi, 'V', 4)} / ${formatQuantity(lo, 'V', 4)} against thresholds ${formatQuantity(up.nominal, 'V', 3)} / ${formatQuantity(dn.nominal, 'V', 3)}`);
  const freq = f.frequency[0];
  if (freq && Math.abs(freq.error + dev) < Math.abs(dev) / 2) evidence.push(`frequency ${num(freq.error * 100, 3)} % at ${freq.condition}, as f ∝ 1/Vpp predicts`);
  return {
    id: 'threshold-levels',
    title: 'comparator threshold divider or logic level (swing or peaks off)',
    score: scoreFrom(dev, 0.03, 0.1),
    evidence,
    confirm: 'measure the comparator reference voltages and the pulse output levels that feed the threshold divider; compare the divider resistors with the design',
    where: 'comparator threshold divider; the logic levels that drive it',
  };
};

export const offsetBias: CauseRule = (f) => {
  const tri = outputsShaped(f, ['triangle']).filter((o) => !o.clipped && o.saturated.length === 0);
  const offs = tri
    .map((o) => ({ c: o.condition, v: valueOf(o.channel, 'dcOffset'), swing: valueOf(o.channel, 'peakToPeak'), U: expandedOf(o.channel, 'dcOffset'), bad: failing(o, 'dcOffset') }))
    .filter((x) => x.v !== null && x.swing !== null);
  const off = offs.filter((x) => (x.bad || Math.abs(x.v!) > 0.02 * x.swing!) && Math.abs(x.v!) > x.U);
  if (off.length === 0 || off.length < offs.length / 2) return null;
  const worst = off.reduce((a, b) => (Math.abs(b.v!) > Math.abs(a.v!) ? b : a));
  return {
    id: 'offset-bias',
    title: 'DC offset: bias divider or amplifier offset',
    score: scoreFrom(worst.v! / worst.swing!, 0.02, 0.08),
    evidence: [`triangle centred at ${off.map((x) => `${formatQuantity(x.v!, 'V', 3)} (${x.c})`).join(', ')} instead of the design centre`],
    confirm: 'measure the midpoint of the comparator thresholds (bias divider) and the integrator op-amp output offset with the core stopped',
    where: 'threshold bias divider; integrator or buffer op-amp offset',
  };
};

const pctOf = (x: number): string => `${num(100 * x, 2)} %`;

/**
 * The circuit saturating: a flat top inside the scope's range. The core can run on (frequency and
 * slopes on design) while only the output clips; that, with one side flat, is what sets it apart
 * from a threshold fault, which moves both turns and the frequency together.
 */
export const saturation: CauseRule = (f) => {
  const flat = f.outputs.filter((o) => o.saturated.length > 0);
  if (flat.length === 0) return null;
  const outputs = [...new Set(flat.map((o) => o.output))];
  const evidence = outputs.map((name) => {
    const at = flat.filter((o) => o.output === name);
    const sides = at[0].saturated.map((t) => `${t.side === 'high' ? 'top' : 'bottom'} at ${formatQuantity(t.level, 'V', 4)}`).join(' and its ');
    const shares = at.map((o) => `${pctOf(o.saturated.reduce((s, t) => s + t.share, 0))} at ${o.condition}`).join(', ');
    return `${name} sits flat on its ${sides}, inside the scope's range, for ${shares} of each cycle`;
  });
  const onDesign = f.frequency.filter((p) => f.frequencyTolerance !== null && Math.abs(p.error) <= f.frequencyTolerance);
  if (f.frequency.length > 0 && onDesign.length === f.frequency.length) {
    evidence.push(`the frequency is within its tolerance at every condition (${f.frequency.map((p) => `${num(p.error * 100, 2)} %`).join(', ')}): the core runs on, only the output clips`);
  }
  const one = flat.every((o) => o.saturated.length === 1);
  if (one) evidence.push('only one side of the swing is flat; a threshold fault would move both turns and the frequency');
  const up = f.design.positiveRail;
  const down = f.design.negativeRail;
  if (up && down) evidence.push(`the design rails are ${formatQuantity(up.nominal, 'V', 3)} / ${formatQuantity(down.nominal, 'V', 3)}: a flat level well inside them points to the buffer's output swing or a sagging supply`);
  return {
    id: 'saturation',
    title: 'output stage or rail saturation (flat tops inside the scope’s range)',
    score: 1,
    evidence,
    confirm: 'measure the supply rails at the output buffer under load and the buffer’s input at the same instant; if the input still rises while the output stays flat, the buffer’s output swing (or its supply) is the limit',
    where: 'output buffer op-amp and its supply rails; gain or offset of the output stage; the load on the output jack',
  };
};

/** The trace ran off the scope's screen: nothing about the circuit, but the values there are withheld. */
export const scopeClipping: CauseRule = (f) => {
  const clipped = f.outputs.filter((o) => o.clipped);
  if (clipped.length === 0) return null;
  const outputs = [...new Set(clipped.map((o) => o.output))];
  const evidence = outputs.map((name) => {
    const at = clipped.filter((o) => o.output === name);
    const flats = at[0].channel.flatTops?.filter((t) => t.cause === 'scope-range') ?? [];
    const where = flats.length ? ` at ${flats.map((t) => formatQuantity(t.level, 'V', 4)).join(' and ')} (${flats[0].fullScaleFrom === 'preamble' ? 'the full scale the capture states' : 'the converter’s end code'})` : '';
    return `${name} is clipped at the scope’s full scale${where} at ${at.map((o) => o.condition).join(', ')}; its levels and slopes are withheld`;
  });
  return {
    id: 'scope-range',
    title: 'trace clipped at the scope’s full scale (vertical setting)',
    score: 0.9,
    evidence,
    confirm: 'set more volts per division (or move the vertical offset) so the whole swing fits on screen, and capture again',
    where: 'the scope channel’s vertical range and offset',
  };
};
