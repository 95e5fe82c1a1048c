// Small numeric and formatting helpers of the benchmark harness.

/** Median of finite numbers; null for none. */
export function median(values) {
  const v = values.filter((x) => Number.isFinite(x)).sort((a, b) => a - b);
  if (v.length === 0) return null;
  const mid = v.length >> 1;
  return v.length % 2 ? v[mid] : (v[mid - 1] + v[mid]) / 2;
}

/** a / b, or null when either is missing or b is not positive. */
export function ratio(a, b) {
  return Number.isFinite(a) && Number.isFinite(b) && b > 0 ? a / b : null;
}

export const MIB = 1024 * 1024;

export function fmtSeconds(s) {
  if (!Number.isFinite(s)) return '—';
  if (s < 0.01) return `${(s * 1000).toFixed(2)} ms`;
  if (s < 1) return `${(s * 1000).toFixed(0)} ms`;
  return `${s.toFixed(2)} s`;
}

export function fmtMiB(bytes) {
  return Number.isFinite(bytes) ? `${(bytes / MIB).toFixed(0)} MiB` : '—';
}

export function fmtRatio(r, digits = 2) {
  return Number.isFinite(r) ? `${r.toFixed(digits)}×` : '—';
}

/** Bytes per second as MB/s (10^6, as disk and network rates are quoted). */
export function fmtRate(bytesPerSecond) {
  if (!Number.isFinite(bytesPerSecond)) return '—';
  const mb = bytesPerSecond / 1e6;
  return `${mb.toFixed(mb < 10 ? 1 : 0)} MB/s`;
}

/** Samples per second as M/s (k/s below a million). */
export function fmtSampleRate(perSecond) {
  if (!Number.isFinite(perSecond)) return '—';
  return perSecond >= 1e6 ? `${(perSecond / 1e6).toFixed(1)} M/s` : `${(perSecond / 1e3).toFixed(0)} k/s`;
}

/** A Markdown table from a header row and body rows of strings. */
export function markdownTable(header, rows) {
  const line = (cells) => `| ${cells.join(' | ')} |`;
  return [line(header), line(header.map(() => '---')), ...rows.map(line)].join('\n');
}

/** A plain aligned text table for the terminal. */
export function textTable(header, rows) {
  const all = [header, ...rows];
  const width = header.map((_, c) => Math.max(...all.map((r) => String(r[c] ?? '').length)));
  const fmt = (r) => r.map((cell, c) => String(cell ?? '').padEnd(width[c])).join('  ').trimEnd();
  return [fmt(header), width.map((w) => '-'.repeat(w)).join('  '), ...rows.map(fmt)].join('\n');
}
