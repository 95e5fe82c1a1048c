// The unit page: the unit's state, its record as the report stage renders it (statement, checks
// with values, U and limits, likely causes, circuit view, history and calibration), and the
// interactive plots of each capture of the chosen run. Printing the page prints the record.
import type { RunView, UnitView } from './api.js';
import { ApiError, getJson } from './api.js';
import { h, localTime, stateBadge } from './dom.js';
import { live } from './live.js';
import { interactivePlot } from './plot.js';
import { countText } from './quantities.js';

export function showUnit(main: HTMLElement, serial: string): () => void {
  const disposers: (() => void)[] = [];
  const enc = encodeURIComponent(serial);
  const header = h('div', { class: 'unit-head' }, h('h1', {}, serial));
  const plots = h('section', { class: 'plots', 'aria-label': 'Plots' });
  const frame = h('iframe', { class: 'record', title: `Test record of ${serial}`, sandbox: 'allow-same-origin', src: `/view/units/${enc}/record.html` });
  frame.addEventListener('load', () => fitFrame(frame));
  main.append(header, plots, h('section', { class: 'record-section', 'aria-label': 'Record' }, frame));
  let shownRun: number | undefined;

  const showRun = (unit: UnitView, run: RunView): void => {
    shownRun = run.id;
    disposers.splice(0).forEach((d) => d());
    plots.replaceChildren(h('h2', {}, `Plots of run #${run.id}`, ' ', stateBadge(run.statement, run.word)));
    run.captures.forEach((cap, i) => {
      const body = h('div', { class: 'capture-plots' });
      const details = h('details', { class: 'capture', open: i === 0 }, h('summary', {}, `${cap.path} (${cap.condition}, ${cap.samples === null ? 'samples not known' : `${countText(cap.samples)} samples`})`), body);
      let built = false;
      const build = (): void => {
        if (built || !details.open) return;
        built = true;
        for (const ch of cap.channels) {
          const query = { unit: unit.unit, run: String(run.id), sha: cap.sha256, channel: ch.name };
          const output = cap.outputs.find((o) => o.channel === ch.name)?.output;
          const name = `${output ? `${output} (${ch.name})` : ch.name}, ${cap.condition}`;
          const wave = interactivePlot({ kind: 'wave', query, title: `Waveform: ${name}`, xLabel: 'time', xUnit: 's', yLabel: 'level', yUnit: ch.unit, channel: ch });
          body.append(wave.element);
          disposers.push(wave.dispose);
          if (ch.spectrum) {
            const spec = interactivePlot({ kind: 'spectrum', query, title: `Spectrum: ${name}`, xLabel: 'frequency', xUnit: 'Hz', yLabel: `level re ${ch.spectrum.reference}`, yUnit: 'dB', channel: ch });
            body.append(spec.element);
            disposers.push(spec.dispose);
          }
        }
      };
      details.addEventListener('toggle', build);
      plots.append(details);
      build();
    });
  };

  const load = async (): Promise<void> => {
    let unit: UnitView;
    try {
      unit = await getJson<UnitView>(`/api/units/${enc}`);
    } catch (err) {
      header.replaceChildren(h('h1', {}, serial), h('pre', { class: 'error', role: 'alert' }, err instanceof ApiError ? (err.error.message ?? err.error.problem) : String(err)));
      frame.remove();
      return;
    }
    const picker = h('select', { id: 'run-picker', 'aria-label': 'Run to plot' }, ...unit.runs.map((r) => h('option', { value: String(r.id) }, `run #${r.id}, ${localTime(r.startedAt)}, ${r.word}${r.intact ? '' : ' (changed since stored)'}`)));
    picker.addEventListener('change', () => {
      const run = unit.runs.find((r) => String(r.id) === picker.value);
      if (run) showRun(unit, run);
    });
    const print = h('button', { type: 'button', id: 'print' }, 'Print the record');
    print.addEventListener('click', () => window.print());
    header.replaceChildren(
      h('h1', {}, unit.unit, ' ', stateBadge(unit.status, unit.word)),
      unit.waitingFor.length ? h('p', { class: 'waiting' }, `Waits for a capture at: ${unit.waitingFor.join(', ')}`) : '',
      h('p', { class: 'facts' }, `${unit.spec.name} rev ${unit.spec.revision} · ${unit.runs.length} run(s)`),
      h('div', { class: 'actions' },
        h('label', {}, 'Plot ', picker), print,
        h('a', { class: 'button', href: `/download/units/${enc}/record.html`, download: '' }, 'HTML'),
        h('a', { class: 'button', href: `/download/units/${enc}/record.md`, download: '' }, 'Markdown'),
        h('a', { class: 'button', href: `/download/units/${enc}/record.json`, download: '' }, 'JSON'),
        h('a', { class: 'button', href: '#/' }, 'Back to the board')),
    );
    header.append(attemptsBlock(unit, enc));
    const latest = unit.runs[0];
    if (latest && latest.id !== shownRun) showRun(unit, latest);
    document.body.dataset.unitLoaded = String(Date.now());
  };
  // A new run of this unit (from any writer) refreshes the page.
  const off = live.on('changed', () => {
    void load();
    frame.src = `/view/units/${enc}/record.html?${Date.now()}`;
  });
  void load();
  return () => {
    off();
    disposers.forEach((d) => d());
  };
}

/** The unit's attempts, and two of them side by side as `benchproof compare` shows them. */
function attemptsBlock(unit: UnitView, enc: string): HTMLElement {
  const box = h('section', { class: 'attempts', 'aria-label': 'Test attempts' });
  if (unit.attempts.length === 0) return box;
  box.append(h('h2', {}, 'Test attempts'), h('ol', {}, ...unit.attempts.map((a) => h('li', { 'data-attempt': String(a.number) }, `#${a.number} `, stateBadge(a.state === 'incomplete' ? 'incomplete' : a.statement, a.word), a.notes.length ? ` — ${a.notes.join('; ')}` : ''))));
  if (unit.attempts.length < 2) return box;
  const pick = (id: string, label: string, chosen: number): HTMLSelectElement => {
    const sel = h('select', { id, 'aria-label': label }, ...unit.attempts.map((a) => h('option', { value: String(a.number) }, `attempt #${a.number}`)));
    sel.value = String(chosen);
    return sel;
  };
  const n = unit.attempts.length;
  const a = pick('compare-a', 'Earlier attempt', unit.attempts[n - 2].number);
  const b = pick('compare-b', 'Later attempt', unit.attempts[n - 1].number);
  const go = h('button', { type: 'button', id: 'compare' }, 'Compare');
  const frame = h('iframe', { class: 'record compare', title: 'Comparison of two attempts', sandbox: 'allow-same-origin', hidden: true });
  frame.addEventListener('load', () => fitFrame(frame));
  go.addEventListener('click', () => {
    frame.hidden = false;
    frame.src = `/view/units/${enc}/compare.html?a=${encodeURIComponent(a.value)}&b=${encodeURIComponent(b.value)}`;
  });
  box.append(h('div', { class: 'actions' }, h('label', {}, 'Compare ', a), h('label', {}, ' with ', b), go), frame);
  return box;
}

/** The record frame as tall as its content, so the page scrolls (and prints) it whole. */
function fitFrame(frame: HTMLIFrameElement): void {
  const doc = frame.contentDocument;
  if (doc?.documentElement) frame.style.height = `${doc.documentElement.scrollHeight + 16}px`;
}
