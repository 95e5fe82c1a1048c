/** Batch statistics as one self-contained, printable HTML page with a histogram per checked quantity. */
import type { BatchReport, MeasurementStats, SpecBatch } from '../types/index.js';
import { STATEMENT_WORDS } from '../types/index.js';
import { batchFilterText, describeWaiting, describeYield, unitFirst, unitLatest } from './batchMarkdown.js';
import { esc, facts, htmlPage, numCell, statusHtml, table } from './htmlPage.js';
import { renderHistogramSvg } from './svgHistogram.js';
import { formatIndex, formatStat, formatTime, measurementLabel, scaleOf } from './reportNumbers.js';
import { batchRemarkWords, measurementNotes } from './batchRemarks.js';

function statsRow(s: SpecBatch, m: MeasurementStats): string {
  const attrs = `data-spec="${esc(s.spec)}" data-condition="${esc(m.condition)}" data-output="${esc(m.output)}" data-measurement="${esc(m.measurement)}"`;
  return `<tr ${attrs}><td>${esc(m.condition)}</td><td>${esc(m.output)}</td><td>${esc(measurementLabel(m.measurement))}</td>${numCell(m.count, String(m.count))}${numCell(m.mean, formatStat(m.mean, m.unit, scaleOf(m)))}${numCell(m.sd, formatStat(m.sd, m.unit, scaleOf(m), 3))}${numCell(m.min, formatStat(m.min, m.unit, scaleOf(m)))}${numCell(m.max, formatStat(m.max, m.unit, scaleOf(m)))}${numCell(m.lower, formatStat(m.lower, m.unit, scaleOf(m)))}${numCell(m.upper, formatStat(m.upper, m.unit, scaleOf(m)))}${numCell(m.cp, formatIndex(m.cp))}${numCell(m.cpk, formatIndex(m.cpk))}</tr>${m.remarks.length ? `<tr class="stat-notes"><td></td><td colspan="11" class="note">${esc(measurementNotes(m).join('; '))}</td></tr>` : ''}`;
}

function specSection(s: SpecBatch): string {
  const units = table(
    ['unit', 'runs', 'first pass', 'latest', 'last tested'],
    s.units.map((u) => `<tr><td>${esc(u.unit)}</td>${numCell(u.runs, String(u.runs))}<td>${u.firstComplete ? statusHtml(u.firstComplete) : esc(unitFirst(u))}</td><td>${u.state === 'incomplete' ? esc(unitLatest(u)) : statusHtml(u.latest)}</td><td>${esc(formatTime(u.lastTestedAt))}</td></tr>`),
  );
  const stats = table(['condition', 'output', 'measurement', 'n', 'mean', 's', 'min', 'max', 'LSL', 'USL', 'Cp', 'Cpk'], s.measurements.map((m) => statsRow(s, m)), 'stats');
  const hists = s.measurements
    .map((m) => {
      const title = `${m.condition} · ${m.output} · ${measurementLabel(m.measurement)}`;
      const svg = renderHistogramSvg({ title, unit: m.unit, values: m.values.map((v) => v.value), lower: m.lower, upper: m.upper, mean: m.mean, axisName: measurementLabel(m.measurement) });
      return svg ? `<figure>${svg}<figcaption>${esc(title)}: ${m.count} units, Cpk ${esc(formatIndex(m.cpk))}</figcaption></figure>` : '';
    })
    .join('');
  return `<section class="spec"><h2>${esc(s.spec)}</h2>${facts([
    ['revisions', esc(s.revisions.join(', '))],
    ['units / runs', `${s.units.length} / ${s.runs}`],
    ['first-pass yield', esc(describeYield(s.firstPass))],
    ['final yield', esc(describeYield(s.final))],
    ...(s.incomplete?.length ? [['still waiting (in neither yield)', esc(describeWaiting(s))] as const] : []),
    ...s.remarks.map((r) => ['note', esc(batchRemarkWords(r))] as const),
  ])}<h3>Units</h3>${units}<h3>Measurements</h3><div class="wide-print"><p class="note">One value per unit, from its latest complete attempt. Cp and Cpk as in the NIST/SEMATECH e-Handbook §6.1.6.</p>${stats}</div><h3>Histograms</h3><div class="plots">${hists}</div></section>`;
}

export function renderBatchHtml(batch: BatchReport): string {
  const intro = `<header><h1>Batch report</h1><p>Scope: ${esc(batchFilterText(batch))}${batch.filter.spec ? `, spec ${esc(batch.filter.spec)}` : ''}. Accepted = ${esc(STATEMENT_WORDS.pass)} or ${esc(STATEMENT_WORDS['conditional-pass'])}.</p></header>`;
  const body = batch.specs.length ? batch.specs.map(specSection).join('') : '<p>No units match.</p>';
  const src = batch.source;
  const footer = src ? `<footer>Generated ${esc(formatTime(src.generatedAt))} by benchproof ${esc(src.toolVersion)} from the records in <code>${esc(src.dataDir)}</code>${src.chainHead ? `; records chain head <code>${esc(src.chainHead.slice(0, 16))}</code>` : ''}.</footer>` : '';
  return htmlPage('Batch report', `${intro}${body}${footer}`);
}
