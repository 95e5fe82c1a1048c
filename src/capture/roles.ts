/**
 * What each column is: the time column, a sample-index column, a channel, or nothing (empty in the
 * data, or an index beside a time column). Names and units decide first (`Time (s)`, `t[ms]`, a
 * units row with `Second` or `Sequence`, `Index`); else the leftmost column without a non-time unit
 * that rises on every sniffed row is the x column (a sample index when it counts up by exactly one),
 * because a sampled signal does not rise monotonically over hundreds of rows. A column whose time
 * stamps repeat (printed with too few digits) still counts when it never falls.
 *
 * A channel's unit comes from its header cell, the units row, --channel-unit, or the preamble's
 * vertical unit, in that order. Integers with no unit anywhere are converter codes: scaled to volts
 * when the preamble states the size of one step (or --scale says it), otherwise in counts.
 */
import type { ColumnLayout } from '../types/index.js';
import { captureError } from './errors.js';
import { INDEX_UNIT } from './headerRows.js';
import type { MetadataTiming } from './metadata.js';
import type { ReadingOptions } from './readingOptions.js';
import { optionFor } from './readingOptions.js';
import type { Sniffed } from './sniff.js';
import { columnLayout, COUNTS, DECIBELS, parseUnit } from './siUnits.js';

export interface ColumnRoles {
  readonly columns: readonly ColumnLayout[];
  readonly timeColumn: number | null;
  readonly indexColumn: number | null;
  /** Indices of the channel columns, in file order. */
  readonly channelColumns: readonly number[];
  /** Per column: added after scaling (converter codes with an origin), 0 for most. */
  readonly offsets: readonly number[];
  /** Per column: where its unit and scale came from. */
  readonly unitSources: readonly UnitSource[];
  /** How the x column was found. */
  readonly xFoundBy: 'option' | 'name' | 'unit' | 'rising' | 'rising-with-repeats' | null;
}

export type UnitSource = 'header' | 'units-row' | 'option' | 'preamble' | 'converter-step' | 'scale-option' | 'counts' | 'none';

const TIME_NAME = /^(time|t|x|sec|seconds?|timestamp|zeit|tiempo|temps|tempo|tid|tijd|czas|aika|čas|zaman|время|horizontal|elapsed(\s*time)?|rel\.?\s*time)\b/i;
const INDEX_NAME = /^(index|idx|sample|samples|sample\s*(no\.?|number|#)|n|no\.?|nr\.?|#|point|points|pt|sequence|seq)$/i;
const FREQUENCY_NAME = /^(freq(uency)?|f)\b/i;
/** Fewer distinct codes than this, and integers are levels (a 0/10 V pulse, logic 0/1), not converter codes. */
const MIN_DISTINCT_CODES = 8;
/** Sniffed rows a column must rise over to be taken for time without a name, unless it is the first of a headerless file. */
const MIN_RISING_ROWS = 16;

type XKind = 'time' | 'index' | 'channel' | null;

export function columnRoles(s: Sniffed, meta: MetadataTiming, options: ReadingOptions, file: string): ColumnRoles {
  const n = s.columnCount;
  const ignored = new Set(s.ignoredColumns);
  const data = Array.from({ length: n }, (_, c) => c).filter((c) => !ignored.has(c));
  const raw = Array.from({ length: n }, (_, c) => baseLayout(s, c));
  const kinds = raw.map((c, k) => xKindOf(c, s.unitCells?.[k] ?? ''));
  refuseSpectrum(s, raw, kinds, data, file);
  const found = findX(s, meta, raw, kinds, data, options, file);
  const { time, index } = found;
  const x = time ?? index;
  // An index beside a time column is neither a time base nor a signal.
  const skip = new Set(ignored);
  if (time !== null) for (const c of data) if (c !== time && kinds[c] === 'index') skip.add(c);
  const channelColumns = data.filter((c) => c !== x && !skip.has(c));
  if (channelColumns.length === 0) {
    throw captureError('no-channels', file, {
      line: s.headerLine ?? s.firstDataLine,
      problem: 'the capture has a time column but no channel columns',
      expected: 'a time (or index) column followed by one or more channel columns',
      fix: 'export the capture again with the channel data included',
    });
  }
  const offsets = new Array<number>(n).fill(0);
  const unitSources = new Array<UnitSource>(n).fill('none');
  const columns = raw.map((c, k) => {
    if (k === x) return xLayout(c, k === time, s.headerCells !== null || s.unitCells !== null);
    const named = { ...c, name: c.name !== '' ? c.name : channelColumns.includes(k) ? `ch${channelColumns.indexOf(k) + 1}` : `column ${k + 1}` };
    if (!channelColumns.includes(k)) return named;
    const { layout, offset, source } = channelUnit(named, k, s, meta, options);
    offsets[k] = offset;
    unitSources[k] = source;
    return layout;
  });
  return { columns: uniqueNames(columns), timeColumn: time, indexColumn: index, channelColumns, offsets, unitSources, xFoundBy: time === null && index === null ? null : found.foundBy };
}

/** Name and unit from the names row, the unit replaced by the units row's when it has one. */
function baseLayout(s: Sniffed, c: number): ColumnLayout {
  const layout = columnLayout(s.headerCells ? s.headerCells[c] : null, '');
  const unitCell = s.unitCells?.[c] ?? '';
  if (unitCell === '' || !parseUnit(unitCell)) return layout;
  const info = parseUnit(unitCell)!;
  return { ...layout, unit: unitCell, scale: info.scale, siUnit: info.siUnit };
}

function xKindOf(c: ColumnLayout, unitCell: string): XKind {
  if (c.siUnit === 's') return 'time';
  if (INDEX_UNIT.test(unitCell.trim())) return 'index';
  if (c.siUnit !== '') return 'channel';
  if (TIME_NAME.test(c.name) || parseUnit(c.name)?.siUnit === 's') return 'time';
  if (INDEX_NAME.test(c.name.trim())) return 'index';
  return null;
}

interface XChoice {
  time: number | null;
  index: number | null;
  foundBy: ColumnRoles['xFoundBy'];
}

function findX(s: Sniffed, meta: MetadataTiming, raw: readonly ColumnLayout[], kinds: readonly XKind[], data: readonly number[], options: ReadingOptions, file: string): XChoice {
  const rows = (): readonly (readonly number[])[] => s.sampleRows();
  if (options.timeColumn !== undefined) {
    if (options.timeColumn === 'none') return { time: null, index: null, foundBy: 'option' };
    const c = pickColumn(options.timeColumn, raw, data, file);
    const asIndex = kinds[c] === 'index' || (kinds[c] !== 'time' && countsByOne(rows(), c));
    return { time: asIndex ? null : c, index: asIndex ? c : null, foundBy: 'option' };
  }
  const named = data.filter((c) => kinds[c] === 'time' || kinds[c] === 'index');
  // A time-named column without a unit that counts 0, 1, 2… beside a stated interval is a sample index (`X` over `0,1,2`).
  const stated = meta.interval !== undefined || options.interval !== undefined || options.sampleRate !== undefined;
  const asKind = (c: number): 'time' | 'index' => (kinds[c] === 'time' && raw[c].siUnit !== 's' && stated && countsByOne(rows(), c) ? 'index' : (kinds[c] as 'time' | 'index'));
  const t = named.find((c) => asKind(c) === 'time');
  if (t !== undefined) return { time: t, index: null, foundBy: raw[t].siUnit === 's' ? 'unit' : 'name' };
  const i = named.find((c) => asKind(c) === 'index');
  if (i !== undefined) return { time: null, index: i, foundBy: 'name' };
  if (data.length < 2) return { time: null, index: null, foundBy: null };
  const free = data.filter((c) => kinds[c] === null);
  // Any column may rise over a handful of rows; beyond the first column of a file without a header
  // (the rule of old), a rising column counts only over enough rows to mean it.
  const enough = rows().length >= MIN_RISING_ROWS;
  const rising = free.find((c) => (enough || (c === data[0] && s.headerCells === null && s.unitCells === null)) && rises(rows(), c));
  if (rising !== undefined) return countsByOne(rows(), rising) ? { time: null, index: rising, foundBy: 'rising' } : { time: rising, index: null, foundBy: 'rising' };
  // Time printed with too few digits repeats each stamp; only the leftmost column is taken so.
  if (free.length > 0 && free[0] === data[0] && risesWithRepeats(rows(), free[0])) return { time: free[0], index: null, foundBy: 'rising-with-repeats' };
  return { time: null, index: null, foundBy: null };
}

function xLayout(c: ColumnLayout, isTime: boolean, header: boolean): ColumnLayout {
  const name = header && c.name !== '' ? c.name : isTime ? 'time' : 'index';
  // A time column without a unit is taken to be in seconds.
  return isTime ? { name, unit: c.siUnit === 's' ? c.unit : '', scale: c.siUnit === 's' ? c.scale : 1, siUnit: 's' } : { name, unit: '', scale: 1, siUnit: '' };
}

function channelUnit(c: ColumnLayout, k: number, s: Sniffed, meta: MetadataTiming, options: ReadingOptions): { layout: ColumnLayout; offset: number; source: UnitSource } {
  const fromHeader = s.headerCells !== null && columnLayout(s.headerCells[k], '').unit !== '';
  const given = optionFor(options.channelUnit, c.name, k);
  const scale = optionFor(options.scale, c.name, k);
  let layout = c;
  let source: UnitSource = c.unit !== '' ? (fromHeader ? 'header' : 'units-row') : 'none';
  if (c.unit === '' && given !== undefined) {
    const info = parseUnit(given);
    layout = { ...c, unit: given, scale: info?.scale ?? 1, siUnit: info?.siUnit ?? given };
    source = 'option';
  }
  if (scale !== undefined) {
    const unit = layout.unit !== '' && layout.siUnit !== COUNTS ? layout : { ...layout, unit: 'V', siUnit: 'V', scale: 1 };
    return { layout: { ...unit, scale: unit.scale * scale }, offset: 0, source: 'scale-option' };
  }
  if (layout.unit !== '') return { layout, offset: 0, source };
  const integers = s.integerWritten()[k] && distinct(s.sampleRows(), k) >= MIN_DISTINCT_CODES;
  if (integers && meta.codeScale) {
    const { step, origin, reference } = meta.codeScale;
    return { layout: { ...c, unit: 'V', scale: step, siUnit: 'V' }, offset: origin - reference * step, source: 'converter-step' };
  }
  if (integers) return { layout: { ...c, unit: COUNTS, scale: 1, siUnit: COUNTS }, offset: 0, source: 'counts' };
  if (meta.verticalUnit !== undefined) {
    const info = parseUnit(meta.verticalUnit);
    return { layout: { ...c, unit: meta.verticalUnit, scale: info?.scale ?? 1, siUnit: info?.siUnit ?? '' }, offset: 0, source: 'preamble' };
  }
  return { layout, offset: 0, source: 'none' };
}

/** A column named by --time-column: 1-based number or name. */
function pickColumn(wanted: number | string, raw: readonly ColumnLayout[], data: readonly number[], file: string): number {
  if (typeof wanted === 'number' && wanted >= 1 && wanted <= raw.length) return wanted - 1;
  const byName = raw.findIndex((c) => c.name.toLowerCase() === String(wanted).trim().toLowerCase());
  if (byName >= 0) return byName;
  throw captureError('unknown-channel', file, {
    problem: `--time-column ${wanted} names no column of this capture`,
    expected: `a column number from 1 to ${raw.length}${raw.some((c) => c.name) ? ` or a name: ${raw.filter((c) => c.name).map((c) => c.name).join(', ')}` : ''}`,
    fix: `give --time-column with the number of the time column, e.g. --time-column ${(data[0] ?? 0) + 1}`,
  });
}

/**
 * A rising frequency column, or dB levels over a rising first column, and no time column: a
 * spectrum export. (A logger's frequency reading beside a time column is a channel like any other.)
 */
function refuseSpectrum(s: Sniffed, raw: readonly ColumnLayout[], kinds: readonly XKind[], data: readonly number[], file: string): void {
  if (data.some((c) => kinds[c] === 'time')) return;
  const freq = data.find((c) => raw[c].siUnit === 'Hz' || FREQUENCY_NAME.test(raw[c].name));
  const db = data.some((c) => raw[c].siUnit === DECIBELS);
  const first = data[0];
  if ((freq !== undefined && rises(s.sampleRows(), freq)) || (db && first !== undefined && rises(s.sampleRows(), first))) {
    throw captureError('spectrum-export', file, {
      line: s.headerLine ?? s.firstDataLine,
      problem: 'this file is a spectrum (a frequency column and levels per frequency), not a waveform over time',
      expected: 'a waveform export: a time or index column and the sampled signal of each channel',
      fix: 'export the waveform (time-domain trace) instead; benchproof computes the spectrum itself',
    });
  }
}

function rises(rows: readonly (readonly number[])[], c: number): boolean {
  if (rows.length < 2) return false;
  for (let r = 1; r < rows.length; r++) if (!(rows[r][c] > rows[r - 1][c])) return false;
  return true;
}

/** Never falls, repeats values, rises overall, and takes many values: a time column printed with too few digits. */
function risesWithRepeats(rows: readonly (readonly number[])[], c: number): boolean {
  if (rows.length < MIN_RISING_ROWS) return false;
  let repeats = 0;
  for (let r = 1; r < rows.length; r++) {
    if (!(rows[r][c] >= rows[r - 1][c])) return false;
    if (rows[r][c] === rows[r - 1][c]) repeats++;
  }
  return repeats > 0 && distinct(rows, c) >= Math.max(3, rows.length / 64);
}

function distinct(rows: readonly (readonly number[])[], c: number): number {
  return new Set(rows.map((r) => r[c]).filter((v) => Number.isFinite(v))).size;
}

function countsByOne(rows: readonly (readonly number[])[], c: number): boolean {
  return rows.length >= 2 && rows.every((row, r) => Number.isInteger(row[c]) && (r === 0 || row[c] - rows[r - 1][c] === 1));
}

function uniqueNames(columns: readonly ColumnLayout[]): ColumnLayout[] {
  const seen = new Map<string, number>();
  return columns.map((c) => {
    const n = (seen.get(c.name) ?? 0) + 1;
    seen.set(c.name, n);
    return n === 1 ? c : { ...c, name: `${c.name} (${n})` };
  });
}
