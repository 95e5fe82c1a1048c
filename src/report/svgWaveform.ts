/**
 * The waveform plot of a record: a few cycles of the stored excerpt with the analysis marks — high and
 * low state levels (dashed), the mid reference (dotted), mid-reference crossings (circles) and the
 * fitted ramps (thick lines) — so a reader sees what was measured, not only the numbers.
 */
import type { WaveformPlot } from '../types/index.js';
import { FIT, INK, MARK, TRACE, axes, esc, legend, makeFrame, n2, niceDomain, niceTicks, polyline, svgOpen } from './svgPlot.js';
import type { Frame } from './svgPlot.js';

/** More points than a plot this wide can show are reduced to each bucket's min and max, in time order. */
const MAX_POINTS = 1200;

function decimate(plot: WaveformPlot): { xs: number[]; ys: number[] } {
  const n = plot.values.length;
  const xs: number[] = [];
  const ys: number[] = [];
  if (n <= MAX_POINTS) {
    plot.values.forEach((v, i) => {
      xs.push(plot.t0 + i * plot.dt);
      ys.push(v);
    });
    return { xs, ys };
  }
  const per = Math.ceil(n / (MAX_POINTS / 2));
  for (let s = 0; s < n; s += per) {
    let lo = s;
    let hi = s;
    for (let i = s; i < Math.min(n, s + per); i++) {
      if (plot.values[i] < plot.values[lo]) lo = i;
      if (plot.values[i] > plot.values[hi]) hi = i;
    }
    for (const i of lo < hi ? [lo, hi] : [hi, lo]) {
      xs.push(plot.t0 + i * plot.dt);
      ys.push(plot.values[i]);
    }
  }
  return { xs, ys };
}

function hLine(frame: Frame, y: number, color: string, dash: string, label: string): string {
  const py = n2(frame.y(y));
  return `<line x1="${frame.left}" y1="${py}" x2="${frame.right}" y2="${py}" stroke="${color}" stroke-width="1" stroke-dasharray="${dash}"/><text x="${frame.right - 4}" y="${py}" dy="-0.35em" text-anchor="end" fill="${color}">${esc(label)}</text>`;
}

export function renderWaveformSvg(plot: WaveformPlot, title: string, unit: string): string {
  if (plot.values.length < 2) return '';
  const { xs, ys } = decimate(plot);
  const levels = [plot.highLevel, plot.lowLevel, plot.midReference].filter((v): v is number => v !== undefined);
  const yMin = Math.min(...ys, ...levels);
  const yMax = Math.max(...ys, ...levels);
  const xDomain: [number, number] = [xs[0], xs[xs.length - 1]];
  const pad = (yMax - yMin) * 0.06;
  const yDomain = niceDomain(yMin - pad, yMax + pad, 6);
  const frame = makeFrame(xDomain, yDomain);
  const parts = [svgOpen(frame, title, 'plot waveform')];
  parts.push(axes(frame, niceTicks(xDomain[0], xDomain[1], 8), niceTicks(yDomain[0], yDomain[1], 6), 's', unit, 'time', 'level'));
  parts.push(polyline(frame, xs, ys, TRACE));
  if (plot.highLevel !== undefined) parts.push(hLine(frame, plot.highLevel, INK, '6 3', 'high state level'));
  if (plot.lowLevel !== undefined) parts.push(hLine(frame, plot.lowLevel, INK, '6 3', 'low state level'));
  if (plot.midReference !== undefined) parts.push(hLine(frame, plot.midReference, MARK, '2 3', 'mid reference'));
  for (const f of plot.slopeFits) {
    parts.push(`<line x1="${n2(frame.x(f.t1))}" y1="${n2(frame.y(f.v1))}" x2="${n2(frame.x(f.t2))}" y2="${n2(frame.y(f.v2))}" stroke="${FIT}" stroke-width="3" stroke-opacity="0.8" stroke-linecap="round"/>`);
  }
  const mid = plot.midReference ?? 0;
  for (const t of plot.crossings) {
    if (t < xDomain[0] || t > xDomain[1]) continue;
    parts.push(`<circle cx="${n2(frame.x(t))}" cy="${n2(frame.y(mid))}" r="3.2" fill="none" stroke="${MARK}" stroke-width="1.4"/>`);
  }
  const items = [{ color: TRACE, label: 'captured' }];
  if (plot.slopeFits.length) items.push({ color: FIT, label: 'slope fit' });
  if (plot.crossings.length) items.push({ color: MARK, label: 'reference crossing' });
  parts.push(legend(frame, items));
  parts.push('</svg>');
  return parts.join('');
}
