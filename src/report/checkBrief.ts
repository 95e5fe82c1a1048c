/**
 * `benchproof check` sized for a bench terminal: per unit one status line, then only the checks that
 * did not pass (with value ± U, limits and margin) and the top likely causes with the measurement
 * that would confirm each; several units end with a totals line. Every line is wrapped to `width`
 * columns. `--detail` prints the full tables and the circuit view instead (checkText.ts).
 */
import { INCOMPLETE_WORD, STATEMENT_WORDS, waitingConditions } from '../types/index.js';
import type { CheckVerdict, Statement } from '../types/index.js';
import type { UnitCheck } from './checkText.js';
import type { TextStyle } from './style.js';
import { INCOMPLETE_MARK, STATEMENT_MARKS } from './statementMarks.js';
import { formatLimits, formatMargin, formatMeasured, formatQuantity, measurementLabel, valueExponent } from './reportNumbers.js';
import { glued, wrap } from './wrapText.js';
import { factText } from './causeWords.js';

/** Causes shown per unit; the rest are one --detail away. */
const TOP_CAUSES = 3;
/** Checks not passed shown per unit before "… and N more". */
const MAX_CHECKS = 12;

const plural = (n: number, word: string): string => `${n} ${word}${n === 1 ? '' : 's'}`;
const mark = (s: Statement, style: TextStyle): string => `${STATEMENT_MARKS[s]} ${style.statement(s)}`;

export function renderCheckBrief(units: readonly UnitCheck[], style: TextStyle, width = 80): string {
  const lines = units.flatMap((u) => renderUnit(u, style, width));
  if (units.length > 1) lines.push(...wrap(totalsLine(units), width));
  lines.push(...wrap(style.dim('± is U (k = 2). --detail shows every check, the notes and the circuit view.'), width));
  return `${lines.join('\n')}\n`;
}

function renderUnit({ verdict, diagnosis }: UnitCheck, style: TextStyle, width: number): string[] {
  const checks = verdict.conditions.flatMap((c) => c.checks).filter((k) => !k.waiting);
  const off = checks.filter((k) => k.statement !== 'pass' && k.statement !== 'conditional-pass');
  const conditional = checks.filter((k) => k.statement === 'conditional-pass');
  const waiting = waitingConditions(verdict);
  const head = waiting.length
    ? `${INCOMPLETE_MARK} ${style.bold(INCOMPLETE_WORD)}`
    : mark(verdict.statement, style);
  const counts = [
    off.length ? `${off.length} of ${plural(checks.length, 'check')} did not pass` : `${plural(checks.length, 'check')} passed`,
    conditional.length ? `${conditional.length} of them only conditionally` : '',
    waiting.length ? `waiting for ${waiting.join(', ')}; so far ${STATEMENT_WORDS[verdict.soFar ?? verdict.statement]}` : '',
  ].filter((s) => s !== '');
  const lines = wrap(`${style.bold(verdict.unit)} · ${verdict.spec.name} rev ${verdict.spec.revision} · ${counts.join(', ')}`, width, `${head}  `, '    ');
  const shown = [...off, ...conditional];
  for (const k of shown.slice(0, MAX_CHECKS)) lines.push(...wrap(checkLine(k), width, `  ${STATEMENT_MARKS[k.statement]} `, '      '));
  if (shown.length > MAX_CHECKS) lines.push(`  … and ${shown.length - MAX_CHECKS} more`);
  const causes = diagnosis.causes.slice(0, TOP_CAUSES);
  if (causes.length) {
    lines.push(`  ${style.bold(waiting.length ? 'Likely causes (preliminary)' : 'Likely causes')}`);
    causes.forEach((c, i) => {
      lines.push(...wrap(`${c.title} ${style.dim(`(weight ${c.score.toFixed(2)})`)}`, width, `  ${i + 1}. `, '     '));
      // The cause's lead finding (a part against its design, or the first measurement that shows it).
      const lead = c.facts?.[0];
      if (lead) lines.push(...wrap(factText(lead, c, glued, { brief: true }), width, '     seen: ', '     '));
      lines.push(...wrap(c.confirm, width, '     confirm: ', '     '));
    });
    if (diagnosis.causes.length > TOP_CAUSES) lines.push(`  … and ${diagnosis.causes.length - TOP_CAUSES} less likely`);
  } else if (off.length) {
    lines.push(...wrap('no known pattern matched; see the checks and their notes with --detail', width, '  Likely causes: ', '    '));
  }
  lines.push('');
  return lines;
}

/** 'COND. PASS mid · triangle · frequency 261.8 Hz ± 0.012 Hz, limits …, margin +0.004 Hz; note'. */
function checkLine(k: CheckVerdict): string {
  const e = valueExponent(k.value ?? k.bound?.value, k.expandedUncertainty, k.unit);
  const shown =
    k.value !== null
      ? glued(formatMeasured(k.value, k.expandedUncertainty, k.unit))
      : k.bound
        ? glued(`${k.bound.kind === 'upper' ? '<' : '>'} ${formatQuantity(k.bound.value, k.unit, 3)}`)
        : 'no value';
  const limits = formatLimits(k.lower, k.upper, k.unit, e).split(' … ').map(glued).join(' … ');
  const parts = [`${STATEMENT_WORDS[k.statement]} ${k.condition} · ${k.output} · ${measurementLabel(k.measurement)} ${shown}`, `limits ${limits}`];
  if (k.margin !== null) parts.push(`margin ${glued(formatMargin(k.margin, k.unit, e))}`);
  // The notes (why a value was withheld or rough) stay in --detail; the spec's hint is short and says
  // where to look. Only a statement the margin does not explain (a FAIL inside its limits, a value
  // withheld) carries its note here, or the line would contradict itself.
  const unexplained = k.note !== undefined && k.note !== '' && (k.value === null || (k.margin !== null && k.margin >= 0 && k.statement !== 'pass' && k.statement !== 'conditional-pass'));
  return `${parts.join(', ')}${unexplained ? `: ${k.note}` : ''}${k.hint ? `; ${k.hint}` : ''}`;
}

/** '6 units: 3 ✓ PASS, 1 (✓) COND. PASS, 2 ✗ FAIL'. */
export function totalsLine(units: readonly UnitCheck[]): string {
  const order: Statement[] = ['pass', 'conditional-pass', 'conditional-fail', 'fail', 'not-measured'];
  const incomplete = units.filter((u) => waitingConditions(u.verdict).length > 0).length;
  const counts = order
    .map((s) => [s, units.filter((u) => waitingConditions(u.verdict).length === 0 && u.verdict.statement === s).length] as const)
    .filter(([, n]) => n > 0)
    .map(([s, n]) => `${n} ${STATEMENT_MARKS[s]} ${STATEMENT_WORDS[s]}`);
  if (incomplete) counts.push(`${incomplete} ${INCOMPLETE_MARK} ${INCOMPLETE_WORD}`);
  return `${units.length} units: ${counts.join(', ')}`;
}
