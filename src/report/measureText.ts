/**
 * `benchproof measure` as plain aligned text: one block per capture, one per channel, measurements
 * grouped by what they describe (timing, levels, ramps, edges, spectrum), each with its expanded
 * uncertainty U (k = 2), as every other report shows it, or, when withheld, the words NOT MEASURED and the note that says what to do.
 * Status is always a word; the style only adds emphasis.
 */
import { MEASUREMENT_LABELS } from '../types/index.js';
import type { ChannelReport, MeasureReport, Measurement, MeasurementId } from '../types/index.js';
import { formatQuantity, group, quantityParts } from './format.js';
import type { TextStyle } from './style.js';

const GROUPS: readonly (readonly [string, readonly MeasurementId[]])[] = [
  ['timing', ['frequency', 'period', 'jitter', 'cycleToCycleJitter']],
  ['levels', ['highLevel', 'lowLevel', 'amplitude', 'maximum', 'minimum', 'peakToPeak', 'dcOffset', 'rms', 'acRms']],
  ['ramps', ['riseSlope', 'fallSlope', 'slopeRatio', 'symmetry', 'linearity']],
  ['edges', ['dutyCycle', 'riseTime', 'fallTime', 'overshoot', 'undershoot']],
  ['spectrum', ['thd', 'snr', 'sinad', 'sfdr', 'enob', 'shapeError', 'evenOddRatio', 'humFrequency', 'humLevel']],
];

export { MEASUREMENT_LABELS };

const MAX_HARMONICS_SHOWN = 10;

export function renderMeasureText(reports: readonly MeasureReport[], style: TextStyle): string {
  return `${reports.map((r) => renderReport(r, style)).join('\n')}`;
}

function renderReport(r: MeasureReport, style: TextStyle): string {
  const lines = [
    style.bold(r.file),
    `  ${group(String(r.samples))} samples at ${formatQuantity(r.sampleInterval, 's')} (${formatQuantity(r.duration, 's')}), sha256 ${r.sha256.slice(0, 12)}`,
    ...r.warnings.map((w) => `  ${style.warn('warning:')} ${w.message}${w.line !== undefined ? ` (line ${w.line})` : ''}`),
  ];
  for (const ch of r.channels) lines.push('', ...renderChannel(ch, style));
  return `${lines.join('\n')}\n`;
}

function renderChannel(ch: ChannelReport, style: TextStyle): string[] {
  const lines = [`  ${style.bold(ch.name)}${ch.unit ? ` (${ch.unit})` : ''}  shape: ${ch.shape}  ${style.dim('± is U (k = 2)')}`];
  lines.push(...ch.warnings.map((w) => `    ${style.warn('warning:')} ${w.message}`));
  const rows = GROUPS.map(([title, ids]) => [title, ids.filter((id) => ch.measurements[id] !== undefined)] as const).filter(([, ids]) => ids.length > 0);
  const cells = rows.flatMap(([, ids]) => ids.map((id) => cellsOf(ch.measurements[id] as Measurement)));
  const labelWidth = Math.max(...rows.flatMap(([, ids]) => ids.map((id) => MEASUREMENT_LABELS[id].length)));
  const valueWidth = Math.max(0, ...cells.map((c) => c?.value.length ?? 0));
  const unitWidth = Math.max(0, ...cells.map((c) => c?.unit.length ?? 0));
  // A note shared by several withheld values (clipping, too few cycles) is printed once.
  const firstWithNote = new Map<string, string>();
  for (const [title, ids] of rows) {
    lines.push(`    ${style.dim(title)}`);
    for (const id of ids) {
      const m = ch.measurements[id] as Measurement;
      const label = MEASUREMENT_LABELS[id].padEnd(labelWidth);
      const c = cellsOf(m);
      if (!c) {
        const note = m.note ?? '';
        const seen = firstWithNote.get(note);
        if (seen === undefined && note) firstWithNote.set(note, MEASUREMENT_LABELS[id]);
        lines.push(`      ${label}  ${style.statement('not-measured')}  ${seen !== undefined ? `(as for ${seen})` : note}`.trimEnd());
        continue;
      }
      const u = c.uncertainty === null ? '' : `± ${c.uncertainty} ${c.unit}`.trimEnd();
      lines.push(`      ${label}  ${c.value.padStart(valueWidth)} ${c.unit.padEnd(unitWidth)}  ${u}`.trimEnd());
    }
  }
  lines.push(...renderHarmonics(ch, style));
  return lines;
}

function cellsOf(m: Measurement): { value: string; unit: string; uncertainty: string | null } | null {
  if (m.value === null && m.bound) {
    // Nothing detected beyond a level: shown as that bound, e.g. "< −72.0 dBc".
    const p = quantityParts(outward(m.bound.value, m.bound.kind), m.unit, null);
    return { value: `${m.bound.kind === 'upper' ? '<' : '>'} ${p.value}`, unit: p.unit, uncertainty: null };
  }
  // U = 2u (k = 2), the same expanded uncertainty check, the record and the batch report show.
  return m.value === null ? null : quantityParts(m.value, m.unit, m.uncertainty === null ? null : 2 * m.uncertainty);
}

/** A bound rounded to 3 significant digits away from the side it bounds, so the shown bound still holds. */
function outward(v: number, kind: 'upper' | 'lower'): number {
  if (v === 0) return 0;
  const step = 10 ** (Math.floor(Math.log10(Math.abs(v))) - 2);
  return (kind === 'upper' ? Math.ceil(v / step - 1e-9) : Math.floor(v / step + 1e-9)) * step;
}

function renderHarmonics(ch: ChannelReport, style: TextStyle): string[] {
  const shown = ch.harmonics.filter((h) => h.n >= 2).slice(0, MAX_HARMONICS_SHOWN);
  if (shown.length === 0) return [];
  const more = ch.harmonics.filter((h) => h.n >= 2).length - shown.length;
  const list = shown.map((h) => `${h.n}: ${group(h.dbc.toFixed(1))}`).join('  ');
  return [
    `    ${style.dim('harmonics (dBc)')}`,
    `      ${list}${more > 0 ? `  (+${more} more with --json)` : ''}`,
    ...(ch.harmonicsMethod ? [`      ${style.dim(ch.harmonicsMethod)}`] : []),
  ];
}
