/**
 * Sniffs a capture's layout from its first 64 KiB: delimiter and decimal mark, where the data rows
 * start, the header row and the `key,value` preamble before it.
 *
 * Rule: every (delimiter, decimal mark) pair is tried; the data block starts at the first run of at
 * least three rows (fewer if the sample has no longer run) that are all numbers with the same field
 * count. The pair that reads the most data rows wins. Pairs that read different numbers from the
 * same rows (`0,5` is two integers or one decimal) are told apart only by a header row that splits
 * into as many fields; otherwise the layout is ambiguous and the user is asked to say it.
 */
import type { DecimalMark, Delimiter } from '../types/index.js';
import { captureError, EXPECTED_CSV } from './errors.js';
import { splitFields } from './fields.js';
import type { SampleLine, SampleLines } from './lines.js';
import { describeHeader, readHeaderRows } from './headerRows.js';
import { NUMBER, parseNumberText, TEXT } from './scanNumber.js';

export const MAX_COLUMNS = 1024;
const CHOOSE_LINES = 400;
// A comma for both only reads quoted fields ("0,5","1,25"); unquoted it reads like [',', '.'].
const PAIRS: readonly (readonly [Delimiter, DecimalMark])[] = [
  [',', '.'], [';', '.'], [';', ','], ['\t', '.'], ['\t', ','], [' ', '.'], [' ', ','], [',', ','],
];

export interface Sniffed {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  /** 'complex' when quoted fields hold delimiters or quotes: then papaparse reads the data. */
  readonly quotes: 'none' | 'simple' | 'complex';
  readonly columnCount: number;
  /** Every data row ends with one extra delimiter. */
  readonly trailingDelimiter: boolean;
  /** The first header row (names, or units alone), null when the data has none. */
  readonly headerLine: number | null;
  /** Per column, the names-row cell; null without a names row. */
  readonly headerCells: readonly string[] | null;
  /** Per column, the units-row cell ('' when blank); null without a units row. */
  readonly unitCells: readonly string[] | null;
  readonly unitsLine: number | null;
  /** Lines read as header rows. */
  readonly headerLines: readonly number[];
  readonly preamble: readonly (readonly [string, string])[];
  /** Lines of the preamble (key–value lines above the header). */
  readonly preambleLines: readonly number[];
  /** Data rows whose empty columns carry preamble entries (`Record Length,2500,,0.0012,0.04`). */
  readonly sharedLines: readonly number[];
  /** Columns that hold no numbers in the data rows: never channels, never read. */
  readonly ignoredColumns: readonly number[];
  readonly firstDataLine: number;
  /** Byte offset of the first data row in the sample. */
  readonly dataOffset: number;
  /** Lines dropped by --skip-rows. */
  readonly skippedLines: number;
  /** The readings weighed, in words, with their scores and the one chosen (for `inspect`). */
  readonly weighed: readonly { readonly what: string; readonly score: number; readonly chosen: boolean }[];
  /**
   * Numbers of the sniffed data rows (file units; NaN for an empty or text cell), for telling a
   * time column from data. Read on first call and kept: reading some 4 000 fields as text is a
   * fair share of a file's fixed cost.
   */
  readonly sampleRows: () => readonly (readonly number[])[];
  /** Per column: every number of the sniffed data rows is written without decimals (`-12`, `140`). */
  readonly integerWritten: () => readonly boolean[];
}

/** What the user said about the layout (--delimiter, --decimal, --skip-rows, --header-rows). */
export interface LayoutHints {
  readonly delimiter?: Delimiter;
  readonly decimalMark?: DecimalMark;
  readonly skipRows?: number;
  readonly headerRows?: number;
}

interface Reading {
  readonly pair: readonly [Delimiter, DecimalMark];
  readonly start: number;
  readonly columns: number;
  readonly score: number;
  readonly signature: string;
}

export function sniffLayout(s: SampleLines, file: string, hints: LayoutHints = {}): Sniffed {
  const skip = hints.skipRows ?? 0;
  const lines = skip > 0 ? s.lines.filter((l) => l.line > skip) : s.lines;
  if (lines.length === 0) throw noData(file, s.lines.length === 0 ? 'empty' : 'no-numeric-data', (s.lines.at(-1)?.line ?? 0) + 1, s.wholeFile);
  const pairs = PAIRS.filter(([d, m]) => (hints.delimiter ?? d) === d && (hints.decimalMark ?? m) === m);
  if (pairs.length === 0) pairs.push([hints.delimiter!, hints.decimalMark!]);
  // The layout is chosen on the first lines (enough for a preamble and a block of data); the
  // whole 64 KiB is used only when they hold no data.
  const first = lines.slice(0, CHOOSE_LINES);
  let readings = readAll(first, pairs);
  if (readings.length === 0 && lines.length > first.length) readings = readAll(lines, pairs);
  if (readings.length === 0) throw noData(file, headerOnly(lines, s.wholeFile) ? 'header-only' : 'no-numeric-data', lines[lines.length - 1].line + 1, s.wholeFile);
  const chosen = choose(readings, lines, file);
  const [delimiter, decimalMark] = chosen.pair;
  if (chosen.columns > MAX_COLUMNS) throw tooManyColumns(file, lines[chosen.start].line, chosen.columns);
  const split = lines.slice(chosen.start).map((l) => splitFields(l.text, delimiter));
  const dataSplit = split.filter((x) => x.fields.length === chosen.columns);
  const trailing = delimiter !== ' ' && chosen.columns > 1 && dataSplit.every((x) => x.fields[chosen.columns - 1] === '');
  const columns = trailing ? chosen.columns - 1 : chosen.columns;
  const kinds = dataSplit.slice(0, 200).map((x) => x.fields.slice(0, columns).map((f) => parseNumberText(f, decimalMark).kind));
  const ignored = Array.from({ length: columns }, (_, c) => c).filter((c) => !kinds.some((k) => k[c] === NUMBER));
  const dataColumns = Array.from({ length: columns }, (_, c) => c).filter((c) => !ignored.includes(c));
  const start = sharedStart(lines, chosen.start, { delimiter, decimalMark, columns: chosen.columns, dataColumns });
  const header = readHeaderRows(lines, start, { delimiter, decimalMark, columns, dataColumns, ...(hints.headerRows !== undefined ? { forced: hints.headerRows } : {}) });
  const preambleEnd = start - header.lines.length;
  const shared = lines.slice(start, chosen.start);
  const preamble = [
    ...lines.slice(0, preambleEnd).map((l) => keyValue(l.text, delimiter)),
    ...header.pairs,
    ...shared.map((l) => sideEntry(splitFields(l.text, delimiter).fields, ignored)).filter((e): e is readonly [string, string] => e !== null),
  ];
  // The sample rows' numbers and print resolutions are read once, for whichever is asked first.
  let parsed: ParsedSample | undefined;
  const sample = (): ParsedSample => (parsed ??= parseSample(dataSplit.slice(0, 2000).map((x) => x.fields.slice(0, columns)), columns, decimalMark));
  return {
    delimiter,
    decimalMark,
    quotes: split.some((x) => x.complexQuotes) ? 'complex' : split.some((x) => x.quoted) ? 'simple' : 'none',
    columnCount: columns,
    trailingDelimiter: trailing,
    headerLine: header.lines[0] ?? null,
    headerCells: header.names,
    unitCells: header.units,
    unitsLine: header.unitsLine,
    headerLines: header.lines,
    preamble,
    preambleLines: lines.slice(0, preambleEnd).map((l) => l.line),
    sharedLines: shared.map((l) => l.line),
    ignoredColumns: ignored,
    firstDataLine: lines[start].line,
    dataOffset: lines[start].start,
    skippedLines: skip,
    weighed: [
      // Pairs that read the same numbers (one column has no delimiter to tell) count as one reading.
      ...readings
        .filter((r) => r === chosen || (r.signature !== chosen.signature && readings.find((q) => q.signature === r.signature) === r))
        .map((r) => ({ what: `${describe(r)}, data from line ${lines[r === chosen ? start : r.start].line} (${r.score} of ${Math.min(lines.length, CHOOSE_LINES)} lines)`, score: r.score, chosen: r === chosen })),
      ...(header.weighed ?? []).map((w) => ({ what: `header: ${w.what} (${w.score} points)`, score: w.score, chosen: w.what === describeHeader(header) })),
    ],
    sampleRows: () => sample().rows,
    integerWritten: () => sample().integers,
  };
}

/**
 * Rows just above the data block that hold numbers in every data column and text only in columns
 * that are empty in the data: the data started there, with preamble entries beside it.
 */
function sharedStart(lines: readonly SampleLine[], start: number, ctx: { delimiter: Delimiter; decimalMark: DecimalMark; columns: number; dataColumns: readonly number[] }): number {
  if (ctx.dataColumns.length === 0) return start;
  let at = start;
  while (at > 0) {
    const fields = splitFields(lines[at - 1].text, ctx.delimiter).fields;
    if (fields.length !== ctx.columns) break;
    if (!ctx.dataColumns.every((c) => parseNumberText(fields[c], ctx.decimalMark).kind === NUMBER)) break;
    at--;
  }
  return at;
}

/** The cells of a shared row outside the data columns as (key, value): the first non-empty cell is the key. */
function sideEntry(fields: readonly string[], ignored: readonly number[]): readonly [string, string] | null {
  const cells = ignored.map((c) => fields[c] ?? '').filter((f) => f !== '');
  return cells.length === 0 ? null : [cells[0], cells.slice(1).join(' ')];
}

interface ParsedSample {
  /** The numbers of each sample row (NaN where a field is not one). */
  readonly rows: number[][];
  /** Per column: every number in it written without a fractional digit (an integer code). */
  readonly integers: boolean[];
}

function parseSample(rows: readonly string[][], columns: number, decimalMark: DecimalMark): ParsedSample {
  const integers = new Array<boolean>(columns).fill(true);
  const values = rows.map((r) =>
    r.map((f, c) => {
      const p = parseNumberText(f, decimalMark);
      if (p.kind === NUMBER && p.quantumExp < 0) integers[c] = false;
      return p.value;
    }),
  );
  return { rows: values, integers };
}

/** Every pair's reading; the lines are split once per delimiter, as two pairs share each one. */
function readAll(lines: readonly SampleLine[], pairs: readonly (readonly [Delimiter, DecimalMark])[]): Reading[] {
  const splits = new Map<Delimiter, string[][]>();
  const fieldsBy = (d: Delimiter): string[][] => splits.get(d) ?? splits.set(d, lines.map((l) => splitFields(l.text, d).fields)).get(d)!;
  return pairs.map((pair) => readAs(lines, pair, fieldsBy(pair[0]))).filter((r): r is Reading => r !== null);
}

function readAs(lines: readonly SampleLine[], pair: readonly [Delimiter, DecimalMark], split: readonly (readonly string[])[]): Reading | null {
  const counts = split.map((fields) => {
    const kinds = fields.map((f) => parseNumberText(f, pair[1]).kind);
    return kinds.includes(TEXT) || !kinds.includes(NUMBER) ? 0 : fields.length;
  });
  const runs: { start: number; len: number }[] = [];
  for (let i = 0; i < counts.length; i++) {
    if (counts[i] === 0) continue;
    if (i > 0 && counts[i] === counts[i - 1] && runs.length > 0) runs[runs.length - 1].len++;
    else runs.push({ start: i, len: 1 });
  }
  if (runs.length === 0) return null;
  const longest = Math.max(...runs.map((r) => r.len));
  const first = runs.find((r) => r.len >= Math.min(3, longest))!;
  const columns = counts[first.start];
  const score = counts.slice(first.start).filter((c) => c === columns).length;
  // What the reading makes of the rows: their numbers, a trailing empty field (a delimiter that ends
  // each row) left out, so that tabs and the runs of blanks around them read alike.
  const signature = split
    .slice(first.start, first.start + 3)
    .map((fields) => (fields.length > 1 && fields[fields.length - 1] === '' ? fields.slice(0, -1) : fields).map((f) => parseNumberText(f, pair[1]).value).join('|'))
    .join('/');
  return { pair, start: first.start, columns, score, signature: `${first.start}:${signature}` };
}

function choose(readings: readonly Reading[], lines: readonly SampleLine[], file: string): Reading {
  const best = Math.max(...readings.map((r) => r.score));
  const top = readings.filter((r) => r.score === best);
  const groups = [...new Set(top.map((r) => r.signature))].map((sig) => top.filter((r) => r.signature === sig));
  let pick = groups;
  if (groups.length > 1) {
    pick = groups.filter(([r]) => r.columns >= 2 && r.start > 0 && splitFields(lines[r.start - 1].text, r.pair[0]).fields.length === r.columns);
  }
  if (pick.length !== 1) {
    const r = top[0];
    throw captureError('ambiguous-layout', file, {
      line: lines[r.start].line,
      problem: `the rows can be read in ${groups.length} ways (e.g. "${lines[r.start].text.slice(0, 40)}" as ${groups.map(([g]) => describe(g)).join(' or as ')})`,
      expected: 'a delimiter that cannot be a decimal mark: "1,5;2,5" (semicolon) or "1.5,2.5" (comma), or a header row naming each column',
      fix: 'say how the file is written: --delimiter comma --decimal point (or --delimiter semicolon --decimal comma), or put it in a reading profile',
    });
  }
  // Within one reading, prefer the delimiter that actually occurs in the data (a tab over spaces).
  const group = pick[0];
  const firstRow = lines[group[0].start].text;
  return group.find((r) => r.pair[0] !== ' ' && firstRow.includes(r.pair[0])) ?? group[0];
}

function describe(r: Reading): string {
  const d = r.pair[0] === '\t' ? 'tab' : r.pair[0] === ' ' ? 'space' : `"${r.pair[0]}"`;
  return `${r.columns} column(s), ${d} between fields, decimal "${r.pair[1]}"`;
}

/**
 * A preamble line as (key, value): split by the delimiter, else at `:` or `=`; leading `#` dropped.
 * With spaces as the delimiter the key may hold spaces: the value starts at the first number, or
 * is the last word.
 */
function keyValue(line: string, delimiter: Delimiter): readonly [string, string] {
  const text = line.replace(/^\s*[#%]+\s*/, '');
  const colon = /^([^:=]+?)\s*[:=]\s*(.*)$/.exec(text);
  if (delimiter === ' ') {
    if (colon) return [colon[1], colon[2]];
    const words = text.trim().split(/\s+/);
    const at = words.findIndex((w, i) => i > 0 && /^[+-]?[\d.,]/.test(w));
    const cut = at > 0 ? at : Math.max(1, words.length - 1);
    return [words.slice(0, cut).join(' '), words.slice(cut).join(' ')];
  }
  const fields = splitFields(text, delimiter).fields;
  while (fields.length > 1 && fields[fields.length - 1] === '') fields.pop();
  if (fields.length > 1) return [fields[0], fields.slice(1).join(delimiter).trim()];
  return colon ? [colon[1], colon[2]] : [text.trim(), ''];
}

/** Whole file read, and its last line splits into named fields like a header (not `key: value`). */
function headerOnly(lines: readonly SampleLine[], wholeFile: boolean): boolean {
  if (!wholeFile) return false;
  const last = lines[lines.length - 1].text;
  if (/^[^,;\t]*[:=]/.test(last)) return false;
  return PAIRS.some(([d]) => d !== ' ' && splitFields(last, d).fields.filter((f) => f !== '').length >= 2);
}

function noData(file: string, code: 'empty' | 'header-only' | 'no-numeric-data', line: number, wholeFile: boolean) {
  const where = wholeFile ? 'the file' : `the first ${64} KiB`;
  const problem =
    code === 'empty' ? 'the file is empty (no text at all)'
    : code === 'header-only' ? 'the file has a header but no data rows'
    : `${where} holds no rows of numbers`;
  return captureError(code, file, {
    ...(code === 'empty' ? {} : { line }),
    problem,
    expected: EXPECTED_CSV,
    fix: code === 'empty' ? 'export the capture again; the file was saved without content' : 'check that the export included the samples (some instruments save only the settings)',
  });
}

function tooManyColumns(file: string, line: number, n: number) {
  return captureError('too-many-columns', file, {
    line,
    problem: `the data rows have ${n} columns, more than the ${MAX_COLUMNS} a capture may have`,
    expected: `a time or index column and at most ${MAX_COLUMNS - 1} channels`,
    fix: 'export the capture with one column per channel, not one column per sample',
  });
}
