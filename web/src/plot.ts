// One interactive plot (uPlot): the server sends min/max per pixel column for the visible window
// only, and is asked again at each zoom or pan step. Drag across the plot to zoom into that span;
// the buttons (and + − ← → Home on the focused plot) zoom, pan and return to the whole record.
// Markers drawn over the trace: levels, mid-reference crossings and ramp fits (waveform), harmonics
// (spectrum), from the marks the analysis stored with the run.
import uPlot from 'uplot';
import type { ChannelView, PlotData } from './api.js';
import { getJson } from './api.js';
import { h } from './dom.js';
import { axisTicks, countText, measurementLabel } from './quantities.js';

export interface PlotSpec {
  readonly kind: 'wave' | 'spectrum';
  /** unit, run, sha and channel of the capture. */
  readonly query: Record<string, string>;
  readonly title: string;
  /** What each axis shows, and its SI unit: the ticks carry the unit with one prefix per axis. */
  readonly xLabel: string;
  readonly xUnit: string;
  readonly yLabel: string;
  readonly yUnit: string;
  readonly channel: ChannelView;
}

const TRACE = '#24507a';
const BAND = 'rgba(36, 80, 122, 0.25)';
const MARK = '#a0522d';

export function interactivePlot(spec: PlotSpec): { element: HTMLElement; dispose(): void } {
  const target = h('div', { class: 'plot-canvas' });
  const showMarks = h('input', { type: 'checkbox', checked: true });
  const info = h('span', { class: 'plot-info', 'aria-live': 'polite' });
  const button = (label: string, title: string, action: () => void): HTMLButtonElement => {
    const b = h('button', { type: 'button', title, 'aria-label': `${title} (${spec.title})` }, label);
    b.addEventListener('click', action);
    return b;
  };
  const fig = h('figure', { class: 'plot', tabindex: '0', 'data-kind': spec.kind, 'aria-label': `${spec.title}: drag to zoom; keys + − ← → Home` },
    h('figcaption', {}, spec.title),
    h('div', { class: 'plot-controls' },
      button('+', 'Zoom in', () => zoom(0.5)),
      button('−', 'Zoom out', () => zoom(2)),
      button('←', 'Pan left', () => pan(-0.25)),
      button('→', 'Pan right', () => pan(0.25)),
      button('Whole record', 'Show the whole record', () => void load()),
      h('label', {}, showMarks, ' markers'),
      info),
    target);
  let plot: uPlot | undefined;
  let view: PlotData | undefined;
  let request: AbortController | undefined;

  const load = async (from?: number, to?: number): Promise<void> => {
    request?.abort();
    request = new AbortController();
    const width = Math.max(200, Math.min(4096, Math.floor(target.clientWidth || 800)));
    const q = new URLSearchParams({ ...spec.query, width: String(width) });
    if (from !== undefined && to !== undefined) {
      q.set('from', String(from));
      q.set('to', String(to));
    }
    fig.dataset.loading = 'true';
    try {
      view = await getJson<PlotData>(`/api/plot/${spec.kind}?${q}`, request.signal);
    } catch (err) {
      if ((err as Error).name !== 'AbortError') info.textContent = `could not load: ${(err as Error).message}`;
      return;
    }
    const data: uPlot.AlignedData = [view.t, view.min, view.max];
    if (!plot) plot = new uPlot(options(width), data, target);
    else {
      plot.setData(data, false);
      plot.setScale('x', { min: view.from, max: view.to });
    }
    plot.setScale('x', { min: view.from, max: view.to });
    fig.dataset.from = String(view.from);
    fig.dataset.to = String(view.to);
    fig.dataset.columns = String(view.t.length);
    fig.dataset.step = String(view.step);
    delete fig.dataset.loading;
    info.textContent = view.step > 1 ? `${countText(view.step)} points per column (min and max shown)` : 'every point shown';
  };
  const zoom = (factor: number): void => {
    if (!view) return;
    const mid = (view.from + view.to) / 2;
    const half = ((view.to - view.from) * factor) / 2;
    void load(Math.max(view.whole.from, mid - half), Math.min(view.whole.to, mid + half));
  };
  const pan = (share: number): void => {
    if (!view) return;
    const span = view.to - view.from;
    const from = Math.min(view.whole.to - span, Math.max(view.whole.from, view.from + share * span));
    void load(from, from + span);
  };
  const options = (width: number): uPlot.Options => ({
    width,
    height: 240,
    legend: { show: false },
    scales: { x: { time: false } },
    axes: [
      { label: spec.xLabel, values: (_u, splits, _i, _space, incr) => axisTicks(splits, spec.xUnit, incr) },
      { label: spec.yLabel, size: 84, values: (_u, splits, _i, _space, incr) => axisTicks(splits, spec.yUnit, incr) },
    ],
    series: [{}, { stroke: TRACE, width: 1 }, { stroke: TRACE, width: 1 }],
    bands: [{ series: [2, 1], fill: BAND }],
    cursor: { drag: { x: true, y: false, setScale: false }, points: { show: false } },
    hooks: {
      setSelect: [
        (u) => {
          if (u.select.width > 4) void load(u.posToVal(u.select.left, 'x'), u.posToVal(u.select.left + u.select.width, 'x'));
          u.setSelect({ left: 0, top: 0, width: 0, height: 0 }, false);
        },
      ],
      draw: [(u) => showMarks.checked && drawMarks(u, spec)],
    },
  });
  showMarks.addEventListener('change', () => plot?.redraw(false));
  fig.addEventListener('keydown', (e) => {
    if (e.target !== fig) return;
    const act: Record<string, () => void> = { '+': () => zoom(0.5), '=': () => zoom(0.5), '-': () => zoom(2), ArrowLeft: () => pan(-0.25), ArrowRight: () => pan(0.25), Home: () => void load() };
    const fn = act[e.key];
    if (fn) {
      e.preventDefault();
      fn();
    }
  });
  requestAnimationFrame(() => void load());
  return { element: fig, dispose: () => (request?.abort(), plot?.destroy()) };
}

function drawMarks(u: uPlot, spec: PlotSpec): void {
  const c = u.ctx;
  const { left, top, width, height } = u.bbox;
  c.save();
  c.beginPath();
  c.rect(left, top, width, height);
  c.clip();
  c.strokeStyle = MARK;
  c.fillStyle = MARK;
  c.lineWidth = devicePixelRatio;
  c.font = `${11 * devicePixelRatio}px system-ui, sans-serif`;
  const x = (v: number): number => u.valToPos(v, 'x', true);
  const y = (v: number): number => u.valToPos(v, 'y', true);
  const inX = (px: number): boolean => px >= left && px <= left + width;
  if (spec.kind === 'wave') {
    const m = spec.channel.marks;
    c.setLineDash([6 * devicePixelRatio, 4 * devicePixelRatio]);
    for (const [level, name] of [[m.highLevel, measurementLabel('highLevel')], [m.lowLevel, measurementLabel('lowLevel')], [m.midReference, 'mid reference']] as const) {
      if (level === null) continue;
      const py = y(level);
      if (py < top || py > top + height) continue;
      c.beginPath();
      c.moveTo(left, py);
      c.lineTo(left + width, py);
      c.stroke();
      label(c, name, left + width - c.measureText(name).width - 4, py + 13 * devicePixelRatio > top + height ? py - 4 * devicePixelRatio : py + 13 * devicePixelRatio);
    }
    c.setLineDash([]);
    for (const t of m.crossings) {
      const px = x(t);
      if (!inX(px)) continue;
      c.beginPath();
      c.moveTo(px, top + height);
      c.lineTo(px, top + height - 10 * devicePixelRatio);
      c.stroke();
    }
    c.lineWidth = 2 * devicePixelRatio;
    for (const f of m.slopeFits) {
      c.beginPath();
      c.moveTo(x(f.t1), y(f.v1));
      c.lineTo(x(f.t2), y(f.v2));
      c.stroke();
    }
  } else {
    c.setLineDash([3 * devicePixelRatio, 3 * devicePixelRatio]);
    for (const hm of spec.channel.harmonics) {
      const px = x(hm.frequency);
      if (!inX(px)) continue;
      c.beginPath();
      c.moveTo(px, top);
      c.lineTo(px, top + height);
      c.stroke();
      label(c, `H${hm.n}`, px + 3, top + 12 * devicePixelRatio);
    }
  }
  c.restore();
}

/** A marker's name on a pale ground, so it stays legible where it crosses the trace. */
function label(c: CanvasRenderingContext2D, text: string, x: number, y: number): void {
  const w = c.measureText(text).width;
  const hgt = 11 * devicePixelRatio;
  c.save();
  c.setLineDash([]);
  c.fillStyle = 'rgba(255, 255, 255, 0.85)';
  c.fillRect(x - 2, y - hgt, w + 4, hgt + 3 * devicePixelRatio);
  c.restore();
  c.fillText(text, x, y);
}
