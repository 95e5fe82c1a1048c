/**
 * Small inline-SVG plotting kit for reports (the SVG writer is ours): linear scales, "nice" tick steps
 * of 1, 2 or 5 × 10^k and nice bounds from d3-array (`ticks`, `nice`; the method of P. S. Heckbert,
 * "Nice Numbers for Graph Labels", Graphics Gems, 1990), axes
 * with SI-prefixed labels, and escaped text. Presentation attributes are written on the elements, so
 * a plot looks the same on screen, in print, and copied out on its own. No xmlns: inline SVG in HTML
 * needs none, and the record must not contain any URL.
 */
import { nice, ticks } from 'd3-array';
import { prefixExponent } from './reportNumbers.js';
import { group, prefixedUnit } from '../types/index.js';

export const INK = '#1f2933';
export const GRID = '#d9dee3';
export const TRACE = '#2b6c8f';
export const MARK = '#8a4b9c';
export const FIT = '#c0622b';
export const IDEAL = '#4f7a3a';
export const BAND = '#e3efe0';

export interface Scale {
  (v: number): number;
  readonly domain: readonly [number, number];
}

export function linearScale(d0: number, d1: number, r0: number, r1: number): Scale {
  const span = d1 - d0 || 1;
  const f = ((v: number) => r0 + ((v - d0) / span) * (r1 - r0)) as Scale;
  return Object.assign(f, { domain: [d0, d1] as const });
}

/**
 * Tick values covering [min, max] with about `count` steps of 1, 2 or 5 × 10^k (d3-array `ticks`),
 * never fewer than two ticks for a range that has a width.
 */
export function niceTicks(min: number, max: number, count = 5): number[] {
  if (!Number.isFinite(min) || !Number.isFinite(max)) throw new RangeError(`niceTicks: bad range ${min} … ${max}`);
  if (max < min) [min, max] = [max, min];
  if (max === min) return [min];
  // A narrow range between two steps gives one tick or none: ask for finer steps until two fit.
  for (let n = Math.max(1, count); ; n *= 2) {
    const t = ticks(min, max, n);
    if (t.length >= 2 || n > 1e6) return t.map((v) => (v === 0 ? 0 : v));
  }
}

/** Expand a range to whole tick steps (d3-array `nice`), so the data never touches the frame. */
export function niceDomain(min: number, max: number, count = 5): [number, number] {
  if (max === min) return [min - (Math.abs(min) || 1) * 0.1, max + (Math.abs(max) || 1) * 0.1];
  const [lo, hi] = nice(Math.min(min, max), Math.max(min, max), count);
  return [lo, hi];
}

export function esc(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;').replace(/'/g, '&#39;');
}

/** Shared tick label format for one axis: one SI prefix for all ticks, from the largest magnitude. */
export function tickFormat(domain: readonly [number, number], unit: string): { label: (v: number) => string; unit: string } {
  const big = Math.max(Math.abs(domain[0]), Math.abs(domain[1]));
  const exp = prefixExponent(big, unit);
  // The one prefix table and the house minus sign and digit groups (src/types/quantityText.ts).
  return { label: (v) => group(String(Number((v / 10 ** exp).toPrecision(6)))), unit: prefixedUnit(exp, unit) };
}

export interface Frame {
  readonly width: number;
  readonly height: number;
  readonly x: Scale;
  readonly y: Scale;
  readonly left: number;
  readonly right: number;
  readonly top: number;
  readonly bottom: number;
}

export function makeFrame(xDomain: readonly [number, number], yDomain: readonly [number, number], width = 640, height = 260): Frame {
  const left = 62;
  const right = width - 14;
  const top = 26;
  const bottom = height - 40;
  return {
    width,
    height,
    left,
    right,
    top,
    bottom,
    x: linearScale(xDomain[0], xDomain[1], left, right),
    y: linearScale(yDomain[0], yDomain[1], bottom, top),
  };
}

export const n2 = (v: number): string => (Math.round(v * 100) / 100).toString();

/** Opening tag with an accessible title; close with `</svg>`. */
export function svgOpen(frame: Frame, title: string, cls: string): string {
  return `<svg class="${cls}" viewBox="0 0 ${frame.width} ${frame.height}" width="${frame.width}" height="${frame.height}" role="img" aria-label="${esc(title)}" font-family="system-ui, sans-serif" font-size="11"><title>${esc(title)}</title>`;
}

/** Grid, frame, ticks and labels for both axes. */
export function axes(frame: Frame, xTicks: readonly number[], yTicks: readonly number[], xUnit: string, yUnit: string, xName: string, yName: string): string {
  const fx = tickFormat(frame.x.domain, xUnit);
  const fy = tickFormat(frame.y.domain, yUnit);
  const parts: string[] = [];
  for (const t of xTicks) {
    const px = n2(frame.x(t));
    parts.push(`<line x1="${px}" y1="${frame.top}" x2="${px}" y2="${frame.bottom}" stroke="${GRID}" stroke-width="0.6"/>`);
    parts.push(`<text x="${px}" y="${frame.bottom + 14}" text-anchor="middle" fill="${INK}">${esc(fx.label(t))}</text>`);
  }
  for (const t of yTicks) {
    const py = n2(frame.y(t));
    parts.push(`<line x1="${frame.left}" y1="${py}" x2="${frame.right}" y2="${py}" stroke="${GRID}" stroke-width="0.6"/>`);
    parts.push(`<text x="${frame.left - 6}" y="${py}" dy="0.32em" text-anchor="end" fill="${INK}">${esc(fy.label(t))}</text>`);
  }
  const w = frame.right - frame.left;
  const h = frame.bottom - frame.top;
  parts.push(`<rect x="${frame.left}" y="${frame.top}" width="${w}" height="${h}" fill="none" stroke="${INK}" stroke-width="0.8"/>`);
  const xl = fx.unit ? `${xName} (${fx.unit})` : xName;
  const yl = fy.unit ? `${yName} (${fy.unit})` : yName;
  parts.push(`<text x="${n2(frame.left + w / 2)}" y="${frame.height - 6}" text-anchor="middle" fill="${INK}">${esc(xl)}</text>`);
  parts.push(`<text transform="translate(13 ${n2(frame.top + h / 2)}) rotate(-90)" text-anchor="middle" fill="${INK}">${esc(yl)}</text>`);
  return parts.join('');
}

/** A row of legend entries above the plot area: a line sample, or a filled swatch for a band. */
export function legend(frame: Frame, items: readonly LegendItem[]): string {
  let x = frame.left;
  const y = frame.top - 10;
  return items
    .map((it) => {
      const sample = it.band
        ? `<rect x="${x}" y="${y - 5}" width="16" height="10" fill="${it.color}" stroke="${INK}" stroke-width="0.5"/>`
        : `<line x1="${x}" y1="${y}" x2="${x + 16}" y2="${y}" stroke="${it.color}" stroke-width="2.2"${it.dash ? ` stroke-dasharray="${it.dash}"` : ''}/>`;
      const s = `${sample}<text x="${x + 20}" y="${y}" dy="0.32em" fill="${INK}">${esc(it.label)}</text>`;
      x += 34 + it.label.length * 6.3;
      return s;
    })
    .join('');
}

export interface LegendItem {
  readonly color: string;
  readonly label: string;
  readonly dash?: string;
  readonly band?: boolean;
}

export function polyline(frame: Frame, xs: readonly number[], ys: readonly number[], color: string, width = 1.3): string {
  const pts: string[] = [];
  for (let i = 0; i < xs.length; i++) pts.push(`${n2(frame.x(xs[i]))},${n2(frame.y(ys[i]))}`);
  return `<polyline points="${pts.join(' ')}" fill="none" stroke="${color}" stroke-width="${width}" stroke-linejoin="round"/>`;
}
