// The batch page: yields, capability with histograms and the units table, as `benchproof batch
// --format html` renders them, for one spec or all; with the CSV and Markdown downloads.
import { getJson } from './api.js';
import { h } from './dom.js';

export function showBatch(main: HTMLElement): () => void {
  const picker = h('select', { id: 'batch-spec', 'aria-label': 'Spec of the batch' }, h('option', { value: '' }, 'every spec'));
  const csv = h('a', { class: 'button', id: 'batch-csv', download: '' }, 'CSV');
  const md = h('a', { class: 'button', id: 'batch-md', download: '' }, 'Markdown');
  const frame = h('iframe', { class: 'record', title: 'Batch report', sandbox: 'allow-same-origin' });
  frame.addEventListener('load', () => {
    const doc = frame.contentDocument;
    if (doc?.documentElement) frame.style.height = `${doc.documentElement.scrollHeight + 16}px`;
  });
  const show = (): void => {
    const q = picker.value ? `?spec=${encodeURIComponent(picker.value)}` : '';
    frame.src = `/view/batch.html${q}`;
    csv.href = `/download/batch.csv${q}`;
    md.href = `/download/batch.md${q}`;
  };
  picker.addEventListener('change', show);
  main.append(h('h1', {}, 'Batch'), h('div', { class: 'actions' }, h('label', {}, 'Spec ', picker), h('span', {}, 'Download: '), csv, md), frame);
  void getJson<{ specs: string[] }>('/api/batch').then(({ specs }) => {
    for (const s of specs) picker.append(h('option', { value: s }, s));
    if (specs.length === 1) picker.value = specs[0];
    show();
  });
  return () => {};
}
