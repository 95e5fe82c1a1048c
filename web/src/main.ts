// The bench page: a hash router over four views, and one live stream from the server that each
// view listens to while it is shown.
import './style.css';
import 'uplot/dist/uPlot.min.css';
import { showBoard } from './board.js';
import { showUnit } from './unit.js';
import { showBatch } from './batch.js';
import { showSpec } from './specPage.js';
import { clear } from './dom.js';
import { live } from './live.js';

const main = document.getElementById('main') as HTMLElement;
let leave: (() => void) | undefined;

function route(): void {
  // In-page anchors (the skip link) are not pages.
  if (location.hash && !location.hash.startsWith('#/')) return;
  leave?.();
  leave = undefined;
  clear(main);
  const hash = decodeURIComponent(location.hash.replace(/^#\/?/, ''));
  const [page, ...rest] = hash.split('/');
  for (const a of document.querySelectorAll<HTMLAnchorElement>('nav a[data-nav]')) {
    const current = a.dataset.nav === (page || 'board') || (page === 'unit' && a.dataset.nav === 'board');
    if (current) a.setAttribute('aria-current', 'page');
    else a.removeAttribute('aria-current');
  }
  if (page === 'unit' && rest.length) leave = showUnit(main, rest.join('/'));
  else if (page === 'batch') leave = showBatch(main);
  else if (page === 'spec') leave = showSpec(main);
  else leave = showBoard(main);
  document.body.dataset.page = page || 'board';
}

// "/" jumps to the board's filter, as in many list pages; Escape leaves a field.
document.addEventListener('keydown', (e) => {
  const field = e.target instanceof HTMLInputElement || e.target instanceof HTMLSelectElement || e.target instanceof HTMLTextAreaElement;
  if (e.key === '/' && !field) {
    const filter = document.getElementById('filter');
    if (filter) {
      e.preventDefault();
      filter.focus();
    }
  } else if (e.key === 'Escape' && field) {
    (e.target as HTMLElement).blur();
  }
});

window.addEventListener('hashchange', route);
live.start(document.getElementById('live') as HTMLElement);
route();
