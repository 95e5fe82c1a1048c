/**
 * A quantity across a unit's runs: one point per run with its expanded uncertainty as an error bar,
 * the tolerance as a shaded limit band (open sides run to the plot edge) and the nominal dashed.
 * A point outside the limits is drawn as a cross, inside as a circle: shape, not only colour.
 */
import { BAND, INK, MARK, axes, esc, legend, makeFrame, n2, niceDomain, niceTicks, svgOpen } from './svgPlot.js';

export interface TrendPoint {
  /** Short x label, e.g. the run's date. */
  readonly label: string;
  readonly value: number | null;
  readonly expandedUncertainty: number | null;
}

export interface TrendInput {
  readonly title: string;
  readonly unit: string;
  readonly lower: number | null;
  readonly upper: number | null;
  readonly nominal: number | null;
  readonly points: readonly TrendPoint[];
}

export function renderTrendSvg(t: TrendInput): string {
  const measured = t.points.filter((p): p is TrendPoint & { value: number } => p.value !== null);
  if (measured.length === 0) return '';
  const span = measured.flatMap((p) => [p.value - (p.expandedUncertainty ?? 0), p.value + (p.expandedUncertainty ?? 0)]);
  const limits = [t.lower, t.upper, t.nominal].filter((v): v is number => v !== null);
  const yDomain = niceDomain(Math.min(...span, ...limits), Math.max(...span, ...limits), 5);
  const n = t.points.length;
  const frame = makeFrame([0.5, n + 0.5], yDomain, 420, 220);
  const parts = [svgOpen(frame, t.title, 'plot trend')];
  const lo = t.lower ?? yDomain[0];
  const hi = t.upper ?? yDomain[1];
  const w = frame.right - frame.left;
  parts.push(`<rect x="${frame.left}" y="${n2(frame.y(hi))}" width="${w}" height="${n2(frame.y(lo) - frame.y(hi))}" fill="${BAND}"/>`);
  parts.push(axes(frame, [], niceTicks(yDomain[0], yDomain[1], 5), '', t.unit, 'run', 'value'));
  for (const limit of [t.lower, t.upper]) {
    if (limit === null) continue;
    const py = n2(frame.y(limit));
    parts.push(`<line x1="${frame.left}" y1="${py}" x2="${frame.right}" y2="${py}" stroke="${INK}" stroke-width="1"/>`);
  }
  if (t.nominal !== null) {
    const py = n2(frame.y(t.nominal));
    parts.push(`<line x1="${frame.left}" y1="${py}" x2="${frame.right}" y2="${py}" stroke="${INK}" stroke-width="0.8" stroke-dasharray="5 3"/>`);
  }
  t.points.forEach((p, i) => {
    const px = frame.x(i + 1);
    parts.push(`<text x="${n2(px)}" y="${frame.bottom + 14}" text-anchor="middle" fill="${INK}">${esc(p.label)}</text>`);
    if (p.value === null) {
      parts.push(`<text x="${n2(px)}" y="${n2((frame.top + frame.bottom) / 2)}" text-anchor="middle" fill="${INK}">n/m</text>`);
      return;
    }
    parts.push(point(frame.y, px, p.value, p.expandedUncertainty, outside(p.value, t.lower, t.upper)));
  });
  parts.push(legend(frame, [{ color: BAND, label: 'limit band', band: true }, { color: INK, label: 'nominal', dash: '5 3' }, { color: MARK, label: 'value ± U' }]));
  parts.push('</svg>');
  return parts.join('');
}

function outside(v: number, lower: number | null, upper: number | null): boolean {
  return (lower !== null && v < lower) || (upper !== null && v > upper);
}

function point(y: (v: number) => number, px: number, v: number, U: number | null, out: boolean): string {
  const bar = U !== null && U > 0 ? `<line x1="${n2(px)}" y1="${n2(y(v - U))}" x2="${n2(px)}" y2="${n2(y(v + U))}" stroke="${MARK}" stroke-width="1.2"/>` : '';
  const py = y(v);
  const mark = out
    ? `<path d="M${n2(px - 4)} ${n2(py - 4)}L${n2(px + 4)} ${n2(py + 4)}M${n2(px - 4)} ${n2(py + 4)}L${n2(px + 4)} ${n2(py - 4)}" stroke="${MARK}" stroke-width="2"/>`
    : `<circle cx="${n2(px)}" cy="${n2(py)}" r="3.5" fill="${MARK}"/>`;
  return bar + mark;
}
