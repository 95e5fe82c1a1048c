/**
 * Histogram of one quantity across a batch, with the tolerance limits and the mean marked. Bin count by
 * Sturges' rule, k = ⌈log2 n⌉ + 1 (H. A. Sturges, J. Am. Stat. Assoc. 21 (1926) 65–66), bins spanning
 * the values; the axis also spans the limits so both are in view.
 */
import { INK, MARK, TRACE, axes, esc, makeFrame, n2, niceDomain, niceTicks, svgOpen } from './svgPlot.js';

export interface HistogramInput {
  readonly title: string;
  readonly unit: string;
  readonly values: readonly number[];
  readonly lower: number | null;
  readonly upper: number | null;
  readonly mean: number | null;
}

export function sturgesBins(n: number): number {
  return n < 1 ? 0 : Math.ceil(Math.log2(n)) + 1;
}

/** Counts of values in k equal bins over [lo, hi]; the top edge belongs to the last bin. */
export function binCounts(values: readonly number[], lo: number, hi: number, k: number): number[] {
  const counts = new Array<number>(k).fill(0);
  const width = (hi - lo) / k;
  for (const v of values) {
    const i = width > 0 ? Math.min(k - 1, Math.max(0, Math.floor((v - lo) / width))) : 0;
    counts[i] += 1;
  }
  return counts;
}

export function renderHistogramSvg(h: HistogramInput): string {
  if (h.values.length === 0) return '';
  const limits = [h.lower, h.upper].filter((v): v is number => v !== null);
  const vMin = Math.min(...h.values);
  const vMax = Math.max(...h.values);
  // All values equal: one narrow bin around them, 1 % of the axis wide.
  const k = vMax > vMin ? sturgesBins(h.values.length) : 1;
  const [lo, hi] = niceDomain(Math.min(vMin, ...limits), Math.max(vMax, ...limits), 6);
  const [b0, b1] = vMax > vMin ? [vMin, vMax] : [vMin - (hi - lo) * 0.005, vMax + (hi - lo) * 0.005];
  const counts = binCounts(h.values, b0, b1, k);
  const top = Math.max(...counts);
  const frame = makeFrame([lo, hi], [0, top + 1], 420, 220);
  const parts = [svgOpen(frame, h.title, 'plot histogram')];
  parts.push(axes(frame, niceTicks(lo, hi, 6), niceTicks(0, top + 1, Math.min(5, top + 1)).filter(Number.isInteger), h.unit, '', 'value', 'units'));
  const width = (b1 - b0) / k;
  counts.forEach((c, i) => {
    if (c === 0) return;
    const x0 = frame.x(b0 + i * width);
    const x1 = frame.x(b0 + (i + 1) * width);
    const w = Math.max(1.5, x1 - x0 - 1);
    parts.push(`<rect x="${n2(x0 + 0.5)}" y="${n2(frame.y(c))}" width="${n2(w)}" height="${n2(frame.y(0) - frame.y(c))}" fill="${TRACE}" fill-opacity="0.75" stroke="${INK}" stroke-width="0.5"><title>${c}</title></rect>`);
  });
  // Limit names sit above the frame; the mean's name sits inside it, beside its line, so a mean close to
  // a limit never prints over that limit's name.
  const vline = (v: number, label: string, color: string, dash: string, inside = false): string => {
    const x = frame.x(v);
    const px = n2(x);
    const nearRight = x > (frame.left + frame.right) / 2;
    const text = inside
      ? `<text x="${n2(nearRight ? x - 3 : x + 3)}" y="${frame.top + 12}" text-anchor="${nearRight ? 'end' : 'start'}" fill="${color}">${esc(label)}</text>`
      : `<text x="${px}" y="${frame.top - 4}" text-anchor="middle" fill="${color}">${esc(label)}</text>`;
    return `<line x1="${px}" y1="${frame.top}" x2="${px}" y2="${frame.bottom}" stroke="${color}" stroke-width="1.4"${dash ? ` stroke-dasharray="${dash}"` : ''}/>${text}`;
  };
  if (h.lower !== null) parts.push(vline(h.lower, 'LSL', INK, ''));
  if (h.upper !== null) parts.push(vline(h.upper, 'USL', INK, ''));
  if (h.mean !== null) parts.push(vline(h.mean, 'mean', MARK, '4 3', true));
  parts.push('</svg>');
  return parts.join('');
}
