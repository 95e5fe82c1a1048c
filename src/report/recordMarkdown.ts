/**
 * The per-unit test record as Markdown, for a terminal, a wiki or a ticket. Same sections as the HTML
 * record except the plots; RECORD_MARKDOWN_SECTIONS takes a new section as one entry.
 */
import type { CheckVerdict, DocumentSource, StoredRun, UnitRecord } from '../types/index.js';
import { STATEMENT_WORDS } from '../types/index.js';
import { formatBytes, formatLimits, formatMargin, formatMeasured, formatQuantity, formatTime, measurementLabel, valueExponent } from './reportNumbers.js';
import { renderCalibrationMarkdown } from './calibrationMarkdown.js';
import { causeEvidence } from './causeWords.js';
import { mdText } from './escapeText.js';
import { ATTEMPT_HEAD, attemptRows, calibratedSinceText, runLabel, stateWords } from './attemptWords.js';

/** Escape what Markdown tables, emphasis and raw HTML would take as syntax (escapeText.ts). */
export const md = mdText;

export function mdTable(head: readonly string[], rows: readonly (readonly string[])[]): string {
  const line = (cells: readonly string[]): string => `| ${cells.join(' | ')} |`;
  return [line(head), line(head.map(() => '---')), ...rows.map(line)].join('\n');
}

const latest = (rec: UnitRecord): StoredRun => rec.runs[rec.runs.length - 1];
const distinct = (xs: readonly string[]): string => [...new Set(xs)].map(md).join(', ');

function header(rec: UnitRecord): string {
  return [
    `# Test record — unit ${md(rec.unit)}`,
    '',
    `- spec: ${md(rec.spec.name)}, revision ${md(rec.spec.revision)} (SHA-256 \`${rec.spec.sha256}\`)`,
    `- tested: ${formatTime(rec.firstTestedAt)} … ${formatTime(rec.lastTestedAt)}, ${rec.runs.length} run(s) in ${rec.attempts?.length ?? rec.runs.length} attempt(s)`,
    `- operator: ${distinct(rec.runs.map((r) => r.operator))}; station: ${distinct(rec.runs.map((r) => r.station))}`,
    `- tool version: ${distinct(rec.runs.map((r) => r.toolVersion))}`,
  ].join('\n');
}

function status(rec: UnitRecord): string {
  const last = latest(rec);
  const changed = rec.runs.filter((r) => !r.intact).map((r) => `#${r.id}`);
  const integrity = changed.length
    ? `**Warning:** run ${changed.join(', ')} no longer matches its stored fingerprint; its content was changed outside benchproof.`
    : `All ${rec.runs.length} run(s) match their stored SHA-256 fingerprints.`;
  const attempt = rec.attempts?.[rec.attempts.length - 1];
  const word = attempt ? stateWords(attempt) : STATEMENT_WORDS[rec.status];
  const since = calibratedSinceText(rec);
  return `## Current status: **${md(word)}**\n\nDecided by the latest run, ${runLabel(last)}, started ${formatTime(last.startedAt)}. ${integrity}${since ? `\n\n${since}` : ''}`;
}

function checkCells(k: CheckVerdict): string[] {
  return [
    md(k.output),
    md(measurementLabel(k.measurement)),
    md(formatMeasured(k.value, k.expandedUncertainty, k.unit)),
    md(formatLimits(k.lower, k.upper, k.unit, valueExponent(k.value, k.expandedUncertainty, k.unit))),
    md(formatMargin(k.margin, k.unit, valueExponent(k.value, k.expandedUncertainty, k.unit))),
    STATEMENT_WORDS[k.statement],
    md([k.note, k.hint].filter(Boolean).join(' — ')),
  ];
}

function conditions(rec: UnitRecord): string {
  const last = latest(rec);
  const blocks = last.verdict.conditions.map((c) =>
    c.waiting ? `### Condition ${md(c.condition)} — waiting for a capture` : `### Condition ${md(c.condition)} — ${STATEMENT_WORDS[c.statement]}\n\n${mdTable(['output', 'measurement', 'measured (± U, k = 2)', 'limits', 'margin', 'statement', 'note'], c.checks.map(checkCells))}`,
  );
  return [`## Results of the latest run: ${runLabel(last)}`, ...blocks].join('\n\n');
}

function causes(rec: UnitRecord): string {
  const list = latest(rec).diagnosis.causes;
  if (list.length === 0) return `## Likely causes\n\nNone: nothing in the latest run points at a fault.${circuitFigures(rec)}`;
  const items = list.map((c, i) => {
    const lines = [`${i + 1}. **${md(c.title)}** (weight ${c.score.toFixed(2)})`, ...causeEvidence(c).map((e) => `   - ${md(e)}`), `   - to confirm: ${md(c.confirm)}`];
    if (c.where) lines.push(`   - where to look: ${md(c.where)}`);
    return lines.join('\n');
  });
  const preliminary = rec.state === 'incomplete' ? ` (preliminary: waiting for ${md((rec.waitingFor ?? []).join(', '))})` : '';
  return `## Likely causes${preliminary}\n\n${items.join('\n')}${circuitFigures(rec)}`;
}

/** The circuit view (back-computed figures against the design), when the spec has a design section. */
function circuitFigures(rec: UnitRecord): string {
  const views = latest(rec).diagnosis.circuit ?? [];
  return views
    .map((v) => {
      const rows = v.figures.map((f) => [
        md(f.label),
        formatMeasured(f.value, f.uncertainty, f.unit),
        f.design === undefined ? '—' : formatQuantity(f.design, f.unit),
        f.deviation === undefined ? '—' : `${f.deviation.toFixed(2)} %${f.withinTolerance === false ? ' (outside)' : ''}`,
        md(f.note ?? ''),
      ]);
      return `\n\n### Circuit figures at ${md(v.condition)}\n\n${mdTable(['figure', 'from the captures (± U, k = 2)', 'design', 'deviation', 'note'], rows)}`;
    })
    .join('');
}

/** The unit's test attempts with why each opened and the notes of what was done. */
function attempts(rec: UnitRecord): string {
  if (!rec.attempts?.length) return '';
  const rows = attemptRows(rec).map((cells) => cells.map(md));
  return `## Test attempts\n\n${mdTable([...ATTEMPT_HEAD], rows)}`;
}

function history(rec: UnitRecord): string {
  const rows = [...rec.runs].reverse().map((r) => [`${r.number !== undefined ? `${r.number} (#${r.id})` : `#${r.id}`}${r.attempt !== undefined ? `, attempt #${r.attempt}` : ''}`, formatTime(r.startedAt), md(r.operator), md(r.station), md(r.spec.revision), md(r.toolVersion), STATEMENT_WORDS[r.statement], r.intact ? 'matches' : '**CHANGED**']);
  return `## History of runs\n\n${mdTable(['run (# in data folder), attempt', 'started', 'operator', 'station', 'spec rev.', 'tool', 'status', 'fingerprint'], rows)}`;
}

function captures(rec: UnitRecord): string {
  const rows = [...rec.runs].reverse().flatMap((r) => r.captures.map((c) => [`#${r.id}`, md(c.condition), md(c.path), formatBytes(c.size), `\`${md(c.sha256)}\``]));
  return `## Captures\n\nArchived unchanged in the data folder under their SHA-256. Plots: \`--format html\`.\n\n${mdTable(['run', 'condition', 'original path', 'size', 'SHA-256'], rows)}`;
}

export const RECORD_MARKDOWN_SECTIONS: readonly ((rec: UnitRecord) => string)[] = [header, status, conditions, causes, attempts, history, captures, renderCalibrationMarkdown];

/** Who made the document, from which store (a data folder or a shared store address), and the store's chain head at that moment. */
export function sourceLine(src: DocumentSource): string {
  const head = src.chainHead ? ` Records chain head ${md(src.chainHead.slice(0, 16))} (the store as it was when this was made).` : '';
  return `_Generated ${formatTime(src.generatedAt)} by benchproof ${md(src.toolVersion)} from the records in ${md(src.dataDir)}._${head}`;
}

export function renderRecordMarkdown(rec: UnitRecord): string {
  if (rec.runs.length === 0 && !rec.calibrations?.length) throw new RangeError(`renderRecordMarkdown: record of ${rec.unit} has no runs`);
  const footer = rec.source ? [sourceLine(rec.source)] : [];
  // A unit calibrated but never checked: only the calibration section has something to show.
  const sections = rec.runs.length === 0 ? [renderCalibrationMarkdown] : RECORD_MARKDOWN_SECTIONS;
  return `${[...sections.map((s) => s(rec)).filter((t) => t !== ''), ...footer].join('\n\n')}\n`;
}
