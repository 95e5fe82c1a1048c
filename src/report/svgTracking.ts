/**
 * The tracking plot of a calibration run: error in cents against step, one line per iteration (so the
 * effect of each trim shows as one line moving towards zero), the ± error limit as a shaded band.
 * Iterations differ by dash pattern and marker shape as well as colour; unmeasured steps break the line.
 */
import type { StoredCalibrationRun } from '../types/index.js';
import { BAND, FIT, IDEAL, INK, MARK, TRACE, axes, esc, legend, makeFrame, n2, niceDomain, niceTicks, svgOpen } from './svgPlot.js';
import type { Frame, LegendItem } from './svgPlot.js';
import { stepControl } from './calibrationFormat.js';

const COLORS = [FIT, TRACE, MARK, IDEAL, INK];
const DASHES = ['', '6 3', '2 2', '8 3 2 3', '4 4'];

export function renderTrackingSvg(run: StoredCalibrationRun): string {
  const iterations = run.iterations;
  if (iterations.length === 0) return '';
  const { steps, law } = iterations[iterations.length - 1].result;
  const limit = iterations[iterations.length - 1].result.limits.errorCents;
  const values = iterations.flatMap((it) => it.result.steps.map((s) => s.cents).filter((c): c is number => c !== null));
  const yDomain = niceDomain(Math.min(-limit, ...values), Math.max(limit, ...values), 6);
  const frame = makeFrame([-0.5, steps.length - 0.5], yDomain, 560, 260);
  const parts = [svgOpen(frame, `Tracking error of ${run.unit}, calibration run ${run.id}`, 'plot tracking')];
  const w = frame.right - frame.left;
  parts.push(`<rect x="${frame.left}" y="${n2(frame.y(limit))}" width="${w}" height="${n2(frame.y(-limit) - frame.y(limit))}" fill="${BAND}"/>`);
  parts.push(axes(frame, [], niceTicks(yDomain[0], yDomain[1], 6), '', '', 'step', 'error (cents)'));
  parts.push(`<line x1="${frame.left}" y1="${n2(frame.y(0))}" x2="${frame.right}" y2="${n2(frame.y(0))}" stroke="${INK}" stroke-width="0.8" stroke-dasharray="5 3"/>`);
  steps.forEach((s, i) => parts.push(`<text x="${n2(frame.x(i))}" y="${frame.bottom + 14}" text-anchor="middle" fill="${INK}">${esc(s.control === null ? s.label : stepControl(s, law))}</text>`));
  const items: LegendItem[] = [{ color: BAND, label: `±${limit} cents`, band: true }];
  iterations.forEach((it, k) => {
    const color = COLORS[k % COLORS.length];
    const dash = DASHES[k % DASHES.length];
    parts.push(iterationLine(frame, it.result.steps.map((s) => s.cents), color, dash, k));
    items.push({ color, label: `#${it.number}${it.result.label ? ` ${it.result.label}` : ''}`, ...(dash ? { dash } : {}) });
  });
  parts.push(legend(frame, items.slice(0, 6)));
  parts.push('</svg>');
  return parts.join('');
}

function iterationLine(frame: Frame, cents: readonly (number | null)[], color: string, dash: string, k: number): string {
  const segments: string[][] = [[]];
  const marks: string[] = [];
  cents.forEach((c, i) => {
    if (c === null) {
      segments.push([]);
      return;
    }
    const px = frame.x(i);
    const py = frame.y(c);
    segments[segments.length - 1].push(`${n2(px)},${n2(py)}`);
    marks.push(marker(px, py, color, k));
  });
  const lines = segments
    .filter((s) => s.length > 1)
    .map((s) => `<polyline points="${s.join(' ')}" fill="none" stroke="${color}" stroke-width="1.6"${dash ? ` stroke-dasharray="${dash}"` : ''}/>`);
  return `<g data-iteration="${k + 1}">${lines.join('')}${marks.join('')}</g>`;
}

/** Circle, square, triangle, diamond, cross: one shape per iteration. */
function marker(x: number, y: number, color: string, k: number): string {
  const r = 3.5;
  switch (k % 5) {
    case 0:
      return `<circle cx="${n2(x)}" cy="${n2(y)}" r="${r}" fill="${color}"/>`;
    case 1:
      return `<rect x="${n2(x - r)}" y="${n2(y - r)}" width="${2 * r}" height="${2 * r}" fill="${color}"/>`;
    case 2:
      return `<path d="M${n2(x)} ${n2(y - r - 1)}L${n2(x + r + 1)} ${n2(y + r)}L${n2(x - r - 1)} ${n2(y + r)}Z" fill="${color}"/>`;
    case 3:
      return `<path d="M${n2(x)} ${n2(y - r - 1)}L${n2(x + r + 1)} ${n2(y)}L${n2(x)} ${n2(y + r + 1)}L${n2(x - r - 1)} ${n2(y)}Z" fill="${color}"/>`;
    default:
      return `<path d="M${n2(x - r)} ${n2(y - r)}L${n2(x + r)} ${n2(y + r)}M${n2(x - r)} ${n2(y + r)}L${n2(x + r)} ${n2(y - r)}" stroke="${color}" stroke-width="2"/>`;
  }
}
