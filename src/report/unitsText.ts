/**
 * The `units` listing: one line per unit with its current state (the latest attempt decides: INCOMPLETE
 * while it waits for a condition, else its statement), what it still waits for, its last test, its
 * runs and attempts, and the statement of its first complete attempt (first pass).
 */
import type { Statement, UnitSummary } from '../types/index.js';
import { INCOMPLETE_WORD, STATEMENT_WORDS } from '../types/index.js';
import type { TextStyle } from './style.js';
import { formatTime } from './reportNumbers.js';

const waits = (u: UnitSummary): boolean => u.state === 'incomplete';

export function renderUnitsText(units: readonly UnitSummary[], style: TextStyle): string {
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
    `${u.spec.name} rev. ${u.spec.revision}${u.unverifiedRuns?.length ? `  UNVERIFIED: run ${u.unverifiedRuns.map((id) => `#${id}`).join(', ')}` : ''}`,
  ]);
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
  return `${lines.join('\n')}\n`;
}
