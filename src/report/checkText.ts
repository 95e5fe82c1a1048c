/**
 * `benchproof check` in the terminal: per unit, per condition and output, a table of check,
 * measured ± U, limits, margin and statement (a word; colour only adds emphasis), then notes and the
 * user's hints, then the circuit view (when the spec has a design section), the ranked likely causes
 * with evidence and the next measurement, and one overall line per unit.
 */
import { INCOMPLETE_WORD, STATEMENT_WORDS, waitingConditions } from '../types/index.js';
import type { CheckVerdict, Diagnosis, Statement, UnitVerdict } from '../types/index.js';
import type { TextStyle } from './style.js';
import { formatLimits, formatMargin, formatMeasured, formatQuantity, measurementLabel, valueExponent } from './reportNumbers.js';
import { renderCircuitView } from './circuitText.js';
import { causeEvidence } from './causeWords.js';
import { totalsLine } from './checkBrief.js';
import { fitLines, glued, wrap } from './wrapText.js';
import { fitTable } from './fitTable.js';
import { INCOMPLETE_MARK, STATEMENT_MARKS } from './statementMarks.js';

/** One checked unit: its verdict and the likely causes. This is what `check` prints, stores and reports. */
export interface UnitCheck {
  readonly verdict: UnitVerdict;
  readonly diagnosis: Diagnosis;
}

const RULE_WORDS: Readonly<Record<UnitVerdict['decisionRule'], string>> = {
  guarded: 'guarded acceptance, guard band = U (k = 2), ILAC-G8:09/2019 §4.2.3',
  'guarded-binary': 'binary guarded acceptance, guard band = U (k = 2), ILAC-G8:09/2019 §4.2.2',
  simple: 'simple acceptance, no guard band, ILAC-G8:09/2019 §4.2.1',
};

export function renderCheckText(units: readonly UnitCheck[], style: TextStyle, width = Number.POSITIVE_INFINITY): string {
  const text = units.map((u) => renderUnit(u, style, width)).join('\n');
  return units.length > 1 ? `${text}\n${totalsLine(units)}\n` : text;
}

function renderUnit({ verdict, diagnosis }: UnitCheck, style: TextStyle, width: number): string {
  const lines = [style.bold(`${verdict.unit} · ${verdict.spec.name} rev ${verdict.spec.revision}`), style.dim(RULE_WORDS[verdict.decisionRule]), ''];
  for (const cond of verdict.conditions) {
    if (cond.waiting) {
      lines.push(`${style.bold(cond.condition)}  ${style.dim('waiting for a capture: not checked yet')}`, '');
      continue;
    }
    const outputs = [...new Set(cond.checks.map((c) => c.output))];
    for (const output of outputs) {
      if (cond.checks.filter((c) => c.output === output).every((c) => c.waiting)) {
        lines.push(`${style.bold(`${cond.condition} · ${output}`)}  ${style.dim('waiting for a capture: not checked yet')}`, '');
        continue;
      }
      const capture = verdict.captures.find((c) => c.condition === cond.condition && c.outputs.some((o) => o.output === output));
      const channel = capture?.outputs.find((o) => o.output === output)?.channel;
      const source = capture ? `${capture.path}, channel "${channel}"` : 'no capture';
      lines.push(`${style.bold(`${cond.condition} · ${output}`)}  ${style.dim(source)}`);
      lines.push(...table(cond.checks.filter((c) => c.output === output), style, width), '');
    }
  }
  lines.push(...renderCircuitView(diagnosis.circuit, style, width));
  const waiting = waitingConditions(verdict);
  const causes = renderCauses(diagnosis, verdict.statement, style, width);
  // Causes named from part of the conditions may change once the rest lands.
  if (waiting.length && causes.length) causes[0] = `${causes[0]} ${style.dim(`(preliminary: waiting for ${waiting.join(', ')})`)}`;
  lines.push(...causes);
  lines.push(overallLine(verdict, style), '');
  return fitLines(lines, width).join('\n');
}

function table(checks: readonly CheckVerdict[], style: TextStyle, width: number): string[] {
  const rows = checks.map((c) => {
    const e = valueExponent(c.value ?? c.bound?.value, c.expandedUncertainty, c.unit);
    return [
      measurementLabel(c.measurement),
      c.value === null ? (c.bound ? `${c.bound.kind === 'upper' ? '<' : '>'} ${formatQuantity(c.bound.value, c.unit, 3)}` : '—') : formatMeasured(c.value, c.expandedUncertainty, c.unit),
      formatLimits(c.lower, c.upper, c.unit, e),
      formatMargin(c.margin, c.unit, e),
    ];
  });
  const trailers = checks.map((c) => `${STATEMENT_MARKS[c.statement]} ${style.statement(c.statement)}`);
  const out = fitTable({ head: ['check', 'measured ± U (k = 2)', 'limits', 'margin'], rows, trailers, trailerHead: 'statement' }, width, '  ', style.dim);
  // One line per distinct note (a clipped trace withholds several checks for the same reason).
  const notes = new Map<string, string[]>();
  for (const c of checks) if (c.note) notes.set(c.note, [...(notes.get(c.note) ?? []), measurementLabel(c.measurement)]);
  for (const [note, ids] of notes) out.push(...wrap(`note (${ids.join(', ')}): ${note}`, width, '  ', '    ').map(style.dim));
  for (const c of checks) if (c.hint && c.statement !== 'pass') out.push(...wrap(`hint (${measurementLabel(c.measurement)}): ${c.hint}`, width, '  ', '    '));
  return out;
}

function renderCauses(diagnosis: Diagnosis, statement: Statement, style: TextStyle, width: number): string[] {
  if (diagnosis.causes.length === 0) {
    return statement === 'pass' ? [] : [style.dim('Likely causes: no known pattern matched; see the failed checks and their hints.'), ''];
  }
  const out = [style.bold('Likely causes')];
  diagnosis.causes.forEach((c, i) => {
    out.push(`  ${i + 1}. ${c.title}  ${style.dim(`(weight ${c.score.toFixed(2)})`)}`);
    for (const e of causeEvidence(c, glued)) out.push(...wrap(e, width, '     · ', '       '));
    if (c.indistinguishableFrom?.length) out.push(...wrap(`the captures cannot tell it from: ${c.indistinguishableFrom.map((id) => diagnosis.causes.find((x) => x.id === id)?.title ?? id).join('; ')}`, width, '     ', '       '));
    out.push(...wrap(c.confirm, width, '     confirm: ', '              '));
    if (c.where) out.push(...wrap(c.where, width, '     look at: ', '              '));
  });
  out.push('');
  return out;
}

function overallLine(verdict: UnitVerdict, style: TextStyle): string {
  const checks = verdict.conditions.flatMap((c) => c.checks).filter((k) => !k.waiting);
  const count = (s: Statement): number => checks.filter((c) => c.statement === s).length;
  const parts = [`${count('fail')} failed`, `${count('conditional-fail')} cond. failed`, `${count('not-measured')} not measured`, `${count('conditional-pass')} cond. passed`];
  const waiting = waitingConditions(verdict);
  if (waiting.length) {
    const soFar = verdict.soFar ?? verdict.statement;
    return `${style.bold(verdict.unit)}: ${INCOMPLETE_MARK} ${style.bold(INCOMPLETE_WORD)}, waiting for ${waiting.join(', ')}  ${style.dim(`(so far ${STATEMENT_WORDS[soFar]}: ${parts.join(', ')} of ${checks.length} checks captured)`)}`;
  }
  return `${style.bold(verdict.unit)}: ${STATEMENT_MARKS[verdict.statement]} ${style.statement(verdict.statement)}  ${style.dim(`(${parts.join(', ')} of ${checks.length} checks)`)}`;
}

/**
 * One line per unit, for checking a whole batch at once: the unit's statement, the count of checks
 * that did not pass, and the first likely cause. The full tables stay one `check` away.
 */
export function renderCheckSummary(units: readonly UnitCheck[], style: TextStyle, columns = Number.POSITIVE_INFINITY): string {
  const width = Math.max(4, ...units.map((u) => u.verdict.unit.length));
  const lines = units.map(({ verdict, diagnosis }) => {
    const waiting = waitingConditions(verdict);
    const checks = verdict.conditions.flatMap((c) => c.checks).filter((k) => !k.waiting);
    // A conditional pass is a pass (ILAC-G8:09/2019 §4.2.3), counted apart, never as "not passed".
    const off = checks.filter((c) => c.statement !== 'pass' && c.statement !== 'conditional-pass').length;
    const conditional = checks.filter((c) => c.statement === 'conditional-pass').length;
    const word = `${waiting.length ? INCOMPLETE_MARK : STATEMENT_MARKS[verdict.statement]} ${waiting.length ? INCOMPLETE_WORD : STATEMENT_WORDS[verdict.statement]}`;
    const shown = waiting.length ? `${INCOMPLETE_MARK} ${style.bold(INCOMPLETE_WORD)}` : `${STATEMENT_MARKS[verdict.statement]} ${style.statement(verdict.statement)}`;
    const cond = conditional ? `, ${conditional} passed conditionally` : '';
    const first = diagnosis.causes[0];
    const cause = first ? `likely cause${waiting.length ? ' (preliminary)' : ''}: ${first.title}` : '';
    const counted = waiting.length
      ? `waiting for ${waiting.join(', ')}; so far ${STATEMENT_WORDS[verdict.soFar ?? verdict.statement]}, ${off} of ${checks.length} checks not passed${cond}`
      : `${off} of ${checks.length} checks not passed${cond}`;
    return `${verdict.unit.padEnd(width)}  ${shown}${' '.repeat(Math.max(1, 17 - word.length))}${style.dim(counted)}${cause ? `  ${cause}` : ''}`;
  });
  if (units.length > 1) lines.push(totalsLine(units));
  return `${lines.flatMap((l) => wrap(l, columns, '', '    ')).join('\n')}\n`;
}
