/** Batch statistics as Markdown: yields, the units, and per checked quantity the spread and Cp/Cpk. */
import type { BatchReport, BatchUnit, SpecBatch, YieldFigure } from '../types/index.js';
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import { md, mdTable, sourceLine } from './recordMarkdown.js';
import { formatFraction, formatIndex, formatStat, formatTime, measurementLabel, scaleOf } from './reportNumbers.js';
import { batchRemarkWords, measurementNotes } from './batchRemarks.js';

export function describeYield(y: YieldFigure): string {
  const cond = y.conditional ? `, ${y.conditional} of them ${STATEMENT_WORDS['conditional-pass']}` : '';
  return `${formatFraction(y.fraction)} (${y.accepted} of ${y.units} units${cond})`;
}

export function batchFilterText(batch: BatchReport): string {
  return batch.filter.since ? `units first tested on or after ${formatTime(batch.filter.since)}` : 'all units';
}

/** `FK-0102 (low, high), FK-0103 (mid)`: the units with no complete attempt and what each waits for. */
export function describeWaiting(s: SpecBatch): string {
  return (s.incomplete ?? []).map((u) => `${u.unit} (${u.waitingFor.join(', ')})`).join(', ');
}

/** The first complete attempt's statement; INCOMPLETE while the unit has none. */
export function unitFirst(u: BatchUnit): string {
  if (u.firstComplete) return STATEMENT_WORDS[u.firstComplete];
  return u.attempts !== undefined ? INCOMPLETE_WORD : STATEMENT_WORDS[u.first];
}

/** The latest attempt: INCOMPLETE while it waits, else its statement. */
export function unitLatest(u: BatchUnit): string {
  return u.state === 'incomplete' ? `${INCOMPLETE_WORD} (${(u.waitingFor ?? []).join(', ')})` : STATEMENT_WORDS[u.latest];
}

function specBlock(s: SpecBatch): string {
  const units = mdTable(
    ['unit', 'runs', 'first pass', 'latest', 'last tested'],
    s.units.map((u) => [md(u.unit), String(u.runs), unitFirst(u), unitLatest(u), formatTime(u.lastTestedAt)]),
  );
  const rows = s.measurements.map((m) => [
    md(m.condition), md(m.output), md(measurementLabel(m.measurement)), String(m.count),
    md(formatStat(m.mean, m.unit, scaleOf(m))), md(formatStat(m.sd, m.unit, scaleOf(m), 3)), md(formatStat(m.min, m.unit, scaleOf(m))), md(formatStat(m.max, m.unit, scaleOf(m))),
    md(formatStat(m.lower, m.unit, scaleOf(m))), md(formatStat(m.upper, m.unit, scaleOf(m))), formatIndex(m.cp), formatIndex(m.cpk), md(measurementNotes(m).join('; ')),
  ]);
  return [
    `## ${md(s.spec)}`,
    `- revisions: ${s.revisions.map(md).join(', ')}; ${s.units.length} units, ${s.runs} runs`,
    `- first-pass yield: ${describeYield(s.firstPass)}`,
    `- final yield: ${describeYield(s.final)}`,
    ...(s.incomplete?.length ? [`- still waiting (in neither yield): ${md(describeWaiting(s))}`] : []),
    ...s.remarks.map((r) => `- note: ${md(batchRemarkWords(r))}`),
    '',
    '### Units',
    '',
    units,
    '',
    '### Measurements (one value per unit, from its latest complete attempt; Cp/Cpk per NIST/SEMATECH e-Handbook §6.1.6)',
    '',
    mdTable(['condition', 'output', 'measurement', 'n', 'mean', 's', 'min', 'max', 'LSL', 'USL', 'Cp', 'Cpk', 'notes'], rows),
  ].join('\n');
}

export function renderBatchMarkdown(batch: BatchReport): string {
  const head = `# Batch report\n\nScope: ${batchFilterText(batch)}${batch.filter.spec ? `, spec ${md(batch.filter.spec)}` : ''}. Accepted = ${STATEMENT_WORDS.pass} or ${STATEMENT_WORDS['conditional-pass']}.`;
  const body = batch.specs.length ? batch.specs.map(specBlock).join('\n\n') : 'No units match.';
  const foot = batch.source ? `\n\n${sourceLine(batch.source)}` : '';
  return `${head}\n\n${body}${foot}\n`;
}
