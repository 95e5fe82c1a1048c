/**
 * Trim guidance in words, from the data src/diagnose gives (action, amount, the figures it reads):
 * one sentence per adjustment, the action and amount first, through the one formatter (house minus
 * sign, SI prefixes). Advice stored before it carried its basis keeps its own text.
 */
import type { CalibrationIteration, TrimAdvice, TrimBasis, TrimRemark } from '../types/index.js';
import { MINUS, formatSignificant } from '../types/index.js';

const NAMES: Readonly<Record<TrimAdvice['adjustment'], string>> = { scale: 'scale', offset: 'offset', 'high-frequency': 'high-frequency compensation' };

/** '+1.3' / '−15.6': signed, with the house minus sign; zero unsigned. */
function signed(x: number, digits: number): string {
  const t = Math.abs(x).toFixed(digits);
  return Number(t) === 0 ? t : `${x < 0 ? MINUS : '+'}${t}`;
}

const figure = (b: TrimBasis, name: TrimBasis['figures'][number]['name']): TrimBasis['figures'][number] | undefined => b.figures.find((f) => f.name === name);

function where(b: TrimBasis): string {
  if (b.at === 'low-end') return 'at the low end';
  return b.at ? `at ${b.at.control}${b.at.controlUnit ? ` ${b.at.controlUnit}` : ''}` : '';
}

/** Why a scale trim is advised or left: the fitted scale and its error, or the span against the wanted one. */
function scaleWhy(b: TrimBasis, leaving: boolean): string {
  const fitted = figure(b, 'fitted-scale');
  const error = figure(b, 'scale-error');
  const span = figure(b, 'span');
  const wanted = figure(b, 'expected-span');
  const below = b.below ? `, read from the steps below ${b.below}` : '';
  if (span) return leaving ? `span ${span.value.toFixed(3)} octaves` : `the span is ${span.value.toFixed(3)} octaves; ${wanted ? `${wanted.value.toFixed(3)} wanted` : ''}`;
  const err = error ? (error.unit === '%' ? `${signed(error.value, 2)} %` : `${signed(error.value, 1)} ${error.unit}`) : '';
  if (leaving) return `${err}${below}`;
  const scale = fitted ? `the fitted scale is ${fitted.unit.startsWith('Hz') ? formatSignificant(fitted.value, '', 5) : fitted.value.toFixed(4)} ${fitted.unit}` : '';
  return [scale, error && error.unit !== '%' ? err : ''].filter((s) => s).join(', ') + below;
}

/** The advice in one sentence, e.g. 'scale: raise by 1.4 % (the fitted scale is 0.9862 octave/V, −16.6 cents per octave)'. */
export function trimText(a: TrimAdvice): string {
  const b = a.basis;
  if (!b) return a.text;
  const leaving = a.action === 'leave';
  if (a.adjustment === 'scale') {
    const amount = a.amount ?? 0;
    return leaving ? `scale: leave as is (${scaleWhy(b, true)})` : `scale: ${a.action} by ${amount.toFixed(amount < 0.1 ? 2 : 1)} % (${scaleWhy(b, false)})`;
  }
  if (a.adjustment === 'offset') {
    const off = figure(b, 'offset');
    if (leaving) return `offset: leave as is (${off ? `${signed(off.value, off.unit === 'Hz' ? 2 : 1)} ${off.unit} ${where(b)}` : where(b)})`;
    const change = (a.action === 'raise' ? 1 : -1) * (a.amount ?? 0);
    // A change of c cents moves the frequency by 2^(c/1200) − 1 (equal temperament: 1200 cents per octave).
    const inFrequency = a.unit === 'cents' ? `, ${signed(100 * (2 ** (change / 1200) - 1), 2)} % in frequency` : '';
    return `offset: ${a.action} by ${(a.amount ?? 0).toFixed(1)} ${a.unit} (${where(b)}${b.afterScale ? ', after the scale trim' : ''}${inFrequency})`;
  }
  const dev = figure(b, 'top-step-deviation');
  if (leaving) return `${NAMES['high-frequency']}: leave as is (${dev ? `the top step lies ${signed(dev.value, 1)} cents from the line through the others` : 'fewer than four steps: cannot be told from scale'})`;
  const amount = (a.amount ?? 0).toFixed(1);
  const up = a.action === 'raise';
  return `${NAMES['high-frequency']}: ${a.action} until the ${b.topStep ?? 'top'} step moves ${up ? 'up' : 'down'} by ${amount} cents (it lies ${amount} cents ${up ? 'below' : 'above'} the line through the lower steps); set it last`;
}

export function trimRemarkText(r: TrimRemark): string {
  switch (r.code) {
    case 'too-few-steps':
      return 'no guidance: fewer than two steps were measured';
    case 'range-ends-missing':
      return 'no guidance: the ends of the range were not both measured';
    case 'pivot-at-zero':
      return 'the scale trim is taken to pivot about 0 V control (common practice); re-capture every step after each trim';
    case 'amplitude-drift':
      return `amplitude changes ${signed(100 * (r.last / r.first - 1), 1)} % from the first to the last step (${formatSignificant(r.first, r.unit, 3)} → ${formatSignificant(r.last, r.unit, 3)} peak-to-peak): a switching delay lets the ramps overshoot the thresholds at high frequency`;
    case 'symmetry-drift':
      return `symmetry moves across the range (${r.first.toFixed(1)} % → ${r.last.toFixed(1)} %, spread ${r.spread.toFixed(1)} points): charge and discharge currents do not track the control equally`;
  }
}

/** The iteration's notes: its own, then its remarks in words (once, whether or not already written in). */
export function iterationNotes(it: CalibrationIteration): string[] {
  const words = (it.remarks ?? []).map(trimRemarkText);
  return [...it.notes.filter((n) => !words.includes(n)), ...words];
}

/** The iteration with `text` and `notes` written from the data, for JSON readers and the store. */
export function describeIteration(it: CalibrationIteration): CalibrationIteration {
  return { ...it, guidance: it.guidance.map((g) => ({ ...g, text: trimText(g) })), notes: iterationNotes(it) };
}
