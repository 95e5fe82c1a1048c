/**
 * The `units` listing: one line per unit with its current state (the latest attempt decides: INCOMPLETE
 * while it waits for a condition, else its statement), what it still waits for, its last test, its
 * runs and attempts, and the statement of its first complete attempt (first pass).
 */
import type { Statement, UnitSummary } from '../types/index.js';
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import type { TextStyle } from './style.js';
import { formatTime } from './reportNumbers.js';
import { visibleWidth } from './wrapText.js';

const waits = (u: UnitSummary): boolean => u.state === 'incomplete';

/**
 * One line per unit. When those lines are wider than `width` (a terminal narrower than the table),
 * the spec moves out of the rows into a line above each run of units under the same spec, as the
 * spec column is the widest and usually the same for every unit.
 */
export function renderUnitsText(units: readonly UnitSummary[], style: TextStyle, width = Number.POSITIVE_INFINITY): string {
  const head = ['unit', 'status', 'waiting for', 'last tested', 'runs', 'attempts', 'first pass', 'spec'];
  const firstWord = (u: UnitSummary): string => (u.firstComplete ? STATEMENT_WORDS[u.firstComplete] : '—');
  const rows = units.map((u) => [
    u.unit,
    waits(u) ? INCOMPLETE_WORD : STATEMENT_WORDS[u.status],
    waits(u) ? (u.waitingFor ?? []).join(', ') : '—',
    formatTime(u.lastTestedAt),
    String(u.runs),
    String(u.attempts ?? u.runs),
    firstWord(u),
    // Runs that failed verification (listed only with --allow-unverified) are named on the unit's line.
    `${specOf(u)}${unverified(u)}`,
  ]);
  const full = table(head, rows, units, style);
  if (Math.max(...full.map(visibleWidth)) <= width) return `${full.join('\n')}\n`;
  // Narrow: the table without the spec column, a spec line before each run of units under one spec,
  // runs that failed verification on a line of their own under the unit's.
  const narrow = table(head.slice(0, -1), rows.map((r) => r.slice(0, -1)), units, style);
  const lines = [narrow[0]];
  units.forEach((u, k) => {
    if (k === 0 || specOf(units[k - 1]) !== specOf(u)) lines.push(style.dim(`spec ${specOf(u)}`));
    lines.push(narrow[k + 1]);
    if (unverified(u)) lines.push(style.bad(unverified(u)));
  });
  return `${lines.join('\n')}\n`;
}

const specOf = (u: UnitSummary): string => `${u.spec.name} rev. ${u.spec.revision}`;
const unverified = (u: UnitSummary): string => (u.unverifiedRuns?.length ? `  UNVERIFIED: run ${u.unverifiedRuns.map((id) => `#${id}`).join(', ')}` : '');

/** The head line and one line per unit, columns aligned, status words coloured after padding. */
function table(head: readonly string[], rows: readonly (readonly string[])[], units: readonly UnitSummary[], style: TextStyle): string[] {
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const pad = (cells: readonly string[]): string[] => cells.map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i])));
  const paint = (word: string, st: Statement | undefined, width: number): string =>
    `${st === undefined ? style.bold(word) : style.statement(st)}${' '.repeat(width - word.length)}`;
  const lines = [style.bold(pad(head).join('  ').trimEnd())];
  units.forEach((u, k) => {
    const cells = pad(rows[k]);
    // Colour only the status words, after padding, so columns stay aligned.
    cells[1] = paint(rows[k][1], waits(u) ? undefined : u.status, widths[1]);
    if (u.firstComplete) cells[6] = paint(rows[k][6], u.firstComplete, widths[6]);
    lines.push(cells.join('  ').trimEnd());
  });
  return lines;
}
