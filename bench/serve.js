// The bench page's speed and memory (issue 19), against the built server in dist/:
//   board     GET /api/board with 2 000 units in the records          target < 300 ms, the first answer after a run lands and a repeat
//   zoom      one zoom step on a 10 M-sample capture (plot columns)   target < 100 ms (median of 8 steps)
//   memory    the server's heap after 500 dropped captures            target: flat (growth from drop 100 to 500 < 16 MiB)
// Usage: node bench/serve.js [--only board|zoom|memory] [--units N] [--rows N] [--drops N]   (npm run bench runs it last)
// Run node with --expose-gc for the memory line (bench/run.js does); without it the heap is read as is.
/* global fetch, URLSearchParams, FormData, Blob -- Node 20 has them built in */
import process from 'node:process';
import { mkdtempSync, readFileSync, rmSync, symlinkSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { ensureCapture } from './lib/data.js';
import { median } from './lib/stats.js';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const dist = (p) => import(join(root, 'dist', p));
const log = (msg) => process.stderr.write(`bench serve: ${msg}\n`);
const SPEC = join(root, 'samples', 'fh210-spec.yaml');
const quietIo = (cwd) => ({ stdout: () => {}, stderr: () => {}, stdoutIsTTY: false, stderrIsTTY: false, env: { BENCHPROOF_OPERATOR: 'bench' }, cwd });

async function startServer(dataDir, extra = {}) {
  const [{ createContext }, { startBenchServer }] = await Promise.all([dist('cli/context.js'), dist('server/benchServer.js')]);
  const server = await startBenchServer(createContext(quietIo(root)), { host: '127.0.0.1', port: 0, flags: { data: dataDir }, specFile: SPEC, ...extra });
  return { server, base: server.url.replace(/\/$/, '') };
}

async function checkedUnit(files) {
  const [{ createContext }, run] = await Promise.all([dist('cli/context.js'), dist('cli/checkRun.js')]);
  const ctx = createContext(quietIo(root));
  const { spec, text } = run.loadSpec(ctx, SPEC);
  const [unit] = await run.checkPlans(ctx, spec, files.map((f) => run.planCapture(spec, f, {})), {});
  return { ctx, unit, text, runOf: run.runOf };
}

async function timed(fn) {
  const t = process.hrtime.bigint();
  await fn();
  return Number(process.hrtime.bigint() - t) / 1e6;
}

/** Wall time and CPU time (user + system, this process: the server runs in it) of one call, in ms. */
async function clocked(fn) {
  const cpu = process.cpuUsage();
  const wall = await timed(fn);
  const used = process.cpuUsage(cpu);
  return { wall, cpu: (used.user + used.system) / 1000 };
}

export async function boardLine(units = 2000) {
  const dataDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-board-'));
  try {
    const { openStore } = await dist('records/index.js');
    const files = ['low', 'mid', 'high'].map((c) => join(root, 'samples', 'captures', `FK-0101_${c}.csv`));
    const { ctx, unit, text, runOf } = await checkedUnit(files);
    const store = openStore(dataDir, { mode: 'write' });
    log(`storing ${units} units`);
    for (let i = 0; i < units; i++) {
      const serial = `FK-${String(2000 + i).padStart(4, '0')}`;
      const run = runOf(ctx, { verdict: { ...unit.verdict, unit: serial }, diagnosis: unit.diagnosis }, { operator: 'bench', station: 'bench' }, new Date(Date.UTC(2026, 0, 1, 0, 0, i)).toISOString(), text);
      store.saveRun({ ...run, unit: serial });
    }
    store.close();
    const { server, base } = await startServer(dataDir);
    let count = 0;
    const ask = () => clocked(async () => (count = (await (await fetch(`${base}/api/board`)).json()).units.length));
    // The server's first answer verifies every row once (its start-up pass). After that a change is
    // a run landing from another writer (here a second store handle, as `check` in another terminal):
    // the next answer verifies only what was added since the chain head it verified last.
    const start = await ask();
    const firsts = [];
    const again = [];
    for (let i = 0; i < 7; i++) {
      const writer = openStore(dataDir, { mode: 'write' });
      const serial = `FK-${String(2000 + units + i).padStart(4, '0')}`;
      const run = runOf(ctx, { verdict: { ...unit.verdict, unit: serial }, diagnosis: unit.diagnosis }, { operator: 'bench', station: 'bench' }, new Date().toISOString(), text);
      writer.saveRun({ ...run, unit: serial });
      writer.close();
      firsts.push(await ask());
      if (process.env.BENCH_SERVE_TRACE) log(`after run ${i + 1}: ${firsts.at(-1).wall.toFixed(0)} ms (CPU ${firsts.at(-1).cpu.toFixed(0)} ms)`);
      for (let k = 0; k < 3; k++) again.push(await ask());
    }
    await server.close();
    const m = (list, key) => median(list.map((x) => x[key]));
    const worst = Math.max(...firsts.map((x) => x.wall));
    return {
      target: `board with ${units} units answers < 300 ms (first answer after a run lands, and a repeat)`,
      measured: `${m(firsts, 'wall').toFixed(0)} ms the first time after a run landed (median of ${firsts.length}, slowest ${worst.toFixed(0)} ms; CPU ${m(firsts, 'cpu').toFixed(0)} ms), ${m(again, 'wall').toFixed(0)} ms again (median of ${again.length}; CPU ${m(again, 'cpu').toFixed(0)} ms); the server's start-up pass over all ${units} units took ${(start.wall / 1000).toFixed(1)} s (CPU ${(start.cpu / 1000).toFixed(1)} s)`,
      status: count === units + firsts.length && m(firsts, 'wall') < 300 && m(again, 'wall') < 300 ? 'PASS' : 'FAIL',
    };
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}

export async function zoomLine(rows = 10_000_000) {
  const dataDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-zoom-'));
  const work = mkdtempSync(join(tmpdir(), 'benchproof-bench-zoomfile-'));
  try {
    const cap = await ensureCapture('synth', rows, { root, dataDir: join(root, 'bench', 'data'), regenerate: false });
    if (!cap.ok) return { target: 'zoom step on a 10 M-sample capture < 100 ms', measured: cap.error, status: 'FAIL' };
    const named = join(work, 'FK-0199_mid.csv');
    symlinkSync(cap.file, named);
    log(`checking and storing ${rows} rows (${(cap.bytes / 1e6).toFixed(0)} MB)`);
    const { ctx, unit, text, runOf } = await checkedUnit([named]);
    const { openStore } = await dist('records/index.js');
    const store = openStore(dataDir, { mode: 'write' });
    const saved = store.saveRun(runOf(ctx, unit, { operator: 'bench', station: 'bench' }, new Date().toISOString(), text));
    store.close();
    const { server, base } = await startServer(dataDir);
    const c = saved.captures[0];
    const q = new URLSearchParams({ unit: saved.unit, run: String(saved.id), sha: c.sha256, channel: unit.verdict.captures[0].report.channels[0].name, width: '1200' });
    let whole = (await (await fetch(`${base}/api/plot/wave?${q}`)).json()).whole; // reads the archived capture once
    const times = [];
    let span = whole.to - whole.from;
    let from = whole.from;
    for (let step = 0; step < 9; step++) {
      // Zoom in by half about the middle, then pan a quarter: the steps a user makes.
      span /= 2;
      from += span / 4;
      q.set('from', String(from));
      q.set('to', String(from + span));
      const ms = await timed(async () => void (await (await fetch(`${base}/api/plot/wave?${q}`)).json()));
      if (step > 0) times.push(ms);
    }
    q.delete('from');
    q.delete('to');
    times.push(await timed(async () => void (whole = (await (await fetch(`${base}/api/plot/wave?${q}`)).json()).whole)));
    await server.close();
    const ms = median(times);
    return { target: `zoom step on a ${(rows / 1e6).toFixed(0)} M-sample capture < 100 ms`, measured: `${ms.toFixed(0)} ms median, ${Math.max(...times).toFixed(0)} ms slowest (the whole record: ${times.at(-1).toFixed(0)} ms)`, status: ms < 100 ? 'PASS' : 'FAIL' };
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
    rmSync(work, { recursive: true, force: true });
  }
}

export async function memoryLine(drops = 500) {
  const dataDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-mem-'));
  try {
    const { server, base } = await startServer(dataDir);
    const bytes = readFileSync(join(root, 'samples', 'captures', 'FK-0104_mid.csv'));
    const heap = () => {
      globalThis.gc?.();
      return process.memoryUsage().heapUsed / 2 ** 20;
    };
    const marks = {};
    for (let i = 1; i <= drops; i++) {
      const form = new FormData();
      form.append('file', new Blob([bytes]), `FK-${String(3000 + (i % 50)).padStart(4, '0')}_mid.csv`);
      const res = await fetch(`${base}/api/drop`, { method: 'POST', headers: { Origin: base }, body: form });
      if (res.status !== 200) throw new Error(`drop ${i} answered ${res.status}: ${await res.text()}`);
      if (i === 100 || i === drops) marks[i] = heap();
      if (i % 100 === 0) log(`${i} drops, heap ${heap().toFixed(1)} MiB`);
    }
    await server.close();
    const growth = marks[drops] - marks[100];
    return { target: `memory flat over ${drops} drops (heap growth from drop 100 < 16 MiB)`, measured: `heap ${marks[100].toFixed(1)} → ${marks[drops].toFixed(1)} MiB (${growth >= 0 ? '+' : ''}${growth.toFixed(1)} MiB)${globalThis.gc ? '' : ' (without --expose-gc)'}`, status: growth < 16 ? 'PASS' : 'FAIL' };
  } finally {
    rmSync(dataDir, { recursive: true, force: true });
  }
}

export async function serveLines(only, sizes = {}) {
  const lines = [];
  for (const [name, fn, size] of [['board', boardLine, sizes.units], ['zoom', zoomLine, sizes.rows], ['memory', memoryLine, sizes.drops]]) {
    if (only && only !== name) continue;
    log(`measuring ${name}`);
    try {
      lines.push(await fn(size));
    } catch (err) {
      lines.push({ target: name, measured: `did not complete: ${err.message}`, status: 'FAIL' });
    }
  }
  return lines;
}

export function renderServeLines(lines) {
  return ['| bench page target | status | measured |', '|---|---|---|', ...lines.map((l) => `| ${l.target} | ${l.status} | ${l.measured} |`)].join('\n');
}

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const args = process.argv.slice(2);
  const only = args.includes('--only') ? args[args.indexOf('--only') + 1] : undefined;
  const size = (flag) => (args.includes(flag) ? Number(args[args.indexOf(flag) + 1]) : undefined);
  const lines = await serveLines(only, { units: size('--units'), rows: size('--rows'), drops: size('--drops') });
  process.stdout.write(`${renderServeLines(lines)}\n`);
}
