/**
 * The spectrum plot of a record: level in dBc against frequency, each measured harmonic marked (filled
 * circle, numbered) with the ideal shape's series beside it (hollow square), so a reader sees at a glance
 * which harmonics depart from a clean triangle, square or pulse.
 */
import type { Harmonic, SpectrumPlot } from '../types/index.js';
import { IDEAL, INK, MARK, TRACE, axes, esc, legend, makeFrame, n2, niceTicks, polyline, svgOpen } from './svgPlot.js';

/** Lowest level drawn; the floor of a good capture sits below it. */
const FLOOR_DBC = -100;
/** Harmonics marked at most; beyond this the marks crowd and the series says little more. */
const MAX_MARKED = 20;

export function renderSpectrumSvg(spectrum: SpectrumPlot | undefined, harmonics: readonly Harmonic[], title: string, shapeName: string): string {
  if (!spectrum && harmonics.length === 0) return '';
  const specTop = spectrum ? (spectrum.dbc.length - 1) * spectrum.binWidth : Infinity;
  const marked = harmonics.filter((h) => h.n <= MAX_MARKED && h.frequency <= specTop);
  const f1 = harmonics.find((h) => h.n === 1)?.frequency ?? 0;
  const lastMarked = marked.length ? marked[marked.length - 1].frequency + 0.8 * f1 : 0;
  const xMax = Math.min(specTop, marked.length ? lastMarked : specTop);
  if (!(xMax > 0)) return '';
  const xs: number[] = [];
  const ys: number[] = [];
  if (spectrum) {
    spectrum.dbc.forEach((v, i) => {
      const f = i * spectrum.binWidth;
      if (f > xMax) return;
      xs.push(f);
      ys.push(Math.max(FLOOR_DBC, v));
    });
  }
  const frame = makeFrame([0, xMax], [FLOOR_DBC, 10]);
  const parts = [svgOpen(frame, title, 'plot spectrum')];
  parts.push(axes(frame, niceTicks(0, xMax, 8), niceTicks(FLOOR_DBC, 0, 5), 'Hz', 'dBc', 'frequency', 'level'));
  if (xs.length > 1) parts.push(polyline(frame, xs, ys, TRACE, 1));
  const dx = Math.min(7, (frame.right - frame.left) / Math.max(1, marked.length) / 4);
  // Number every harmonic while they are at least 14 px apart, else every second or fifth.
  const spacing = f1 > 0 ? frame.x(f1) - frame.x(0) : Infinity;
  const labelEvery = spacing >= 14 ? 1 : spacing >= 7 ? 2 : 5;
  let anyIdeal = false;
  for (const h of marked) {
    const px = frame.x(h.frequency);
    const py = frame.y(Math.max(FLOOR_DBC, h.dbc));
    const label = h.n === 1 || h.n % labelEvery === 0 ? `<text x="${n2(px)}" y="${n2(py - 7)}" text-anchor="middle" fill="${INK}">${h.n}</text>` : '';
    parts.push(`<circle cx="${n2(px)}" cy="${n2(py)}" r="3.4" fill="${MARK}"/>${label}`);
    if (h.idealDbc !== undefined && Number.isFinite(h.idealDbc)) {
      anyIdeal = true;
      const iy = n2(frame.y(Math.max(FLOOR_DBC, h.idealDbc)) - 3.2);
      parts.push(`<rect x="${n2(px + dx - 3.2)}" y="${iy}" width="6.4" height="6.4" fill="none" stroke="${IDEAL}" stroke-width="1.4"/>`);
    }
  }
  const items = [];
  if (xs.length > 1) items.push({ color: TRACE, label: 'spectrum' });
  if (marked.length) items.push({ color: MARK, label: 'measured harmonic' });
  if (anyIdeal) items.push({ color: IDEAL, label: `ideal ${shapeName} series` });
  parts.push(legend(frame, items));
  parts.push(`<desc>${esc(`${marked.length} of ${harmonics.length} harmonics marked; levels below ${FLOOR_DBC} dBc drawn at ${FLOOR_DBC} dBc`)}</desc>`);
  parts.push('</svg>');
  return parts.join('');
}
