/**
 * Histogram of one quantity across a batch, with the tolerance limits and the mean marked. Bin count by
 * Sturges' rule, k = ⌈log2 n⌉ + 1 (H. A. Sturges, J. Am. Stat. Assoc. 21 (1926) 65–66), bins on nice
 * thresholds over the values (d3-array `bin`, `thresholdSturges`); the axis also spans the limits so both
 * are in view. The SVG is written here.
 */
import { bin, thresholdSturges } from 'd3-array';
import { INK, MARK, TRACE, axes, esc, makeFrame, n2, niceDomain, niceTicks, svgOpen } from './svgPlot.js';

export interface HistogramInput {
  readonly title: string;
  readonly unit: string;
  readonly values: readonly number[];
  readonly lower: number | null;
  readonly upper: number | null;
  readonly mean: number | null;
  /** The x axis' name, e.g. the measurement's display label ('value' when absent); the unit is added to it. */
  readonly axisName?: string;
}

/** Sturges' bin count for n values, ⌈log2 n⌉ + 1 (d3-array `thresholdSturges`); 0 for none. */
export function sturgesBins(n: number): number {
  return n < 1 ? 0 : thresholdSturges(new Array<number>(n).fill(0));
}

/** Counts of values in k equal bins over [lo, hi]; the top edge belongs to the last bin (d3-array `bin`). */
export function binCounts(values: readonly number[], lo: number, hi: number, k: number): number[] {
  const edges = Array.from({ length: k - 1 }, (_, i) => lo + ((i + 1) * (hi - lo)) / k);
  return bin().domain([lo, hi]).thresholds(edges)(values).map((b) => b.length);
}

export function renderHistogramSvg(h: HistogramInput): string {
  if (h.values.length === 0) return '';
  const limits = [h.lower, h.upper].filter((v): v is number => v !== null);
  const vMin = Math.min(...h.values);
  const vMax = Math.max(...h.values);
  const [lo, hi] = niceDomain(Math.min(vMin, ...limits), Math.max(vMax, ...limits), 6);
  // Sturges' count, on nice thresholds over the values (d3-array `bin`); all values equal: one narrow bin, 1 % of the axis wide.
  const bins: { x0: number; x1: number; n: number }[] =
    vMax > vMin
      ? bin().domain([vMin, vMax]).thresholds(thresholdSturges)(h.values).map((b) => ({ x0: b.x0!, x1: b.x1!, n: b.length }))
      : [{ x0: vMin - (hi - lo) * 0.005, x1: vMax + (hi - lo) * 0.005, n: h.values.length }];
  const top = Math.max(...bins.map((b) => b.n));
  // Counts up to the tallest bar are ticked; the frame's top, one count higher, stays unlabelled for the limits' names.
  const frame = makeFrame([lo, hi], [0, top + 1], 420, 240);
  const parts = [svgOpen(frame, h.title, 'plot histogram')];
  parts.push(axes(frame, niceTicks(lo, hi, 5), niceTicks(0, top + 1, Math.min(5, top + 1)).filter((v) => Number.isInteger(v) && v <= top), h.unit, '', h.axisName ?? 'value', 'units'));
  for (const b of bins) {
    if (b.n === 0) continue;
    const x0 = frame.x(b.x0);
    const w = Math.max(1.5, frame.x(b.x1) - x0 - 1);
    parts.push(`<rect x="${n2(x0 + 0.5)}" y="${n2(frame.y(b.n))}" width="${n2(w)}" height="${n2(frame.y(0) - frame.y(b.n))}" fill="${TRACE}" fill-opacity="0.75" stroke="${INK}" stroke-width="0.5"><title>${b.n}</title></rect>`);
  }
  // Limit names sit above the frame; the mean's name sits inside it, beside its line, so a mean close to
  // a limit never prints over that limit's name.
  // Limits closer than a label's width (about 24 px at 11 px type) turn their names apart: LSL to the left, USL to the right.
  const close = h.lower !== null && h.upper !== null && Math.abs(frame.x(h.upper) - frame.x(h.lower)) < 24;
  const vline = (v: number, label: string, color: string, dash: string, place: 'middle' | 'end' | 'start' | 'inside'): string => {
    const x = frame.x(v);
    const px = n2(x);
    const nearRight = x > (frame.left + frame.right) / 2;
    const text =
      place === 'inside'
        ? `<text x="${n2(nearRight ? x - 3 : x + 3)}" y="${frame.top + 12}" text-anchor="${nearRight ? 'end' : 'start'}" fill="${color}">${esc(label)}</text>`
        : `<text x="${px}" y="${frame.top - 5}" text-anchor="${place}" fill="${color}">${esc(label)}</text>`;
    return `<line x1="${px}" y1="${frame.top}" x2="${px}" y2="${frame.bottom}" stroke="${color}" stroke-width="1.4"${dash ? ` stroke-dasharray="${dash}"` : ''}/>${text}`;
  };
  if (h.lower !== null) parts.push(vline(h.lower, 'LSL', INK, '', close ? 'end' : 'middle'));
  if (h.upper !== null) parts.push(vline(h.upper, 'USL', INK, '', close ? 'start' : 'middle'));
  if (h.mean !== null) parts.push(vline(h.mean, 'mean', MARK, '4 3', 'inside'));
  parts.push('</svg>');
  return parts.join('');
}
