/**
 * Writes synthetic captures as CSV text in every layout the capture reader understands, for tests,
 * the demo and the benchmark. `writeCsvChunks` yields the text in pieces so that files of millions
 * of rows are written without one giant string; `writeCsv` joins them for small captures.
 *
 * Values are given in SI units (V, A, s) and converted to the written unit (mV → ×1000).
 * Number formats: 'exponential' prints like C's `%.*e` (mantissa, `e`, sign, at least two exponent
 * digits), 'fixed' like `%.*f`, 'shortest' the shortest text that reads back to the same double.
 */
import type { SynthSignal } from './waveform.js';

export interface CsvChannel {
  readonly name: string;
  /** Unit to write the values in (`V`, `mV`, `µV`, `A`, `mA`); none when absent. */
  readonly unit?: string;
  readonly signal: SynthSignal;
}

export type CsvNumberFormat = 'exponential' | 'fixed' | 'shortest';

export interface CsvLayoutOptions {
  readonly delimiter?: ',' | ';' | '\t' | ' ';
  /** Spaces between fields when the delimiter is ' ' (default 3). */
  readonly spaceRun?: number;
  readonly decimalMark?: '.' | ',';
  /** Write a header row (default true). */
  readonly header?: boolean;
  /** How units appear in the header: `Time (s)`, `t[ms]`, or `time_s` (default 'parens'). */
  readonly unitStyle?: 'parens' | 'brackets' | 'suffix' | 'none';
  /** First column: time, a sample index, or nothing (default 'time'). */
  readonly xColumn?: 'time' | 'index' | 'none';
  readonly timeName?: string;
  /** Unit of the time column (`s`, `ms`, `us`, `µs`, `ns`; default 's'). */
  readonly timeUnit?: string;
  /** First value of an index column (default 0). */
  readonly indexStart?: number;
  /** `key,value` lines before the data; 'auto' writes interval, unit, length and start time. */
  readonly preamble?: 'auto' | readonly (readonly [string, string])[];
  readonly lineEnding?: 'lf' | 'crlf';
  readonly bom?: boolean;
  /** One line written after the data. */
  readonly footer?: string;
  readonly format?: CsvNumberFormat;
  /** Significant digits for 'exponential', decimals for 'fixed' (default 9 / 6). */
  readonly precision?: number;
  readonly upperCaseExponent?: boolean;
  /** Wrap every field in double quotes. */
  readonly quote?: boolean;
  /** End every row with a delimiter, as some exporters do. */
  readonly trailingDelimiter?: boolean;
  /** Write only these sample indices (ascending): a non-uniform time column, like a simulator's. */
  readonly sampleIndices?: ArrayLike<number>;
  /** Replace single samples with a token (e.g. '', 'NaN', '9.9E37'); row is 0-based in the written rows. */
  readonly replace?: readonly { readonly row: number; readonly channel: number; readonly text: string }[];
  /** Rows per yielded chunk (default 65 536). */
  readonly rowsPerChunk?: number;
  /** A second header row of units alone: `Second,Volt` ('words') or `(s),(V)` ('brackets'); names above carry none. */
  readonly unitRow?: 'words' | 'brackets';
  /** Write the preamble beside the data: `key,value,` in the first columns of the first rows, empty there after. */
  readonly preambleBeside?: boolean;
  /** Decimals of the time column ('fixed'), fewer than the step needs to print repeated stamps. */
  readonly timeDecimals?: number;
  /** A `+` before every number that is not negative. */
  readonly plusSign?: boolean;
}

const UNIT_SCALE: Readonly<Record<string, number>> = {
  s: 1, ms: 1e-3, us: 1e-6, 'µs': 1e-6, ns: 1e-9,
  V: 1, mV: 1e-3, uV: 1e-6, 'µV': 1e-6, A: 1, mA: 1e-3, uA: 1e-6, 'µA': 1e-6,
};

function scaleOf(unit: string | undefined): number {
  if (unit === undefined || unit === '') return 1;
  const s = UNIT_SCALE[unit];
  if (s === undefined) throw new RangeError(`writeCsv: unknown unit "${unit}"`);
  return s;
}

/** The whole CSV text at once (small captures). */
export function writeCsv(channels: readonly CsvChannel[], layout: CsvLayoutOptions = {}): string {
  let out = '';
  for (const chunk of writeCsvChunks(channels, layout)) out += chunk;
  return out;
}

/** The CSV text in pieces of `rowsPerChunk` rows (benchmark files of millions of rows). */
export function* writeCsvChunks(channels: readonly CsvChannel[], layout: CsvLayoutOptions = {}): Generator<string> {
  const n = checkChannels(channels);
  const { delimiter = ',', decimalMark = '.', header = true, xColumn = 'time', lineEnding = 'lf' } = layout;
  if (delimiter === ',' && decimalMark === ',' && !layout.quote) {
    throw new RangeError('writeCsv: a decimal comma needs ";", tab or spaces between fields, or quoted fields');
  }
  const eol = lineEnding === 'crlf' ? '\r\n' : '\n';
  const sep = delimiter === ' ' ? ' '.repeat(layout.spaceRun ?? 3) : delimiter;
  const cell = (s: string): string => (layout.quote ? `"${s}"` : s);
  const endRow = (layout.trailingDelimiter ? sep : '') + eol;
  const num = numberFormatter(layout);
  let head = layout.bom ? '\uFEFF' : '';
  const pre = preambleLines(channels, layout, num);
  const beside = layout.preambleBeside === true;
  if (!beside) for (const [k, v] of pre) head += `${cell(k)}${sep}${cell(v)}${eol}`;
  const lead = (r: number): string => (beside ? `${cell(pre[r]?.[0] ?? '')}${sep}${cell(pre[r]?.[1] ?? '')}${sep}${sep}` : '');
  if (header) head += lead(-1) + headerCells(channels, layout).map(cell).join(sep) + endRow;
  if (header && layout.unitRow) head += lead(-1) + unitCells(channels, layout).map(cell).join(sep) + endRow;
  yield head;
  const { t0, dt } = channels[0].signal;
  const tScale = scaleOf(layout.timeUnit ?? 's');
  const scales = channels.map((c) => scaleOf(c.unit));
  const replaced = new Map((layout.replace ?? []).map((r) => [`${r.row}:${r.channel}`, r.text]));
  const pick = layout.sampleIndices;
  const rows = pick ? pick.length : n;
  const perChunk = layout.rowsPerChunk ?? 65536;
  const cells: string[] = [];
  for (let from = 0; from < rows; from += perChunk) {
    let text = '';
    for (let r = from; r < Math.min(rows, from + perChunk); r++) {
      const i = pick ? pick[r] : r;
      cells.length = 0;
      if (xColumn === 'time') cells.push(cell(layout.timeDecimals === undefined ? num((t0 + i * dt) / tScale) : fixedTime((t0 + i * dt) / tScale, layout)));
      if (xColumn === 'index') cells.push(cell(String(i + (layout.indexStart ?? 0))));
      for (let c = 0; c < channels.length; c++) {
        cells.push(cell(replaced.get(`${r}:${c}`) ?? num(channels[c].signal.values[i] / scales[c])));
      }
      text += lead(r) + cells.join(sep) + endRow;
    }
    yield text;
  }
  if (layout.footer !== undefined) yield layout.footer + eol;
}

function checkChannels(channels: readonly CsvChannel[]): number {
  if (channels.length === 0) throw new RangeError('writeCsv: no channels');
  const n = channels[0].signal.values.length;
  for (const c of channels) {
    if (c.signal.values.length !== n || c.signal.dt !== channels[0].signal.dt) {
      throw new RangeError(`writeCsv: channel "${c.name}" has ${c.signal.values.length} samples or another interval`);
    }
  }
  return n;
}

function fixedTime(t: number, layout: CsvLayoutOptions): string {
  const s = t.toFixed(layout.timeDecimals);
  const signed = layout.plusSign && !s.startsWith('-') ? `+${s}` : s;
  return layout.decimalMark === ',' ? signed.replace('.', ',') : signed;
}

const UNIT_WORDS: Readonly<Record<string, string>> = { s: 'Second', V: 'Volt', A: 'Ampere' };

function unitCells(channels: readonly CsvChannel[], layout: CsvLayoutOptions): string[] {
  const x = layout.xColumn ?? 'time';
  const units = [...(x === 'time' ? [layout.timeUnit ?? 's'] : x === 'index' ? [''] : []), ...channels.map((c) => c.unit ?? '')];
  const words = layout.unitRow === 'words';
  // A sample index has no unit; its cell says it counts samples (never blank: runs of spaces would lose it).
  const cells = units.map((u) => (u === '' ? (words ? 'Index' : '(#)') : words && UNIT_WORDS[u] ? UNIT_WORDS[u] : `(${u})`));
  return x === 'index' ? cells : cells.map((c, i) => (units[i] === '' ? '' : c));
}

function headerCells(channels: readonly CsvChannel[], layout: CsvLayoutOptions): string[] {
  const style = layout.unitRow ? 'none' : layout.unitStyle ?? 'parens';
  const label = (name: string, unit: string | undefined): string => {
    if (!unit || style === 'none') return name;
    if (style === 'parens') return `${name} (${unit})`;
    if (style === 'brackets') return `${name}[${unit}]`;
    return `${name}_${unit}`;
  };
  const x = layout.xColumn ?? 'time';
  const first = x === 'time' ? [label(layout.timeName ?? 'Time', layout.timeUnit ?? 's')] : x === 'index' ? ['Index'] : [];
  return [...first, ...channels.map((c) => label(c.name, c.unit))];
}

function preambleLines(
  channels: readonly CsvChannel[],
  layout: CsvLayoutOptions,
  num: (v: number) => string,
): readonly (readonly [string, string])[] {
  const p = layout.preamble;
  if (p === undefined) return [];
  if (p !== 'auto') return p;
  const { t0, dt, values } = channels[0].signal;
  return [
    ['sampling interval', num(dt)],
    ['vertical unit', channels[0].unit ?? 'V'],
    ['samples', String(layout.sampleIndices ? layout.sampleIndices.length : values.length)],
    ['first sample time', num(t0)],
  ];
}

function numberFormatter(layout: CsvLayoutOptions): (v: number) => string {
  const { format = 'exponential', decimalMark = '.', upperCaseExponent = false } = layout;
  const precision = layout.precision ?? (format === 'fixed' ? 6 : 9);
  const plus = layout.plusSign === true;
  const withMark = (s: string): string => {
    const signed = plus && !s.startsWith('-') ? `+${s}` : s;
    return decimalMark === ',' ? signed.replace('.', ',') : signed;
  };
  if (format === 'shortest') return (v) => withMark(String(v));
  if (format === 'fixed') return (v) => withMark(v.toFixed(precision));
  const e = upperCaseExponent ? 'E' : 'e';
  return (v) => {
    if (!Number.isFinite(v)) return String(v);
    const [mant, exp] = v.toExponential(Math.max(0, precision - 1)).split('e');
    const sign = exp.startsWith('-') ? '-' : '+';
    const digits = exp.replace(/^[+-]/, '');
    return withMark(`${mant}${e}${sign}${digits.length < 2 ? `0${digits}` : digits}`);
  };
}
