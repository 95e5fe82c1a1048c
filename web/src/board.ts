// The bench board: the drop zone, the log of drops and watched files, and the units of the current
// spec with their state, newest first, filterable, refreshed whenever the records change.
import type { Board, BoardRow } from './api.js';
import { getJson } from './api.js';
import { clear, h, localTime, stateBadge } from './dom.js';
import { live } from './live.js';
import { dropZone } from './drop.js';
import { countText } from './quantities.js';

const STATES: readonly [string, string][] = [
  ['', 'every state'],
  ['pass', 'PASS'],
  ['conditional-pass', 'COND. PASS'],
  ['conditional-fail', 'COND. FAIL'],
  ['fail', 'FAIL'],
  ['not-measured', 'NOT MEASURED'],
  ['incomplete', 'INCOMPLETE'],
];

export function showBoard(main: HTMLElement): () => void {
  const head = h('div', { class: 'board-head' });
  const log = h('ol', { class: 'drop-log', 'aria-label': 'Drops and watched files', 'aria-live': 'polite' });
  const filter = h('input', { id: 'filter', type: 'search', placeholder: 'serial (press / to jump here)', 'aria-label': 'Filter units by serial', autocomplete: 'off' });
  const state = h('select', { id: 'state-filter', 'aria-label': 'Filter units by state' }, ...STATES.map(([v, w]) => h('option', { value: v }, w)));
  const count = h('span', { class: 'count', role: 'status' });
  const body = h('tbody');
  const table = h('table', { class: 'units', id: 'units' }, h('caption', { class: 'sr-only' }, 'Units and their state, newest first'), h('thead', {}, h('tr', {}, h('th', { scope: 'col' }, 'Unit'), h('th', { scope: 'col' }, 'State'), h('th', { scope: 'col', class: 'num' }, 'Runs'), h('th', { scope: 'col' }, 'Last tested'))), body);
  const zone = dropZone(log);
  main.append(h('h1', {}, 'Bench board'), head, zone.element, log, h('div', { class: 'filters' }, filter, state, count), table);

  let rows: readonly BoardRow[] = [];
  const render = (): void => {
    const q = filter.value.trim().toLowerCase();
    const shown = rows.filter((r) => (!q || r.unit.toLowerCase().includes(q)) && (!state.value || r.status === state.value));
    clear(body);
    for (const r of shown) {
      body.append(
        h('tr', { 'data-unit': r.unit, 'data-statement': r.status },
          h('td', {}, h('a', { href: `#/unit/${encodeURIComponent(r.unit)}` }, r.unit)),
          h('td', {}, stateBadge(r.status, r.word), r.waitingFor.length ? h('span', { class: 'waiting' }, ` waits for ${r.waitingFor.join(', ')}`) : null, r.unverified ? h('span', { class: 'warning' }, ` ${r.unverified} run(s) unverified`) : null),
          h('td', { class: 'num' }, countText(r.runs)),
          h('td', {}, h('time', { datetime: r.lastTestedAt }, localTime(r.lastTestedAt)))),
      );
    }
    if (shown.length === 0) body.append(h('tr', {}, h('td', { colspan: '4', class: 'empty' }, rows.length ? 'No unit matches the filter.' : 'No units recorded yet: drop captures above.')));
    count.textContent = `${countText(shown.length)} of ${countText(rows.length)} units`;
  };
  let pending: AbortController | undefined;
  const load = async (): Promise<void> => {
    pending?.abort();
    pending = new AbortController();
    try {
      const board = await getJson<Board>('/api/board', pending.signal);
      rows = board.units;
      describe(head, board);
      zone.enable(board.canDrop);
      render();
      document.body.dataset.boardLoaded = String(Date.now());
    } catch (err) {
      if ((err as Error).name !== 'AbortError') head.replaceChildren(h('p', { class: 'error' }, `The board could not be loaded: ${(err as Error).message}`));
    }
  };
  filter.addEventListener('input', render);
  state.addEventListener('change', render);
  const off = live.on('changed', () => void load());
  void load();
  return () => {
    off();
    zone.dispose();
    pending?.abort();
  };
}

function describe(head: HTMLElement, board: Board): void {
  const spec = board.spec ? `${board.spec.name} rev ${board.spec.revision} (${board.spec.file})` : 'no spec: every recorded unit is listed';
  head.replaceChildren(h('p', { class: 'facts' }, h('span', {}, 'Spec: ', h('strong', {}, spec)), ' · ', h('span', {}, 'Records: ', h('code', {}, board.data))));
  if (board.specProblem) head.append(h('pre', { class: 'error', role: 'alert' }, board.specProblem.message ?? board.specProblem.problem));
}
