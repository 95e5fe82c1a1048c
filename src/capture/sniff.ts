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
  readonly headerLine: number | null;
  readonly headerCells: readonly string[] | null;
  readonly preamble: readonly (readonly [string, string])[];
  readonly firstDataLine: number;
  /** Byte offset of the first data row in the sample. */
  readonly dataOffset: number;
  /**
   * Numbers of the sniffed data rows (file units), for telling a time column from data. Read on
   * first call and kept: only a capture without a header needs them, and reading some 4 000 fields
   * as text is a fair share of a file's fixed cost.
   */
  readonly sampleRows: () => readonly (readonly number[])[];
}

interface Reading {
  readonly pair: readonly [Delimiter, DecimalMark];
  readonly start: number;
  readonly columns: number;
  readonly score: number;
  readonly signature: string;
}

export function sniffLayout(s: SampleLines, file: string): Sniffed {
  const { lines } = s;
  if (lines.length === 0) throw noData(file, 'empty', 1, s.wholeFile);
  // The layout is chosen on the first lines (enough for a preamble and a block of data); the
  // whole 64 KiB is used only when they hold no data.
  const first = lines.slice(0, CHOOSE_LINES);
  let readings = readAll(first);
  if (readings.length === 0 && lines.length > first.length) readings = readAll(lines);
  if (readings.length === 0) throw noData(file, headerOnly(lines, s.wholeFile) ? 'header-only' : 'no-numeric-data', lines[lines.length - 1].line + 1, s.wholeFile);
  const chosen = choose(readings, lines, file);
  const [delimiter, decimalMark] = chosen.pair;
  if (chosen.columns > MAX_COLUMNS) throw tooManyColumns(file, lines[chosen.start].line, chosen.columns);
  const split = lines.slice(chosen.start).map((l) => splitFields(l.text, delimiter));
  const dataSplit = split.filter((x) => x.fields.length === chosen.columns);
  const trailing = delimiter !== ' ' && chosen.columns > 1 && dataSplit.every((x) => x.fields[chosen.columns - 1] === '');
  const columns = trailing ? chosen.columns - 1 : chosen.columns;
  const header = findHeader(lines, chosen.start, delimiter, decimalMark, columns, trailing);
  const preambleEnd = header ? chosen.start - 1 : chosen.start;
  let rows: number[][] | undefined;
  return {
    delimiter,
    decimalMark,
    quotes: split.some((x) => x.complexQuotes) ? 'complex' : split.some((x) => x.quoted) ? 'simple' : 'none',
    columnCount: columns,
    trailingDelimiter: trailing,
    headerLine: header ? lines[chosen.start - 1].line : null,
    headerCells: header,
    preamble: lines.slice(0, preambleEnd).map((l) => keyValue(l.text, delimiter)),
    firstDataLine: lines[chosen.start].line,
    dataOffset: lines[chosen.start].start,
    sampleRows: () => (rows ??= numericRows(dataSplit.slice(0, 2000).map((x) => x.fields.slice(0, columns)), decimalMark)),
  };
}

function numericRows(rows: readonly string[][], decimalMark: DecimalMark): number[][] {
  const parsed = rows.map((r) => r.map((f) => parseNumberText(f, decimalMark)));
  return parsed.filter((r) => r.every((p) => p.kind !== TEXT)).map((r) => r.map((p) => p.value));
}

/** Every pair's reading; the lines are split once per delimiter, as two pairs share each one. */
function readAll(lines: readonly SampleLine[]): Reading[] {
  const splits = new Map<Delimiter, string[][]>();
  const fieldsBy = (d: Delimiter): string[][] => splits.get(d) ?? splits.set(d, lines.map((l) => splitFields(l.text, d).fields)).get(d)!;
  return PAIRS.map((pair) => readAs(lines, pair, fieldsBy(pair[0]))).filter((r): r is Reading => r !== null);
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
  const signature = split
    .slice(first.start, first.start + 3)
    .map((fields) => fields.map((f) => parseNumberText(f, pair[1]).value).join('|'))
    .join('/');
  return { pair, start: first.start, columns, score, signature: `${first.start}:${columns}:${signature}` };
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
      expected: 'a delimiter that cannot be a decimal mark: "1,5;2,5" (semicolon) or "1.5,2.5" (comma)',
      fix: 'add a header row naming each column, or export with ";" between fields when numbers use a decimal comma',
    });
  }
  // Within one reading, prefer the delimiter that actually occurs in the data (a tab over spaces).
  const group = pick[0];
  const firstRow = lines[group[0].start].text;
  return group.find((r) => r.pair[0] !== ' ' && firstRow.includes(r.pair[0])) ?? group[0];
}

function describe(r: Reading): string {
  const d = r.pair[0] === '\t' ? 'tab' : r.pair[0] === ' ' ? 'space' : `"${r.pair[0]}"`;
  return `${r.columns} column(s) split by ${d} with decimal "${r.pair[1]}"`;
}

function findHeader(
  lines: readonly SampleLine[],
  start: number,
  delimiter: Delimiter,
  decimalMark: DecimalMark,
  columns: number,
  trailing: boolean,
): string[] | null {
  if (start === 0) return null;
  const text = lines[start - 1].text.replace(/^\s*#\s*/, '');
  const fields = splitFields(text, delimiter).fields;
  if (trailing && fields[fields.length - 1] === '') fields.pop();
  if (fields.length !== columns) return null;
  return fields.some((f) => parseNumberText(f, decimalMark).kind === NUMBER) ? null : fields;
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
