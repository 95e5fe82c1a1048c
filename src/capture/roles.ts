/**
 * What each column is: the time column, a sample-index column, or a channel. With a header the
 * names and units decide (`Time (s)`, `t[ms]`, `Index`); without one, a first column that rises on
 * every sniffed row is the x column (a sample index when it counts up by exactly one), because a
 * sampled signal does not rise monotonically over hundreds of rows.
 */
import type { ColumnLayout } from '../types/index.js';
import { captureError } from './errors.js';
import type { Sniffed } from './sniff.js';
import { columnLayout } from './units.js';

export interface ColumnRoles {
  readonly columns: readonly ColumnLayout[];
  readonly timeColumn: number | null;
  readonly indexColumn: number | null;
  /** Indices of the channel columns, in file order. */
  readonly channelColumns: readonly number[];
}

const TIME_NAME = /^(time|t|x|sec|seconds?|timestamp|zeit|tiempo|temps|horizontal)\b/i;
const INDEX_NAME = /^(index|idx|sample|samples|sample\s*(no\.?|number|#)|n|no\.?|nr\.?|#|point|points|pt)$/i;

export function columnRoles(s: Sniffed, verticalUnit: string | undefined, file: string): ColumnRoles {
  const cells = s.headerCells;
  const raw = Array.from({ length: s.columnCount }, (_, c) => columnLayout(cells ? cells[c] : null, '', verticalUnit ?? ''));
  let time: number | null = null;
  let index: number | null = null;
  if (cells) {
    const t = raw.findIndex((c) => TIME_NAME.test(c.name) || c.siUnit === 's');
    const i = raw.findIndex((c) => INDEX_NAME.test(c.name.trim()));
    if (t >= 0) time = t;
    else if (i >= 0) index = i;
  } else if (s.columnCount >= 2 && rises(s.sampleRows())) {
    if (countsByOne(s.sampleRows())) index = 0;
    else time = 0;
  }
  const x = time ?? index;
  const channelColumns = raw.map((_, c) => c).filter((c) => c !== x);
  if (channelColumns.length === 0) {
    throw captureError('no-channels', file, {
      line: s.headerLine ?? s.firstDataLine,
      problem: 'the capture has a time column but no channel columns',
      expected: 'a time (or index) column followed by one or more channel columns',
      fix: 'export the capture again with the channel data included',
    });
  }
  const columns = raw.map((c, k) => named(c, k, x, time, channelColumns, s.headerCells !== null));
  return { columns: uniqueNames(columns), timeColumn: time, indexColumn: index, channelColumns };
}

function named(c: ColumnLayout, k: number, x: number | null, time: number | null, channels: readonly number[], header: boolean): ColumnLayout {
  if (k === x) {
    const isTime = k === time;
    const name = header && c.name !== '' ? c.name : isTime ? 'time' : 'index';
    // A time column without a unit is taken to be in seconds.
    return isTime ? { name, unit: c.siUnit === 's' ? c.unit : '', scale: c.siUnit === 's' ? c.scale : 1, siUnit: 's' } : { name, unit: '', scale: 1, siUnit: '' };
  }
  return { ...c, name: c.name !== '' ? c.name : `ch${channels.indexOf(k) + 1}` };
}

function rises(rows: readonly (readonly number[])[]): boolean {
  if (rows.length < 2) return false;
  for (let r = 1; r < rows.length; r++) if (!(rows[r][0] > rows[r - 1][0])) return false;
  return true;
}

function countsByOne(rows: readonly (readonly number[])[]): boolean {
  return rows.every((row, r) => Number.isInteger(row[0]) && (r === 0 || row[0] - rows[r - 1][0] === 1));
}

function uniqueNames(columns: readonly ColumnLayout[]): ColumnLayout[] {
  const seen = new Map<string, number>();
  return columns.map((c) => {
    const n = (seen.get(c.name) ?? 0) + 1;
    seen.set(c.name, n);
    return n === 1 ? c : { ...c, name: `${c.name} (${n})` };
  });
}
