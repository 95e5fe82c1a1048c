/** The per-unit test record as one self-contained, printable HTML file with inline SVG plots. */
import type { UnitRecord } from '../types/index.js';
import { esc, htmlPage } from './htmlPage.js';
import { RECORD_HTML_SECTIONS } from './htmlRecordSections.js';
import { formatTime } from './reportNumbers.js';

export function renderRecordHtml(rec: UnitRecord): string {
  if (rec.runs.length === 0 && !rec.calibrations?.length) throw new RangeError(`renderRecordHtml: record of ${rec.unit} has no runs`);
  // A unit calibrated but never checked: only the calibration section has something to show.
  const sections = rec.runs.length === 0 ? RECORD_HTML_SECTIONS.filter((s) => s.id === 'calibration') : RECORD_HTML_SECTIONS;
  const body = sections.map((s) => s.render(rec)).join('\n');
  const src = rec.source;
  const footer = `<footer>benchproof test record of ${esc(rec.unit)}${src ? `, generated ${esc(formatTime(src.generatedAt))} by benchproof ${esc(src.toolVersion)} from the records in <code>${esc(src.dataDir)}</code>${src.chainHead ? `; records chain head <code>${esc(src.chainHead.slice(0, 16))}</code>` : ''}` : ''}.</footer>`;
  return htmlPage(`Test record ${rec.unit} — ${rec.spec.name}`, `${body}\n${footer}`);
}
