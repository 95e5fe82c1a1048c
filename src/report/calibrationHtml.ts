/**
 * The calibration section of the HTML unit record: per calibration run, the tracking plot (error in
 * cents against step, one line per iteration, limit band) and, per iteration, its figures, guidance
 * and step table. A unit calibrated but never checked gets its own heading here, since the check
 * sections have nothing to show.
 */
import type { StoredCalibrationIteration, StoredCalibrationRun, UnitRecord } from '../types/index.js';
import { iterationNotes, trimText } from './trimText.js';
import { STEP_HEAD, figurePairs, lawText, limitsText, outcomeText, stepCells } from './calibrationFormat.js';
import { esc, facts, statusHtml, table } from './htmlPage.js';
import { renderTrackingSvg } from './svgTracking.js';
import { formatTime } from './reportNumbers.js';

export function renderCalibrationSection(rec: UnitRecord): string {
  const runs = rec.calibrations ?? [];
  if (runs.length === 0) return '';
  const head = rec.runs.length === 0 ? `<header><h1>Test record — unit ${esc(rec.unit)}</h1><p class="note">No check runs stored yet: only calibration runs.</p></header>` : '';
  return `${head}<section id="calibration"><h2>Calibration runs</h2>${[...runs].reverse().map(runHtml).join('')}</section>`;
}

function runHtml(run: StoredCalibrationRun): string {
  const first = run.iterations[0]?.result;
  const changed = run.iterations.filter((i) => !i.intact).map((i) => `#${i.number}`);
  const warn = changed.length ? `<p class="warning">Iteration ${changed.join(', ')} no longer matches the fingerprint taken when it was stored. Do not rely on it.</p>` : '';
  const plot = renderTrackingSvg(run);
  return `<section class="calibration-run" data-calibration="${run.id}"><h3>Calibration run #${run.id} — ${run.complete ? 'complete' : 'open'}</h3>${facts([
    ['started', esc(formatTime(run.startedAt))],
    ['spec', `${esc(run.spec.name)}, revision ${esc(run.spec.revision)}`],
    ['law', first ? esc(lawText(first.law)) : '—'],
    ['limits', first ? esc(limitsText(first.limits)) : '—'],
    ['iterations', String(run.iterations.length)],
  ])}${warn}${plot ? `<figure>${plot}<figcaption>Error in cents at each step, one line per iteration; the band is the error limit.</figcaption></figure>` : ''}${run.iterations.map(iterationHtml).join('')}</section>`;
}

function iterationHtml(s: StoredCalibrationIteration): string {
  const it = s.result;
  const rows = it.steps.map((st) => `<tr data-step="${esc(st.label)}">${stepCells(st, it.law).map((c, i) => `<td${i >= 2 ? ' class="num"' : ''}>${esc(c)}</td>`).join('')}<td>${st.statement ? statusHtml(st.statement) : '<span class="note">no limit</span>'}</td></tr>`);
  const guidance = it.guidance.length ? `<ul>${it.guidance.map((g) => `<li${g.action === 'leave' ? ' class="note"' : ''}>${esc(trimText(g))}</li>`).join('')}</ul>` : '';
  const notes = iterationNotes(it).map((n) => `<p class="note">${esc(n)}</p>`).join('');
  return `<section class="calibration-iteration" data-iteration="${s.id}"><h4>Iteration ${s.number}${it.label ? ` “${esc(it.label)}”` : ''} — ${statusHtml(it.statement)} <span class="note">${esc(formatTime(s.startedAt))}, ${esc(s.operator)}, ${esc(s.station)}</span></h4><p>${esc(outcomeText(it))}</p>${it.note !== undefined ? `<p class="attempt-note">What was done before it: ${esc(it.note)}</p>` : ''}${facts(figurePairs(it).map(([k, v]) => [esc(k), esc(v)] as const))}${guidance}${notes}${table([...STEP_HEAD, 'statement'], rows)}</section>`;
}
