/**
 * The rows between the preamble and the data: none, a row of names, a row of units alone
 * (`(ms)	(V)	(V)`), or names over units (`Time,CH1` / `Second,Volt`). Each way of reading the rows
 * just above the data is a candidate; each is scored by what it explains (a name for each data
 * column, a unit for each, one point per column-wise pair), and the best is kept; of candidates
 * that give the same columns, the one that reads more rows. --header-rows overrides the choice.
 *
 * A names row may run past the data columns (`X,CH1,Start,Increment`): its extra cells name the
 * value under them in the row below (`Sequence,Volt,-0.0012,2e-6`), a column-wise preamble.
 */
import type { DecimalMark, Delimiter } from '../types/index.js';
import { splitFields } from './fields.js';
import type { SampleLine } from './lines.js';
import { NUMBER, parseNumberText, TEXT } from './scanNumber.js';
import { parseHeaderCell, parseUnitCell } from './siUnits.js';

/** Unit-row words that mark a sample-index column (`Sequence`, `Index`, `Points`). */
export const INDEX_UNIT = /^(sequence|index|idx|points?|samples?|no\.?|#|n|pt)$/i;

export interface HeaderReading {
  /** Lines read as header rows, top to bottom. */
  readonly lines: readonly number[];
  readonly namesLine: number | null;
  readonly unitsLine: number | null;
  /** Per column: the names-row cell, or null without a names row. */
  readonly names: readonly string[] | null;
  /** Per column: the units-row cell as written (brackets dropped), '' when blank, or null without a units row. */
  readonly units: readonly string[] | null;
  /** Name–value pairs from cells of the names row beyond the data columns. */
  readonly pairs: readonly (readonly [string, string])[];
  readonly score: number;
  /** Every reading weighed, in words with its score (the chosen one included). */
  readonly weighed?: readonly { readonly what: string; readonly score: number }[];
}

export interface HeaderContext {
  readonly delimiter: Delimiter;
  readonly decimalMark: DecimalMark;
  readonly columns: number;
  /** Columns that hold data (the others are empty in the data rows). */
  readonly dataColumns: readonly number[];
  /** Exactly this many header rows (--header-rows), or undefined to choose. */
  readonly forced?: number;
}

/** The header rows just above `start` (the index of the first data line in `lines`). */
export function readHeaderRows(lines: readonly SampleLine[], start: number, ctx: HeaderContext): HeaderReading {
  const above = (k: number): { line: number; cells: string[] } | null => {
    const at = start - k;
    if (at < 0) return null;
    const cells = splitFields(lines[at].text.replace(/^\s*#\s*/, ''), ctx.delimiter).fields;
    while (cells.length > ctx.columns && cells[cells.length - 1] === '') cells.pop();
    return { line: lines[at].line, cells };
  };
  const r1 = above(1);
  const r2 = above(2);
  const none: HeaderReading = { lines: [], namesLine: null, unitsLine: null, names: null, units: null, pairs: [], score: 0 };
  if (ctx.forced !== undefined) return forcedReading(ctx.forced, r1, r2, ctx, none);
  const candidates: HeaderReading[] = [none];
  // A names row may name more columns than the data holds (a channel switched off) when no cell
  // starts like a value (`20.00uS`, `0.5`): then it is no `key,value` line.
  const allText = r1 !== null && r1.cells.every((f) => !/^[+-]?[\d.,]/.test(f));
  if (r1 && isNamesRow(r1.cells, ctx, allText)) candidates.push(reading(r1, null, ctx));
  if (r1 && isUnitsRow(r1.cells, ctx, false, true)) candidates.push(reading(null, r1, ctx));
  // Names over units may run past the data columns together (a column-wise preamble).
  const extra = r1 !== null && r2 !== null && r2.cells.length > ctx.columns && r1.cells.length === r2.cells.length;
  if (r1 && r2 && isUnitsRow(r1.cells, ctx, extra) && isNamesRow(r2.cells, ctx, extra)) candidates.push(reading(r2, r1, ctx));
  // A names row reads its unit cells as units too, so readings that score the same give the same
  // columns; the one that reads more rows explains more of the file.
  const best = candidates.reduce((a, b) => (b.score > a.score || (b.score === a.score && b.lines.length > a.lines.length) ? b : a));
  return { ...best, weighed: candidates.map((c) => ({ what: describeHeader(c), score: c.score })) };
}

function forcedReading(n: number, r1: Row | null, r2: Row | null, ctx: HeaderContext, none: HeaderReading): HeaderReading {
  if (n === 0 || !r1) return none;
  if (n === 1) return isUnitsRow(r1.cells, ctx, true) && !hasNames(r1.cells, ctx) ? reading(null, r1, ctx) : reading(r1, null, ctx);
  return r2 ? reading(r2, r1, ctx) : reading(r1, null, ctx);
}

type Row = { line: number; cells: string[] };

function reading(names: Row | null, units: Row | null, ctx: HeaderContext): HeaderReading {
  const perColumn = (cells: string[]): string[] => Array.from({ length: ctx.columns }, (_, c) => cells[c] ?? '');
  const unitCells = units ? perColumn(units.cells).map((u) => (u === '' ? '' : parseUnitCell(u) ?? u)) : null;
  const nameCells = names ? perColumn(names.cells) : null;
  const pairs: [string, string][] = [];
  if (names && units) {
    for (let c = ctx.columns; c < names.cells.length; c++) {
      if (names.cells[c] !== '' && (units.cells[c] ?? '') !== '') pairs.push([names.cells[c], units.cells[c]]);
    }
  }
  const r: HeaderReading = {
    lines: [names, units].filter((x): x is Row => x !== null).map((x) => x.line).sort((a, b) => a - b),
    namesLine: names?.line ?? null,
    unitsLine: units?.line ?? null,
    names: nameCells,
    units: unitCells,
    pairs,
    score: 0,
  };
  return { ...r, score: score(r, ctx) };
}

/** Two points per data column with a unit, one per data column with a name, one per column-wise pair. */
function score(r: HeaderReading, ctx: HeaderContext): number {
  let s = r.pairs.length;
  for (const c of ctx.dataColumns) {
    const cell = r.names ? parseHeaderCell(r.names[c]) : { name: '', unit: '' };
    if (cell.name !== '') s += 1;
    if (cell.unit !== '' || (r.units && r.units[c] !== '')) s += 2;
  }
  return s;
}

export function describeHeader(c: HeaderReading): string {
  if (c.namesLine !== null && c.unitsLine !== null) return `names on line ${c.namesLine}, units on line ${c.unitsLine}`;
  if (c.namesLine !== null) return `names on line ${c.namesLine}`;
  if (c.unitsLine !== null) return `units alone on line ${c.unitsLine}`;
  return 'no header row';
}

function dataCells(cells: readonly string[], ctx: HeaderContext): string[] {
  return ctx.dataColumns.map((c) => cells[c] ?? '');
}

/**
 * One cell per column (more only with `extra`), text (no numbers) in the data columns, at least one
 * not blank.
 */
function isNamesRow(cells: readonly string[], ctx: HeaderContext, extra: boolean): boolean {
  if (extra ? cells.length < ctx.columns : cells.length !== ctx.columns) return false;
  const data = dataCells(cells, ctx);
  const kinds = data.map((f) => parseNumberText(f, ctx.decimalMark).kind);
  return !kinds.includes(NUMBER) && kinds.includes(TEXT) && !data.some(isPreambleCell);
}

/**
 * A cell no header holds: a value (`50 kS/s`, `2e-5`), a key with its value (`Sample interval: 2e-5`),
 * or a key waiting for one (`unit:`). Such a row is a preamble line.
 */
function isPreambleCell(cell: string): boolean {
  return /^[+-]?[\d.,]/.test(cell) || /[:=]\s*$/.test(cell) || /^[^:=]*\w\s*[:=]\s*\S/.test(cell);
}

function hasNames(cells: readonly string[], ctx: HeaderContext): boolean {
  return dataCells(cells, ctx).some((f) => f !== '' && parseHeaderCell(f).name !== '');
}

/**
 * A names-like row whose non-blank data cells are all units or sample-index words. Alone (with no
 * names row above it) a single letter (`A`, `V`, `s`) reads as a name as well as a unit, so a units
 * row alone needs its units in brackets or longer than one letter.
 */
function isUnitsRow(cells: readonly string[], ctx: HeaderContext, extra: boolean, alone = false): boolean {
  if (!isNamesRow(cells, ctx, extra)) return false;
  return dataCells(cells, ctx).every((f) => f === '' || ((parseUnitCell(f) !== null || INDEX_UNIT.test(f.replace(/^[([{]\s*|\s*[)\]}]$/g, ''))) && !(alone && /^\w$/.test(f))));
}
