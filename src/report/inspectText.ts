/**
 * `benchproof inspect` as text: how one capture file was understood. File facts, the reading in
 * force, each opening line with its role, what the preamble gave, the time base and where it came
 * from, each column with its role, unit and scaling, the warnings, and the first samples as read.
 */
import type { FailedInspection, Inspection } from '../capture/index.js';
import { formatQuantity } from './format.js';
import type { TextStyle } from './style.js';

const DELIMITER_WORDS: Readonly<Record<string, string>> = { ',': 'comma', ';': 'semicolon', '\t': 'tab', ' ': 'spaces' };
const UNIT_FROM: Readonly<Record<string, string>> = {
  header: 'header row',
  'units-row': 'units row',
  option: '--channel-unit',
  preamble: 'preamble',
  'converter-step': 'preamble converter step',
  'scale-option': '--scale',
  counts: 'none stated: converter counts',
  none: 'none stated: taken as volts',
};
const FOUND_BY: Readonly<Record<string, string>> = {
  option: 'named by --time-column',
  name: 'found by its name',
  unit: 'found by its unit',
  rising: 'found because it rises on every row',
  'rising-with-repeats': 'found because it never falls (its stamps repeat)',
};

export function renderInspectText(docs: readonly Inspection[], style: TextStyle): string {
  return docs.map((d) => inspectionText(d, style)).join('\n');
}

/** The opening lines of a file that could not be read, with their roles, above the error itself. */
export function renderInspectFailure(f: FailedInspection, style: TextStyle): string {
  const out = [style.bold(`${f.path}: not read (${f.error.code})`), `  ${style.bold('lines')}`];
  for (const line of f.lines) out.push(lineText(line));
  return `${out.join('\n')}\n`;
}

function lineText(line: { line: number; role: string; text: string }): string {
  return `  ${String(line.line).padStart(6)}  ${line.role.padEnd(17)} ${line.text.replace(/\t/g, '→')}`;
}

function inspectionText(d: Inspection, style: TextStyle): string {
  const c = d.capture;
  const l = c.layout;
  const r = l.reading;
  const out: string[] = [style.bold(c.path)];
  const row = (label: string, text: string): void => void out.push(`  ${label.padEnd(11)} ${text}`);
  row('file', `${c.size} bytes${l.compressed ? ' (gzip)' : ''}, ${l.lineEnding.toUpperCase()} line ends${l.bom ? ', UTF-8 byte-order mark' : ''}, SHA-256 ${c.sha256.slice(0, 16)}…`);
  row('fields', `${DELIMITER_WORDS[l.delimiter]}-separated, decimal ${l.decimalMark === ',' ? 'comma' : 'point'}`);
  row('profile', r?.profile ?? 'none');
  if (r && Object.keys(r.settings).length > 0) row('settings', Object.entries(r.settings).map(([k, v]) => `${k} ${typeof v === 'object' ? JSON.stringify(v) : JSON.stringify(v)}`).join(', '));
  out.push('', `  ${style.bold('lines')}`);
  for (const line of d.lines) out.push(lineText(line));
  if (c.layout.lastDataLine > (d.lines.at(-1)?.line ?? 0)) out.push(`  ${'…'.padStart(6)}  data to line ${c.layout.lastDataLine}`);
  if (r?.weighed && r.weighed.length > 1) {
    out.push('', `  ${style.bold('readings weighed')}`);
    for (const w of r.weighed) out.push(`    ${w.chosen ? '*' : ' '} ${w.what}`);
  }
  if (r && r.recognised.length > 0) {
    out.push('', `  ${style.bold('preamble understood')}`);
    for (const k of r.recognised) out.push(`    ${k.key} → ${k.meaning}: ${typeof k.value === 'number' ? String(k.value) : k.value}`);
  }
  const otherKeys = Object.keys(c.metadata).length - (r?.recognised.length ?? 0);
  if (otherKeys > 0) out.push(`    ${otherKeys} other preamble entr${otherKeys === 1 ? 'y' : 'ies'} kept with the capture, not used`);
  out.push('', `  ${style.bold('time base')}`);
  out.push(`    ${formatQuantity(c.sampleInterval, 's')} per sample (${formatQuantity(1 / c.sampleInterval, 'Hz')}), from ${r?.intervalSource ?? l.timing}${l.resampled ? ', resampled onto a uniform grid' : ''}`);
  out.push(`    first sample at ${formatQuantity(c.startTime, 's')}; ${c.length} samples, ${formatQuantity(c.length * c.sampleInterval, 's')}`);
  if (r && r.segments > 1) out.push(`    acquisition ${r.segmentRead} of ${r.segments}`);
  out.push('', `  ${style.bold('columns')}`);
  l.columns.forEach((col, k) => {
    const role =
      k === l.timeColumn ? `time${col.unit ? `, ${col.unit}` : ', seconds assumed'}${r?.xFoundBy ? `, ${FOUND_BY[r.xFoundBy] ?? r.xFoundBy}` : ''}`
      : k === l.indexColumn ? `sample index${r?.xFoundBy ? `, ${FOUND_BY[r.xFoundBy] ?? r.xFoundBy}` : ''}`
      : channelRole(d, col.name, col.unit, col.siUnit);
    out.push(`    ${String(k + 1).padStart(3)}  ${(col.name || '—').padEnd(16)} ${role}`);
  });
  out.push('', `  ${style.bold('warnings')}`);
  if (c.warnings.length === 0) out.push('    none');
  for (const w of c.warnings) out.push(`    ${style.warn(w.code)}: ${w.message}`);
  out.push('', `  ${style.bold('first samples as read')} (SI units)`);
  out.push(`    ${['time (s)', ...c.channels.map((ch) => `${ch.name}${ch.unit ? ` (${ch.unit})` : ''}`)].map((h) => h.padStart(14)).join(' ')}`);
  for (const fr of d.firstRows) out.push(`    ${[fr.time, ...fr.values].map(sampleText).map((s) => s.padStart(14)).join(' ')}`);
  return `${out.join('\n')}\n`;
}

/** A sample as the file might print it: eight significant digits, exponent form when tiny or huge. */
function sampleText(v: number | null): string {
  if (v === null) return '—';
  const a = Math.abs(v);
  return a !== 0 && (a < 1e-3 || a >= 1e7) ? v.toExponential(6) : String(Number(v.toPrecision(8)));
}

function channelRole(d: Inspection, name: string, unit: string, siUnit: string): string {
  const r = d.capture.layout.reading;
  const ch = r?.channels.find((x) => x.name === name);
  if (!ch) return 'not read (empty in the data, or not asked for)';
  const scaled = ch.scale !== 1 ? `, × ${ch.scale}` : '';
  const offset = ch.offset !== 0 ? ` + ${ch.offset} ${siUnit}` : '';
  const shown = unit === '' ? 'no unit' : unit === siUnit ? unit : `${unit} → ${siUnit}`;
  return `channel, ${shown}${scaled}${offset} (unit from ${UNIT_FROM[ch.unitFrom] ?? ch.unitFrom})`;
}
