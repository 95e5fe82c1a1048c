/** The `units` listing: one line per unit with its current status (latest run), last test and run count. */
import type { UnitSummary } from '../types/index.js';
import { STATEMENT_WORDS } from '../types/index.js';
import type { TextStyle } from './style.js';
import { formatTime } from './unitsSi.js';

export function renderUnitsText(units: readonly UnitSummary[], style: TextStyle): string {
  const head = ['unit', 'status', 'last tested', 'runs', 'first run', 'spec'];
  const rows = units.map((u) => [u.unit, STATEMENT_WORDS[u.status], formatTime(u.lastTestedAt), String(u.runs), STATEMENT_WORDS[u.firstStatement], `${u.spec.name} rev. ${u.spec.revision}`]);
  const widths = head.map((h, i) => Math.max(h.length, ...rows.map((r) => r[i].length)));
  const pad = (cells: readonly string[]): string[] => cells.map((c, i) => (i === cells.length - 1 ? c : c.padEnd(widths[i])));
  const lines = [style.bold(pad(head).join('  ').trimEnd())];
  units.forEach((u, k) => {
    const cells = pad(rows[k]);
    // Colour only the status word, after padding, so columns stay aligned.
    cells[1] = `${style.statement(u.status)}${' '.repeat(widths[1] - STATEMENT_WORDS[u.status].length)}`;
    cells[4] = `${style.statement(u.firstStatement)}${' '.repeat(widths[4] - STATEMENT_WORDS[u.firstStatement].length)}`;
    lines.push(cells.join('  ').trimEnd());
  });
  return `${lines.join('\n')}\n`;
}
