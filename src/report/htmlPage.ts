/**
 * The page shell shared by HTML records and batch reports: one self-contained file (styles inline, plots
 * as inline SVG, no scripts, fonts, images or links to fetch), readable on screen and printable on A4 or
 * Letter. Status is always a word; the border colour only adds emphasis.
 */
import type { Statement } from '../types/index.js';
import { STATEMENT_WORDS } from '../types/index.js';
import { esc } from './svgPlot.js';

export { esc };

const STATUS_COLOR: Readonly<Record<Statement, string>> = {
  pass: '#2f7d32',
  'conditional-pass': '#9a7b00',
  'conditional-fail': '#b25b00',
  fail: '#b3261e',
  'not-measured': '#6b4c9a',
};

const CSS = `
:root { color: #1f2933; background: #fff; }
body { font: 14px/1.45 system-ui, -apple-system, "Segoe UI", sans-serif; margin: 0 auto; max-width: 62rem; padding: 1.5rem; }
h1 { font-size: 1.5rem; margin: 0 0 .25rem; }
h2 { font-size: 1.15rem; margin: 1.8rem 0 .5rem; border-bottom: 1px solid #c9d1d8; padding-bottom: .2rem; }
h3 { font-size: 1rem; margin: 1.2rem 0 .4rem; }
dl.facts { display: grid; grid-template-columns: max-content 1fr; gap: .15rem 1rem; margin: .5rem 0; }
dl.facts dt { color: #52606d; }
dl.facts dd { margin: 0; }
table { border-collapse: collapse; width: 100%; margin: .4rem 0 1rem; font-variant-numeric: tabular-nums; }
th, td { text-align: left; padding: .25rem .5rem; border-bottom: 1px solid #e4e7eb; vertical-align: top; }
th { background: #f3f5f7; font-weight: 600; }
td.num { text-align: right; white-space: nowrap; }
table.stats { font-size: .9em; }
table.stats th, table.stats td { padding: .25rem .3rem; }
table.stats tr.stat-notes td { padding-top: 0; }
code, .hash { font-family: ui-monospace, "SF Mono", Menlo, Consolas, monospace; font-size: .85em; word-break: break-all; }
.status { display: inline-block; font-weight: 700; letter-spacing: .03em; padding: .05rem .45rem; border: 2px solid currentColor; border-radius: 3px; }
.status.big { font-size: 1.4rem; padding: .2rem .8rem; }
.note { color: #52606d; font-size: .9em; }
.warning { border-left: 4px solid #b3261e; padding: .3rem .7rem; background: #fbefee; }
figure { margin: .6rem 0 1.2rem; break-inside: avoid; page-break-inside: avoid; }
figcaption { font-size: .9em; color: #52606d; }
svg { max-width: 100%; height: auto; display: block; }
.plots { display: flex; flex-wrap: wrap; gap: .5rem 1.5rem; }
.plots figure { flex: 1 1 26rem; }
footer { margin-top: 2rem; font-size: .85em; color: #52606d; border-top: 1px solid #c9d1d8; padding-top: .5rem; }
@media print {
  @page { size: auto; margin: 14mm 12mm; }
  body { max-width: none; padding: 0; font-size: 10.5pt; }
  h2 { break-after: avoid; page-break-after: avoid; }
  table, tr, figure, section.condition { break-inside: avoid; page-break-inside: avoid; }
  th { background: none; border-bottom: 1.5px solid #1f2933; }
  /* A wide table of numbers prints on landscape pages of the chosen paper (a named page), the rest upright. */
  @page wide { size: landscape; }
  .wide-print { page: wide; }
  table.stats { font-size: 8.5pt; break-inside: auto; page-break-inside: auto; }
  table.stats th, table.stats td { padding: .15rem .25rem; }
  .plots figure { flex: 1 1 45%; }
  .warning { background: none; }
  a { color: inherit; text-decoration: none; }
}
`;

export function statusHtml(s: Statement, big = false): string {
  return `<span class="status${big ? ' big' : ''}" style="color:${STATUS_COLOR[s]}" data-statement="${s}">${esc(STATEMENT_WORDS[s])}</span>`;
}

export function htmlPage(title: string, body: string): string {
  return `<!DOCTYPE html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="generator" content="benchproof">
<title>${esc(title)}</title>
<style>${CSS}</style>
</head>
<body>
${body}
</body>
</html>
`;
}

/** A numeric cell: the shown text, and the exact stored number in `data-value` for tools and tests. */
export function numCell(value: number | null | undefined, text: string): string {
  const data = value === null || value === undefined || !Number.isFinite(value) ? '' : ` data-value="${String(value)}"`;
  return `<td class="num"${data}>${esc(text)}</td>`;
}

/** A table; `cls` names a layout ('stats': a wide table of numbers, set compact to fit the page). */
export function table(head: readonly string[], rows: readonly string[], cls?: string): string {
  return `<table${cls ? ` class="${cls}"` : ''}><thead><tr>${head.map((h) => `<th>${esc(h)}</th>`).join('')}</tr></thead><tbody>${rows.join('')}</tbody></table>`;
}

export function facts(pairs: readonly (readonly [string, string])[]): string {
  return `<dl class="facts">${pairs.map(([k, v]) => `<dt>${esc(k)}</dt><dd>${v}</dd>`).join('')}</dl>`;
}
