/**
 * A cause's facts and remarks in words, and the circuit view's summary, through the one formatter
 * (src/types/quantityText.ts): every ± labelled U (k = 2) and rounded up (GUM §7.2.6), design values
 * and limits in the prefix of the value they bound, one display name per measurement. `diagnose`
 * writes no sentences; this is where its findings become text, for every report kind and for the
 * `evidence`/`summary` fields kept in the JSON.
 */
import type { Cause, CauseFact, CauseRemark, CircuitFigure, CircuitGap, CircuitView, Diagnosis, ExpectedBasis, FactQuantity } from '../types/index.js';
import { MINUS, formatInPrefix, formatMeasured, formatSignificant, measurementLabel, prefixExponent, quantityParts } from '../types/index.js';

const REMARKS: Readonly<Record<CauseRemark, string>> = {
  'same-ratio-everywhere': 'the frequency is off by the same ratio at every condition, as a wrong timing capacitor or reference current gives (f = I/(2·C·Vpp))',
  'swing-not-the-cause': 'the triangle swing is within its design band, so the thresholds do not explain it',
  'error-grows-with-frequency': 'the frequency error grows with frequency',
  'error-largest-at-low-end': 'the frequency error is largest at the low end and shrinks with frequency, as a fixed leakage or bias current gives',
  'period-longer-by-4td': 'each period is longer by 4·t_d: each ramp runs on for t_d past its threshold and must come back',
  'swing-grows-with-frequency': 'the triangle swing grows with frequency: the ramps run past the thresholds for the delay',
  'duty-follows-slopes': 'the pulse duty is what the slope ratio predicts (rising share 1/(1 + ratio)), or its complement',
  'no-even-harmonics': 'a symmetric triangle has no even harmonics',
  'swing-set-by-thresholds': 'the swing is set by the comparator thresholds',
  'frequency-follows-swing': 'the frequency moved the other way, as f ∝ 1/Vpp predicts',
  'core-runs-on': 'the frequency is within its tolerance at every condition: the core runs on, only the output clips',
  'one-side-flat': 'only one side of the swing is flat; a threshold fault would move both turns and the frequency',
  'flat-inside-rails': 'a flat level well inside the design rails points to the buffer’s output swing or a sagging supply',
  'levels-withheld': 'the trace is clipped at the scope’s full scale; its levels and slopes are withheld',
  'no-flat-clipping': 'the level is low without flat clipping',
  'slope-ratio-cancels-c': 'the two currents are compared through the slope ratio, where C cancels',
  'attribution': 'the share explained is the part of χ² of the captures against the design that this part alone removes',
};

const BASIS: Readonly<Record<ExpectedBasis, string>> = { nominal: 'nominal', design: 'design', predicted: 'predicted' };

/** Units where a relative deviation means nothing (levels in dB, shares already in %). */
const NO_RELATIVE = new Set(['%', 'dB', 'dBc', 'dBFS', 'bits']);

/** '4.982 nF ± 0.011 nF (U, k = 2)'; a relative change in % is signed ('+6.1 %'). */
function quantityText(q: FactQuantity, signed: boolean): string {
  const U = q.expandedUncertainty ?? null;
  // Without an uncertainty, a derived figure is rough: three significant digits.
  const text = U !== null && U > 0 ? formatMeasured(q.value, U, q.unit) : formatSignificant(q.value, q.unit, 3);
  const sign = signed && q.value > 0 && quantityParts(q.value, q.unit, U).value !== '0' ? '+' : '';
  return `${sign}${text}${U !== null && U > 0 ? ' (U, k = 2)' : ''}`;
}

/** A relative deviation '(−5.72 %)' of `value` from `reference`. */
function deviation(value: number, reference: number, unit: string): string {
  if (reference === 0 || NO_RELATIVE.has(unit)) return '';
  const d = (value / reference - 1) * 100;
  return ` (${d < 0 ? MINUS : '+'}${Math.abs(d).toFixed(Math.abs(d) < 10 ? 2 : 1)} %)`;
}

function placeOf(f: CauseFact): string {
  const on = [f.output ? `on ${f.output}` : '', f.condition ? `at ${f.condition}` : ''].filter((s) => s).join(' ');
  const mean = f.averagedOver && f.averagedOver > 1 ? ` (mean over ${f.averagedOver} conditions)` : '';
  return `${on ? ` ${on}` : ''}${mean}`;
}

/** The fact in one line, e.g. 'frequency on triangle at mid: 246.63 Hz ± 0.022 Hz (U, k = 2) against 261.63 Hz nominal (−5.73 %)'. */
export function factText(f: CauseFact, cause?: Cause, keep: (quantity: string) => string = (q) => q, { brief = false }: { readonly brief?: boolean } = {}): string {
  const subject = f.measurement ? measurementLabel(f.measurement) : f.part;
  const U = f.observed.expandedUncertainty ?? null;
  const e = quantityParts(f.observed.value, f.observed.unit, U).exponent;
  const signed = f.observed.unit === '%' && f.kind !== 'measured';
  let text = `${subject}${placeOf(f)}: ${keep(quantityText(f.observed, signed))}`;
  if (f.design) {
    const de = f.design.unit === f.observed.unit ? e : prefixExponent(f.design.nominal, f.design.unit);
    const one = (v: number): string => keep(formatInPrefix(v, f.design!.unit, de, 4));
    text += ` against ${one(f.design.nominal)} design (${one(f.design.lower)} … ${one(f.design.upper)})${f.design.unit === f.observed.unit ? deviation(f.observed.value, f.design.nominal, f.observed.unit) : ''}`;
    if (f.observed.value > f.design.upper) text += ', above its tolerance';
    else if (f.observed.value < f.design.lower) text += ', below its tolerance';
  } else if (f.expected) {
    const ee = f.expected.unit === f.observed.unit ? e : prefixExponent(f.expected.value, f.expected.unit);
    // A spec's nominal is written as given (up to six digits); a prediction is rough: four.
    text += ` against ${keep(formatInPrefix(f.expected.value, f.expected.unit, ee, f.expected.basis === 'predicted' ? 4 : 6))} ${BASIS[f.expected.basis]}${f.expected.unit === f.observed.unit ? deviation(f.observed.value, f.expected.value, f.observed.unit) : ''}`;
  }
  if (brief) return text;
  if (f.shareExplained !== undefined) text += `; alone it would explain ${Math.round(f.shareExplained * 100)} % of the deviation`;
  if (f.alternative) text = `the captures cannot tell this from the ${text}`;
  if (f.confirm && f.confirm !== cause?.confirm) text += `; ${f.alternative ? 'to separate them' : 'to confirm'}: ${f.confirm}`;
  return text;
}

export function remarkText(r: CauseRemark): string {
  return REMARKS[r] ?? r;
}

/**
 * The cause's findings in words: its facts, then its remarks; a run stored before facts existed keeps
 * its own text. `keep` marks each quantity's text (the terminal glues it so a line never splits it).
 */
export function causeEvidence(c: Cause, keep?: (quantity: string) => string): string[] {
  if (!c.facts?.length && !c.remarks?.length) return [...c.evidence];
  const lines: string[] = [];
  let pattern: string | undefined;
  for (const f of c.facts ?? []) {
    // Facts a part's cause took over from a pattern rule come after a line naming the pattern.
    if (f.pattern && f.pattern.id !== pattern) lines.push(`seen as the pattern “${f.pattern.title}”:`);
    pattern = f.pattern?.id;
    lines.push(factText(f, c, keep));
  }
  return [...lines, ...(c.remarks ?? []).map(remarkText)];
}

function gapText(g: CircuitGap): string {
  return g.code === 'current-not-carried'
    ? `design.${g.key} holds at "${g.at ?? ''}"; carrying it here needs a nominal frequency at both conditions`
    : `design.${g.key} names no condition (\`at:\`), and the conditions run at different frequencies; add \`at:\` to say where it holds`;
}

/** A figure's value with its U, labelled, kept whole by `keep`. */
const figureText = (f: CircuitFigure, keep: (q: string) => string): string => keep(`${formatMeasured(f.value, f.uncertainty, f.unit)}${f.uncertainty ? ' (U, k = 2)' : ''}`);

/**
 * The circuit view's reading in words, from its figures: the two currents and how they match, the
 * effective capacitance against design, where the triangle turned against the thresholds, the logic
 * high against design and rail, the measured frequency against the design values; then what could
 * not be computed. A run stored before the figures were worded here keeps its own summary.
 */
export function circuitSummary(v: CircuitView, keep: (quantity: string) => string = (q) => q): string[] {
  if (v.summary.length) return [...v.summary];
  const fig = (id: string): CircuitFigure | undefined => v.figures.find((f) => f.id === id);
  const out: string[] = [];
  const [ich, idis, ratio] = [fig('chargeCurrent'), fig('dischargeCurrent'), fig('sinkVsSource')];
  if (ich && idis && ratio) {
    const m = ratio.value / 100;
    const how = Math.abs(m) < 0.01 ? `matched within ${keep(`${Math.max(0.1, Math.abs(m * 100)).toFixed(1)} %`)}` : `the sink runs ${keep(`${Math.abs(m * 100).toFixed(1)} %`)} ${m > 0 ? 'hot' : 'cold'}`;
    out.push(`charging at ${figureText(ich, keep)}, discharging at ${figureText(idis, keep)} (taking C from the design): ${how}`);
  }
  const against = (f: CircuitFigure): string => {
    if (f.design === undefined) return '';
    const e = quantityParts(f.value, f.unit, f.uncertainty).exponent;
    const tol = f.designTolerance ? ` ± ${keep(formatInPrefix(f.designTolerance, f.unit, e, 2))}` : '';
    return ` against ${keep(formatInPrefix(f.design, f.unit, e, 4))}${tol} design${f.deviation !== undefined ? ` (${keep(`${f.deviation < 0 ? MINUS : '+'}${Math.abs(f.deviation).toFixed(1)} %`)})` : ''}${f.withinTolerance === false ? ', outside its tolerance' : ''}`;
  };
  const c = fig('timingCapacitance');
  if (c) out.push(`timing capacitance ${figureText(c, keep)} effective (taking the design currents)${against(c)}`);
  const [top, bottom] = [fig('upperThreshold'), fig('lowerThreshold')];
  if (top && bottom) out.push(`turns at ${figureText(top, keep)} and ${figureText(bottom, keep)}${top.design !== undefined && bottom.design !== undefined ? ` against thresholds ${keep(formatSignificant(top.design, 'V', 4))} and ${keep(formatSignificant(bottom.design, 'V', 4))}` : ''}`);
  const high = fig('logicHigh');
  const headroom = fig('railHeadroom');
  if (high && high.design !== undefined) out.push(`logic high ${figureText(high, keep)}${against(high)}${headroom ? `, ${keep(formatSignificant(headroom.value, 'V', 3))} below the positive rail` : ''}`);
  const f = fig('frequency');
  if (f && f.design !== undefined) out.push(`frequency ${figureText(f, keep)} measured against ${keep(formatSignificant(f.design, 'Hz', 5))} from the design values${f.deviation !== undefined ? ` (${keep(`${f.deviation < 0 ? MINUS : '+'}${Math.abs(f.deviation).toFixed(1)} %`)})` : ''}`);
  return [...out, ...(v.gaps ?? []).map(gapText)];
}

/** The diagnosis with `evidence` and `summary` written from the facts, for JSON readers and the store. */
export function describeDiagnosis(d: Diagnosis): Diagnosis {
  return {
    ...d,
    causes: d.causes.map((c) => ({ ...c, evidence: causeEvidence(c) })),
    ...(d.circuit ? { circuit: d.circuit.map((v) => ({ ...v, summary: circuitSummary(v) })) } : {}),
  };
}
