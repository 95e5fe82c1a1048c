/**
 * A table for the terminal that fits its width: aligned columns when the widest row fits, otherwise
 * one block per row — the first cells and the row's trailer on the first line, each further cell named
 * by its column head on the lines below, wrapped with quantities kept whole. Colour codes never count.
 */
import { glued, visibleWidth, wrap } from './wrapText.js';

export interface TableText {
  readonly head: readonly string[];
  readonly rows: readonly (readonly string[])[];
  /** Text after each row's cells (a statement word), shown plain in both layouts. */
  readonly trailers?: readonly string[];
  /** Head of the trailer column in the aligned layout. */
  readonly trailerHead?: string;
  /** How many leading cells stay on a row's first line in the stacked layout (default 2). */
  readonly leading?: number;
}

/** A short cell (a quantity, limits) is never split; a long one (a note) may wrap. */
const keepWhole = (c: string): string => ([...c].length <= 32 ? glued(c) : c);

/** The table's lines, each starting with `indent`, at most `width` columns wide; `dimHead` styles the head line. */
export function fitTable(t: TableText, width: number, indent = '  ', dimHead: (s: string) => string = (s) => s): string[] {
  const widths = t.head.map((h, i) => Math.max(visibleWidth(h), ...t.rows.map((r) => visibleWidth(r[i] ?? ''))));
  const pad = (cells: readonly string[]): string => cells.map((s, i) => s + ' '.repeat(Math.max(0, widths[i] - visibleWidth(s)))).join('  ');
  const trailerWidth = Math.max(visibleWidth(t.trailerHead ?? ''), ...(t.trailers ?? []).map(visibleWidth));
  const full = visibleWidth(indent) + widths.reduce((s, w) => s + w + 2, 0) + (t.trailers ? trailerWidth : -2);
  if (full <= width) {
    const head = `${indent}${dimHead(`${pad(t.head)}${t.trailers ? `  ${t.trailerHead ?? ''}` : ''}`.trimEnd())}`;
    return [head, ...t.rows.map((r, i) => `${indent}${pad(r)}${t.trailers ? `  ${t.trailers[i]}` : ''}`.trimEnd())];
  }
  const lead = t.leading ?? 2;
  // The head of the first line stays, so what a ± stands for is still said.
  const out: string[] = wrap([...t.head.slice(0, lead), t.trailerHead ?? ''].filter((h) => h).join('  '), width, indent).map(dimHead);
  t.rows.forEach((r, i) => {
    const first = [...r.slice(0, lead).filter((c) => c && c !== '—').map((c, j) => (j === 0 ? c : keepWhole(c))), t.trailers?.[i] ?? ''].filter((c) => c).join('  ');
    out.push(...wrap(first, width, indent, `${indent}    `));
    const rest = r
      .slice(lead)
      .map((c, j) => (c && c !== '—' ? `${t.head[lead + j]} ${keepWhole(c)}` : ''))
      .filter((c) => c);
    if (rest.length) out.push(...wrap(rest.join('; '), width, `${indent}    `, `${indent}      `));
  });
  return out;
}
