// The drop zone: files dragged onto it (or picked) are sent in one request, checked and stored as
// `benchproof check` would; the log shows upload and reading progress, then each unit's statement
// or the same error message `check` prints.
import { h } from './dom.js';
import { live } from './live.js';
import type { BenchErrorView } from './api.js';

interface DropEvent {
  readonly id: string;
  readonly status: 'reading' | 'stored' | 'error';
  readonly file?: string;
  readonly done?: number;
  readonly total?: number;
}

interface WatchEvent {
  readonly status: string;
  readonly file: string;
  readonly unit?: string;
  readonly statement?: string;
  readonly word?: string;
  readonly error?: BenchErrorView;
}

export function dropZone(log: HTMLElement): { element: HTMLElement; enable(on: boolean): void; dispose(): void } {
  const input = h('input', { type: 'file', id: 'pick-files', multiple: true, accept: '.csv,.txt,.gz,text/csv', class: 'sr-only' });
  const note = h('input', { type: 'text', id: 'drop-note', maxlength: '300', autocomplete: 'off' });
  const newAttempt = h('input', { type: 'checkbox', id: 'drop-new-attempt' });
  const pick = h('label', { for: 'pick-files', class: 'button', tabindex: '0', role: 'button' }, 'Choose capture files…');
  const zone = h('section', { class: 'drop', id: 'drop-zone', 'aria-label': 'Drop capture files here' },
    h('p', { class: 'drop-title' }, 'Drop the captures the scope saved here'),
    h('p', { class: 'note' }, 'They are checked against the spec and stored exactly as benchproof check does. Name them as the spec pattern asks, e.g. FK-0101_mid.csv.'),
    h('div', { class: 'drop-options' },
      h('label', {}, 'Note (what was changed on the unit; starts a new attempt) ', note),
      h('label', {}, newAttempt, ' start a new attempt')),
    pick, input);
  const entries = new Map<string, HTMLElement>();
  let enabled = false;

  const send = (files: File[]): void => {
    if (!enabled || files.length === 0) return;
    const id = `drop-${Date.now()}-${Math.floor(Math.random() * 1e6)}`;
    const bar = h('progress', { max: '1', value: '0', 'aria-label': 'Upload progress' });
    const status = h('span', { class: 'drop-status' }, 'sending…');
    const entry = h('li', { class: 'drop-entry', 'data-drop': id }, h('strong', {}, files.map((f) => f.name).join(', ')), ' ', status, bar);
    log.prepend(entry);
    entries.set(id, entry);
    const form = new FormData();
    if (note.value.trim()) form.append('note', note.value.trim());
    if (newAttempt.checked) form.append('newAttempt', 'true');
    for (const f of files) form.append('file', f, f.name);
    note.value = '';
    newAttempt.checked = false;
    const xhr = new XMLHttpRequest();
    xhr.open('POST', '/api/drop');
    xhr.setRequestHeader('X-Drop-Id', id);
    xhr.responseType = 'json';
    xhr.upload.addEventListener('progress', (e) => {
      if (e.lengthComputable) bar.value = e.loaded / e.total;
    });
    xhr.upload.addEventListener('load', () => (status.textContent = 'checking…'));
    xhr.addEventListener('load', () => {
      bar.remove();
      const body = xhr.response as { units?: { unit: string; statement: string; state: string; word: string; runId: number; waitingFor: string[] }[]; error?: BenchErrorView } | null;
      if (xhr.status === 200 && body?.units) {
        entry.dataset.result = 'stored';
        status.replaceChildren(...body.units.flatMap((u) => [
          h('a', { href: `#/unit/${encodeURIComponent(u.unit)}` }, u.unit), ' ',
          h('span', { class: 'state', 'data-statement': u.state === 'incomplete' ? 'incomplete' : u.statement }, u.word),
          u.waitingFor.length ? ` waits for ${u.waitingFor.join(', ')}` : '', ` (run #${u.runId}) `,
        ]));
      } else {
        entry.dataset.result = 'error';
        status.replaceChildren(h('pre', { class: 'error', role: 'alert' }, body?.error?.message ?? body?.error?.problem ?? `the server answered ${xhr.status}`));
      }
    });
    xhr.addEventListener('error', () => {
      entry.dataset.result = 'error';
      status.textContent = 'the upload did not reach the server';
    });
    xhr.send(form);
  };

  zone.addEventListener('dragover', (e) => {
    e.preventDefault();
    zone.classList.add('over');
  });
  zone.addEventListener('dragleave', () => zone.classList.remove('over'));
  zone.addEventListener('drop', (e) => {
    e.preventDefault();
    zone.classList.remove('over');
    send([...(e.dataTransfer?.files ?? [])]);
  });
  input.addEventListener('change', () => {
    send([...(input.files ?? [])]);
    input.value = '';
  });
  pick.addEventListener('keydown', (e) => {
    if (e.key === 'Enter' || e.key === ' ') {
      e.preventDefault();
      input.click();
    }
  });
  const offDrop = live.on('drop', (d) => {
    const ev = d as DropEvent;
    const entry = entries.get(ev.id);
    if (!entry || ev.status !== 'reading' || entry.dataset.result) return;
    const s = entry.querySelector('.drop-status');
    if (s && ev.total) s.textContent = `reading ${ev.file}: ${Math.round((100 * (ev.done ?? 0)) / ev.total)} %`;
  });
  const offWatch = live.on('watch', (d) => {
    const ev = d as WatchEvent;
    const what = ev.error
      ? h('pre', { class: 'error' }, ev.error.message ?? ev.error.problem)
      : h('span', {}, ev.unit ? h('a', { href: `#/unit/${encodeURIComponent(ev.unit)}` }, ev.unit) : null, ' ', ev.statement && ev.word ? h('span', { class: 'state', 'data-statement': ev.statement }, ev.word) : ev.status);
    log.prepend(h('li', { class: 'drop-entry watched', 'data-result': ev.error ? 'error' : ev.status }, h('strong', {}, `watched folder: ${ev.file}`), ' ', what));
  });
  return {
    element: zone,
    enable(on) {
      enabled = on;
      zone.classList.toggle('disabled', !on);
      input.disabled = !on;
    },
    dispose() {
      offDrop();
      offWatch();
    },
  };
}
