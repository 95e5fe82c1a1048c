/**
 * Sections of the HTML unit record, in order. Each is a plain function of the record, so a new kind of
 * run (calibration, with its iterations and tracking plot) is one more entry in RECORD_HTML_SECTIONS.
 */
import type { CheckVerdict, StoredRun, UnitRecord } from '../types/index.js';
import { esc, facts, numCell, statusHtml, table } from './htmlPage.js';
import { renderPlotsSection, renderTrendsSection } from './htmlRecordPlots.js';
import { renderCalibrationSection } from './calibrationHtml.js';
import { quantityParts } from '../types/index.js';
import { formatBytes, formatLimits, formatMargin, formatMeasured, formatQuantity, formatTime, measurementLabel, valueExponent } from './reportNumbers.js';
import { ATTEMPT_HEAD, attemptRows, calibratedSinceText, runLabel, stateWords } from './attemptWords.js';
import { causeEvidence } from './causeWords.js';

export interface RecordHtmlSection {
  readonly id: string;
  readonly render: (rec: UnitRecord) => string;
}

export const latestRun = (rec: UnitRecord): StoredRun => rec.runs[rec.runs.length - 1];
const distinct = (xs: readonly string[]): string => [...new Set(xs)].map(esc).join(', ');

function header(rec: UnitRecord): string {
  const last = latestRun(rec);
  return `<header><h1>Test record — unit ${esc(rec.unit)}</h1>${facts([
    ['spec', `${esc(rec.spec.name)}, revision ${esc(rec.spec.revision)}`],
    ['spec SHA-256', `<span class="hash">${esc(rec.spec.sha256)}</span>`],
    ['first tested', esc(formatTime(rec.firstTestedAt))],
    ['last tested', esc(formatTime(rec.lastTestedAt))],
    ['runs', String(rec.runs.length)],
    ['test attempts', String(rec.attempts?.length ?? rec.runs.length)],
    ['operator', distinct(rec.runs.map((r) => r.operator))],
    ['station', distinct(rec.runs.map((r) => r.station))],
    ['tool version', distinct(rec.runs.map((r) => r.toolVersion))],
    ['decision rule', esc(last.verdict.decisionRule)],
  ])}</header>`;
}

function status(rec: UnitRecord): string {
  const last = latestRun(rec);
  const changed = rec.runs.filter((r) => !r.intact);
  const warn = changed.length
    ? `<p class="warning">Run ${changed.map((r) => `#${r.id}`).join(', ')} no longer matches the fingerprint taken when it was stored: its content was changed outside benchproof. Do not rely on it.</p>`
    : `<p class="note">All ${rec.runs.length} run(s) match the SHA-256 fingerprints taken when they were stored.</p>`;
  const attempt = rec.attempts?.[rec.attempts.length - 1];
  const shown = attempt?.state === 'incomplete' ? `<span class="status big" data-state="incomplete">${esc(stateWords(attempt))}</span>` : statusHtml(rec.status, true);
  const since = calibratedSinceText(rec);
  return `<section id="status"><h2>Current status</h2><p>${shown} <span class="note">decided by the latest run, ${esc(runLabel(last))}, started ${esc(formatTime(last.startedAt))}</span></p>${warn}${since ? `<p class="warning">${esc(since)}</p>` : ''}</section>`;
}

export function checkRow(run: StoredRun, k: CheckVerdict): string {
  const attrs = `data-run="${run.id}" data-condition="${esc(k.condition)}" data-output="${esc(k.output)}" data-measurement="${esc(k.measurement)}"`;
  const e = valueExponent(k.value, k.expandedUncertainty, k.unit);
  const U = k.value !== null && k.expandedUncertainty !== null ? quantityParts(k.value, k.unit, k.expandedUncertainty) : null;
  const uText = U?.uncertainty ? `${U.uncertainty}${U.unit ? ` ${U.unit}` : ''}` : '—';
  return `<tr ${attrs}><td>${esc(k.output)}</td><td>${esc(measurementLabel(k.measurement))}</td>${numCell(k.value, formatMeasured(k.value, k.expandedUncertainty, k.unit))}${numCell(k.expandedUncertainty, uText)}<td class="num">${esc(formatLimits(k.lower, k.upper, k.unit, e))}</td>${numCell(k.margin, formatMargin(k.margin, k.unit, e))}<td>${statusHtml(k.statement)}</td><td>${esc([k.note, k.hint].filter(Boolean).join(' — '))}</td></tr>`;
}

function conditions(rec: UnitRecord): string {
  const last = latestRun(rec);
  const parts = last.verdict.conditions.map((c) => {
    if (c.waiting) return `<section class="condition" data-waiting="true"><h3>Condition ${esc(c.condition)} — waiting for a capture</h3></section>`;
    const rows = c.checks.map((k) => checkRow(last, k));
    return `<section class="condition"><h3>Condition ${esc(c.condition)} — ${statusHtml(c.statement)}</h3>${table(['output', 'measurement', 'measured (± U, k = 2)', 'U', 'limits', 'margin', 'statement', 'note'], rows)}</section>`;
  });
  return `<section id="results"><h2>Results of the latest run: ${esc(runLabel(last))}</h2>${parts.join('')}</section>`;
}

function causes(rec: UnitRecord): string {
  const { diagnosis } = latestRun(rec);
  const list = diagnosis.causes.length
    ? `<ol>${diagnosis.causes
        .map((c) => `<li><strong>${esc(c.title)}</strong> <span class="note">(weight ${c.score.toFixed(2)})</span><ul>${causeEvidence(c).map((e) => `<li>${esc(e)}</li>`).join('')}<li>to confirm: ${esc(c.confirm)}</li>${c.where ? `<li>where to look: ${esc(c.where)}</li>` : ''}</ul></li>`)
        .join('')}</ol>`
    : '<p class="note">No likely cause: nothing in the latest run points at a fault.</p>';
  const circuit = (diagnosis.circuit ?? []).map((v) => {
    const rows = v.figures.map((f) => `<tr><td>${esc(f.label)}</td>${numCell(f.value, formatMeasured(f.value, f.uncertainty, f.unit))}${numCell(f.design, formatQuantity(f.design, f.unit))}${numCell(f.deviation, f.deviation === undefined ? '—' : `${f.deviation.toFixed(2)} %`)}<td>${esc(f.note ?? '')}</td></tr>`);
    return `<h3>Circuit figures at ${esc(v.condition)}</h3>${table(['figure', 'from the captures', 'design', 'deviation', 'note'], rows)}`;
  });
  const preliminary = rec.state === 'incomplete' ? ` <span class="note">(preliminary: waiting for ${esc((rec.waitingFor ?? []).join(', '))})</span>` : '';
  return `<section id="causes"><h2>Likely causes${preliminary}</h2>${list}${circuit.join('')}</section>`;
}

/** The unit's test attempts with why each opened and the notes of what was done. */
function attempts(rec: UnitRecord): string {
  if (!rec.attempts?.length) return '';
  const rows = attemptRows(rec).map((cells, i) => `<tr data-attempt="${rec.attempts![rec.attempts!.length - 1 - i].number}">${cells.map((c) => `<td>${esc(c)}</td>`).join('')}</tr>`);
  return `<section id="attempts"><h2>Test attempts</h2>${table([...ATTEMPT_HEAD], rows)}</section>`;
}

function history(rec: UnitRecord): string {
  const rows = [...rec.runs].reverse().map(
    (r) => `<tr data-run="${r.id}"><td>${r.number !== undefined ? `${r.number} (#${r.id})` : `#${r.id}`}${r.attempt !== undefined ? `, attempt #${r.attempt}` : ''}</td><td>${esc(formatTime(r.startedAt))}</td><td>${esc(r.operator)}</td><td>${esc(r.station)}</td><td>${esc(r.spec.revision)}</td><td>${esc(r.toolVersion)}</td><td>${statusHtml(r.statement)}</td><td>${r.intact ? 'matches' : '<strong>CHANGED</strong>'}</td></tr>`,
  );
  return `<section id="history"><h2>History of runs</h2>${table(['run (# in data folder), attempt', 'started', 'operator', 'station', 'spec rev.', 'tool', 'status', 'fingerprint'], rows)}</section>`;
}

function captures(rec: UnitRecord): string {
  const rows = [...rec.runs].reverse().flatMap((r) =>
    r.captures.map((c) => `<tr data-run="${r.id}"><td>#${r.id}</td><td>${esc(c.condition)}</td><td><code>${esc(c.path)}</code></td>${numCell(c.size, formatBytes(c.size))}<td>${esc(c.layout)}</td><td class="hash" data-sha256="${esc(c.sha256)}">${esc(c.sha256)}</td><td><code>${esc(c.archivePath)}</code></td></tr>`),
  );
  return `<section id="captures"><h2>Captures</h2><p class="note">Each capture is archived unchanged in the data folder under its SHA-256.</p>${table(['run', 'condition', 'original path', 'size', 'layout', 'SHA-256', 'archived as'], rows)}</section>`;
}

export const RECORD_HTML_SECTIONS: readonly RecordHtmlSection[] = [
  { id: 'header', render: header },
  { id: 'status', render: status },
  { id: 'results', render: conditions },
  { id: 'causes', render: causes },
  { id: 'plots', render: renderPlotsSection },
  { id: 'trends', render: renderTrendsSection },
  { id: 'calibration', render: renderCalibrationSection },
  { id: 'attempts', render: attempts },
  { id: 'history', render: history },
  { id: 'captures', render: captures },
];
