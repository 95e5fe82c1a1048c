/**
 * A comparison of two test attempts of a unit in words: plain text for the terminal, Markdown, HTML
 * and JSON, all from the same AttemptComparison facts. Each shows both attempts (statement, notes,
 * causes), then "what changed" (statements that moved, values that moved beyond their combined
 * uncertainty, causes gone and new), then every check side by side.
 */
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import type { AttemptComparison, ComparedAttempt, ComparedCheck } from '../types/index.js';
import { formatLimits, formatMeasured, formatQuantity, formatTime, measurementLabel } from './reportNumbers.js';
import { md, mdTable } from './recordMarkdown.js';
import { esc, htmlPage, statusHtml, table } from './htmlPage.js';

const sideWord = (s: ComparedAttempt): string =>
  s.state === 'incomplete' ? `${INCOMPLETE_WORD}, waiting for ${s.waitingFor.join(', ')}` : STATEMENT_WORDS[s.statement];

function sideLine(label: string, s: ComparedAttempt): string {
  const run = s.runNumber !== undefined ? `run ${s.runNumber}` : `run #${s.runId}`;
  const notes = s.notes.length ? `; note: ${s.notes.join('; ')}` : '';
  return `${label} attempt #${s.number} (${formatTime(s.startedAt)}, ${run}): ${sideWord(s)}${notes}`;
}

const checkName = (k: ComparedCheck): string => `${k.condition} · ${k.output} · ${measurementLabel(k.measurement)}`;
const shown = (v: ComparedCheck['before'], unit: string): string => (v ? formatMeasured(v.value, v.expandedUncertainty, unit) : 'not checked');
const word = (v: ComparedCheck['before']): string => (v ? STATEMENT_WORDS[v.statement] : '—');
const changeText = (k: ComparedCheck): string =>
  k.change === null ? '—' : `${k.change >= 0 ? '+' : '−'}${formatQuantity(Math.abs(k.change), k.unit, 3)}${k.significant ? '' : ' (within U)'}`;

/** The "what changed" lines: statements that moved, values that moved beyond U, causes gone and new. */
export function changeLines(c: AttemptComparison): string[] {
  const lines: string[] = [];
  if (c.before.statement !== c.after.statement || c.before.state !== c.after.state) lines.push(`unit: ${sideWord(c.before)} → ${sideWord(c.after)}`);
  for (const k of c.checks.filter((x) => x.statementChanged)) lines.push(`${checkName(k)}: ${word(k.before)} → ${word(k.after)} (${shown(k.before, k.unit)} → ${shown(k.after, k.unit)})`);
  for (const k of c.checks.filter((x) => !x.statementChanged && x.significant)) lines.push(`${checkName(k)}: moved ${changeText(k)} (${shown(k.before, k.unit)} → ${shown(k.after, k.unit)}), statement unchanged`);
  for (const g of c.causesGone) lines.push(`no longer named: ${g.title}`);
  for (const n of c.causesNew) lines.push(`newly named: ${n.title}`);
  return lines.length ? lines : ['nothing beyond the measurement uncertainty'];
}

function rows(c: AttemptComparison): string[][] {
  return c.checks.map((k) => [checkName(k), shown(k.before, k.unit), word(k.before), shown(k.after, k.unit), word(k.after), changeText(k), formatLimits(k.lower, k.upper, k.unit)]);
}

const HEAD = ['check', 'before (± U, k = 2)', 'before', 'after (± U, k = 2)', 'after', 'change', 'limits'];
const causeList = (s: ComparedAttempt): string => (s.causes.length ? s.causes.map((x) => x.title).join('; ') : 'none');

export function renderComparisonText(c: AttemptComparison): string {
  const table = rows(c);
  const widths = HEAD.map((h, i) => Math.max(h.length, ...table.map((r) => r[i].length)));
  const pad = (cells: readonly string[]): string => cells.map((s, i) => s.padEnd(widths[i])).join('  ').trimEnd();
  return [
    `${c.unit} · ${c.spec.name} rev ${c.spec.revision}: attempt #${c.before.number} against #${c.after.number}`,
    sideLine('before:', c.before),
    `  likely causes: ${causeList(c.before)}`,
    sideLine('after: ', c.after),
    `  likely causes: ${causeList(c.after)}`,
    '',
    'What changed',
    ...changeLines(c).map((l) => `  ${l}`),
    '',
    pad(HEAD),
    ...table.map(pad),
    '',
  ].join('\n');
}

export function renderComparisonMarkdown(c: AttemptComparison): string {
  return [
    `# ${md(c.unit)}: attempt #${c.before.number} against #${c.after.number}`,
    '',
    `- spec: ${md(c.spec.name)}, revision ${md(c.spec.revision)}`,
    `- ${md(sideLine('before:', c.before))}; likely causes: ${md(causeList(c.before))}`,
    `- ${md(sideLine('after:', c.after))}; likely causes: ${md(causeList(c.after))}`,
    '',
    '## What changed',
    '',
    ...changeLines(c).map((l) => `- ${md(l)}`),
    '',
    '## Checks side by side',
    '',
    mdTable(HEAD, rows(c).map((r) => r.map(md))),
    '',
  ].join('\n');
}

export function renderComparisonHtml(c: AttemptComparison): string {
  const status = (s: ComparedAttempt): string => (s.state === 'incomplete' ? esc(sideWord(s)) : statusHtml(s.statement));
  const sides = [c.before, c.after]
    .map((s, i) => `<li>${i === 0 ? 'before' : 'after'}: attempt #${s.number} (${esc(formatTime(s.startedAt))}) ${status(s)}${s.notes.length ? ` — note: ${esc(s.notes.join('; '))}` : ''}; likely causes: ${esc(causeList(s))}</li>`)
    .join('');
  const body = rows(c).map((r, i) => `<tr data-changed="${c.checks[i].statementChanged || c.checks[i].significant}">${r.map((cell) => `<td>${esc(cell)}</td>`).join('')}</tr>`);
  return htmlPage(
    `${c.unit}: attempt #${c.before.number} against #${c.after.number}`,
    `<h1>${esc(c.unit)}: attempt #${c.before.number} against #${c.after.number}</h1><ul>${sides}</ul><h2>What changed</h2><ul>${changeLines(c).map((l) => `<li>${esc(l)}</li>`).join('')}</ul><h2>Checks side by side</h2>${table(HEAD, body)}`,
  );
}

export function renderComparisonJson(c: AttemptComparison): string {
  return `${JSON.stringify({ ...c, changes: changeLines(c) }, null, 2)}\n`;
}
