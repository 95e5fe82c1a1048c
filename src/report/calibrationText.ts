/**
 * `benchproof calibrate` in the terminal: the law and limits, one row per step (frequency ± U,
 * expected, error in cents ± U, deviation from the fitted law, symmetry, amplitude, statement), the
 * overall figures, the trim guidance, notes, and one closing line saying whether the run meets its limits.
 */
import type { CalibrationIteration } from '../types/index.js';
import { iterationNotes, trimText } from './trimText.js';
import { STEP_HEAD, figurePairs, lawText, limitsText, outcomeText, stepCells } from './calibrationFormat.js';
import type { TextStyle } from './style.js';

/** Where the iteration went in the records (absent with --no-store). */
export interface IterationPlace {
  readonly calibrationId: number;
  readonly number: number;
  readonly startedRun: boolean;
}

export function renderCalibrationText(it: CalibrationIteration, style: TextStyle, place?: IterationPlace): string {
  const which = place ? ` · iteration ${place.number} of calibration run #${place.calibrationId}` : '';
  const lines = [
    style.bold(`${it.unit} · calibration of ${it.output} · ${it.spec.name} rev ${it.spec.revision}${which}`),
    style.dim(`law: ${lawText(it.law)}; ${limitsText(it.limits)}${it.label ? `; iteration "${it.label}"` : ''}`),
    '',
    ...stepTable(it, style),
    '',
  ];
  const pairs = figurePairs(it);
  const width = Math.max(0, ...pairs.map(([k]) => k.length));
  for (const [k, v] of pairs) lines.push(`  ${k.padEnd(width)}  ${v}`);
  if (it.tracking.linearityStatement) lines.push(`  ${''.padEnd(width)}  linearity: ${style.statement(it.tracking.linearityStatement)}`);
  lines.push('', style.bold('Trim guidance'));
  if (it.guidance.length === 0) lines.push('  none');
  for (const g of it.guidance) lines.push(`  ${g.action === 'leave' ? style.dim(trimText(g)) : trimText(g)}`);
  for (const n of iterationNotes(it)) lines.push(style.dim(`  note: ${n}`));
  lines.push('', `${style.bold(it.unit)}: ${style.statement(it.statement)}  ${it.meetsLimits ? outcomeText(it) : `${outcomeText(it)}; trim, re-capture every step and run calibrate again`}`, '');
  return lines.join('\n');
}

function stepTable(it: CalibrationIteration, style: TextStyle): string[] {
  const rows = it.steps.map((s) => stepCells(s, it.law));
  const widths = STEP_HEAD.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const pad = (cells: readonly string[]): string => cells.map((s, i) => s.padEnd(widths[i])).join('  ');
  const out = [`  ${style.dim(`${pad(STEP_HEAD)}  statement`)}`];
  it.steps.forEach((s, i) => out.push(`  ${pad(rows[i])}  ${s.statement ? style.statement(s.statement) : style.dim('no limit')}`));
  for (const s of it.steps) if (s.note) out.push(`  ${style.dim(`note (step ${s.label}): ${s.note}`)}`);
  return out;
}
