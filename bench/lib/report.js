// The side-by-side figures as a terminal table and as Markdown (bench/results.md), from results.json's shape.
import { MIB, fmtMiB, fmtRate, fmtRatio, fmtSampleRate, fmtSeconds, markdownTable, textTable } from './stats.js';

const KIND = { gen: 'gen_capture.py', synth: 'synthesizer' };

function fileRows(files) {
  return files.map((f) => {
    const bp = f.benchproof;
    const s = f.stages ?? {};
    const samples = f.rows * (s.channels ?? 2);
    return [
      KIND[f.kind], f.label, f.bytes ? `${(f.bytes / 1e6).toFixed(f.bytes < 1e7 ? 1 : 0)} MB` : '—',
      bp.ok ? fmtSeconds(bp.medianWall) : `failed: ${bp.error ?? '?'}`,
      f.oneThread ? (f.oneThread.ok ? `${fmtSeconds(f.oneThread.medianWall)} (CPU ${fmtSeconds(f.oneThread.medianCpu)}, ${fmtMiB(f.oneThread.maxRss)})` : 'failed') : '—',
      f.peer ? (f.peer.ok ? fmtSeconds(f.peer.medianWall) : 'failed') : '—',
      fmtRatio(f.ratio),
      bp.ok ? fmtSeconds(bp.medianCpu) : '—',
      f.peer?.ok ? fmtSeconds(f.peer.medianCpu) : '—',
      fmtRatio(cpuRatio(f)),
      bp.ok ? fmtRate(f.bytes / bp.medianWall) : '—',
      bp.ok ? fmtSampleRate(samples / bp.medianWall) : '—',
      fmtMiB(bp.maxRss), f.peer ? fmtMiB(f.peer.maxRss) : '—',
      Number.isFinite(s.read) ? `${fmtSeconds(s.read)} (${fmtRate(f.bytes / s.read)})` : s.error ? 'failed' : '—',
      Number.isFinite(s.readOneThread) ? `${fmtSeconds(s.readOneThread)} (${fmtRate(f.bytes / s.readOneThread)})` : '—',
      fmtSeconds(s.timeDomain), fmtSeconds(s.spectrum),
    ];
  });
}

/** benchproof / peer median CPU time (user + system), or null. */
function cpuRatio(f) {
  const a = f.benchproof?.medianCpu;
  const b = f.peer?.medianCpu;
  return Number.isFinite(a) && Number.isFinite(b) && b > 0 ? a / b : null;
}

const FILE_HEADER = ['capture', 'rows', 'size', 'benchproof', 'bp in one thread', 'peer', 'ratio', 'bp CPU', 'peer CPU', 'CPU ratio', 'MB/s', 'samples/s', 'bp peak RSS', 'peer peak RSS', 'read+parse', 'in one thread', 'time domain', 'spectrum'];

function growthRows(growth) {
  return Object.entries(growth).flatMap(([kind, g]) => g.map((x) => [KIND[kind], x.label, fmtSeconds(x.wall), fmtRatio(x.vs1M), fmtRatio(x.perRowVs1M)]));
}

const fmtVal = (v) => (v === null || v === undefined ? '—' : Math.abs(v) >= 1000 ? v.toFixed(1) : v.toPrecision(6));
const fmtErr = (e) => (e === null || e === undefined ? '—' : `${(e * 100).toPrecision(2)} %`);

const VERDICT = { better: 'yes (better)', equal: 'yes (equal)', tie: 'tie (both < 0.01 %)', worse: 'NO', missing: 'NO (withheld)', neither: '— (neither)' };

function accuracyRows(acc) {
  return acc.map((a) => [
    a.channel, a.quantity, fmtVal(a.truthBenchproof) + (a.truthPeer !== a.truthBenchproof ? ` / ${fmtVal(a.truthPeer)}` : ''),
    fmtVal(a.benchproof), fmtErr(a.errBenchproof), fmtVal(a.peer), fmtErr(a.errPeer), VERDICT[a.verdict] ?? a.verdict,
  ]);
}

const fmtTarget = (t) => {
  if (t.value === null) return '—';
  if (t.id.startsWith('memory')) return `${fmtMiB(t.value)} (limit ${fmtMiB(t.limit)})`;
  if (t.id === 'ingest') return `${t.value.toFixed(0)} MB/s (limit ${t.limit})`;
  if (t.id === 'fixed-cost') return `${fmtSeconds(t.value)} (limit ${fmtSeconds(t.limit)})`;
  if (t.id === 'fft-4M') return `${fmtSeconds(t.value)} (limit ${fmtSeconds(t.limit)})`;
  if (t.id.startsWith('accuracy') || t.id === 'complete-10M') return `${t.value} of ${t.limit}`;
  return `${fmtRatio(t.value)} (limit ${fmtRatio(t.limit, 1)})`;
};

function sections(results, table) {
  const { files, growth, fft, accuracy, targets, fixed } = results;
  const out = [];
  if (fixed) {
    const body = fixed.ok
      ? `measure --json on ${fixed.rows} rows (${(fixed.bytes / 1e3).toFixed(0)} kB): ${fmtSeconds(fixed.medianWall)} wall, ${fmtSeconds(fixed.medianCpu)} CPU, peak ${fmtMiB(fixed.maxRss)}; node -e 0 alongside: ${fmtSeconds(fixed.nodeWall)} wall, ${fmtSeconds(fixed.nodeCpu)} CPU; medians of ${fixed.runs} alternating runs`
      : `failed: ${fixed.error}`;
    out.push(['Fixed cost of a run', body]);
  }
  out.push(['Whole-process runs (median wall time) and stages', table(FILE_HEADER, fileRows(files))]);
  const g = growthRows(growth);
  if (g.length) out.push(['Growth of benchproof end-to-end time', table(['capture', 'rows', 'wall', 'vs 1M', 'per row vs 1M'], g)]);
  if (fft) {
    const cpu = fft.cpu ? ` (CPU ${fmtSeconds(fft.cpu.cold)} and ${fmtSeconds(fft.cpu.warm)})` : '';
    const runs = fft.runs ? `; median of ${fft.runs} processes` : '';
    out.push(['FFT wrapper', fft.error ? `failed: ${fft.error}` : `${fft.points} points padded to ${fft.size}: first transform ${fmtSeconds(fft.cold)} (includes building the tables), next ${fmtSeconds(fft.warm)}${cpu}${runs}`]);
  }
  if (accuracy) out.push([`Accuracy on gen_capture.py, ${accuracy.label} rows (relative error against the generator's constants)`, table(['ch', 'quantity', 'true', 'benchproof', 'error', 'peer', 'error', 'as accurate'], accuracyRows(accuracy.rows))]);
  out.push(['Targets', table(['target', 'status', 'measured', 'note'], targets.map((t) => [t.label, t.status, fmtTarget(t), t.note ?? '']))]);
  return out;
}

export function machineLine(results) {
  const m = results.machine;
  const peer = results.peerTools ? `, peer: Python ${results.peerTools.python}, numpy ${results.peerTools.numpy}, pandas ${results.peerTools.pandas}` : '';
  return `${results.date}; ${m.nproc} cores (${m.cpuModel}), ${(m.memTotalBytes / MIB / 1024).toFixed(1)} GiB memory, Node ${m.node}${peer}; load average at start ${m.loadAverageAtStart?.join(' ') ?? '?'}`;
}

export function renderText(results) {
  const parts = sections(results, textTable).map(([title, body]) => `${title}\n${body}`);
  return [`benchproof bench: ${machineLine(results)}`, ...results.notes.map((n) => `note: ${n}`), ...parts].join('\n\n');
}

export function renderMarkdown(results) {
  const parts = sections(results, markdownTable).map(([title, body]) => `### ${title}\n\n${body}`);
  const notes = results.notes.length ? `\n${results.notes.map((n) => `- ${n}`).join('\n')}\n` : '';
  return `## Benchmark figures\n\nMeasured ${machineLine(results)}. Runs per file: ${results.options.runsLabel}.\n${notes}\n${parts.join('\n\n')}\n`;
}
