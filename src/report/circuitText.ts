/**
 * The "circuit view" block of `benchproof check`: per condition, the core's figures back-computed from
 * the captures (effective currents, capacitance, thresholds, frequency from the design values, logic
 * levels) beside the spec's design values, then the summary (written from the figures). Fitted to the
 * terminal's width (fitTable.ts). Shown only when the spec has
 * a design section. Uncertainties are expanded (k = 2), as everywhere in check output.
 */
import type { CircuitFigure, CircuitView } from '../types/index.js';
import type { TextStyle } from './style.js';
import { circuitSummary } from './causeWords.js';
import { fitTable } from './fitTable.js';
import { glued, wrap } from './wrapText.js';
import { formatInPrefix } from '../types/index.js';
import { formatMeasured, formatQuantity, prefixExponent } from './reportNumbers.js';

function designCell(f: CircuitFigure): string {
  if (f.design === undefined) return '—';
  if (f.designTolerance === undefined || f.designTolerance === 0) return formatQuantity(f.design, f.unit, 4);
  const rel = f.design !== 0 && f.unit !== '%' ? ` (${Number(((f.designTolerance / Math.abs(f.design)) * 100).toPrecision(2))} %)` : '';
  // The tolerance in the design value's prefix, so both read in one unit ("4.7 nF ± 0.24 nF").
  return `${formatQuantity(f.design, f.unit, 4)} ± ${formatInPrefix(f.designTolerance, f.unit, prefixExponent(f.design, f.unit), 2)}${rel}`;
}

function deviationCell(f: CircuitFigure): string {
  const dev = f.deviation === undefined ? '' : `${f.deviation >= 0 ? '+' : '−'}${Math.abs(f.deviation).toFixed(2)} %`;
  const out = f.withinTolerance === false ? 'outside' : '';
  return [dev, out].filter((s) => s).join(' ') || '—';
}

export function renderCircuitView(views: readonly CircuitView[] | undefined, style: TextStyle, width = Number.POSITIVE_INFINITY): string[] {
  if (!views || views.length === 0) return [];
  const out = [style.bold('Circuit view'), ...wrap('back-computed from the captures with the spec’s design values; ± is U (k = 2)', width, '  ', '  ').map(style.dim)];
  for (const v of views) {
    const rows = v.figures.map((f) => [f.label, formatMeasured(f.value, f.uncertainty, f.unit), designCell(f), deviationCell(f), f.note ?? '']);
    out.push(`  ${style.bold(v.condition)}`);
    out.push(...fitTable({ head: ['figure', 'from the captures', 'design', 'deviation', 'note'], rows }, width, '    ', style.dim));
    for (const s of circuitSummary(v, glued)) out.push(...wrap(s, width, '    · ', '      '));
  }
  out.push('');
  return out;
}
