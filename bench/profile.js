// Where `benchproof measure` spends its time: runs it under `node --cpu-prof` and lists the
// functions with the most self time (and the stages' inclusive time), as file:function and percent.
// Usage: node bench/profile.js CAPTURE.csv [--top 25] [--keep]
import process from 'node:process';
import { mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, relative } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { runTimed } from './lib/proc.js';

const root = dirname(dirname(fileURLToPath(import.meta.url)));

/** dist/capture/lines.js → src/capture/lines.ts; node internals and packages keep a short name. */
export function sourceName(url) {
  if (!url) return '(native)';
  const path = url.replace(/^file:\/\//, '');
  const rel = relative(root, path);
  if (rel.startsWith('dist/')) return rel.replace(/^dist\//, 'src/').replace(/\.js$/, '.ts');
  const pkg = /node_modules\/((?:@[^/]+\/)?[^/]+)\/(.*)$/.exec(path);
  if (pkg) return `${pkg[1]}:${pkg[2]}`;
  return rel.startsWith('..') ? path : rel;
}

/** Self and inclusive milliseconds per function from a .cpuprofile document. */
export function summarizeProfile(profile) {
  const byId = new Map(profile.nodes.map((n) => [n.id, n]));
  const self = new Map();
  profile.samples.forEach((id, i) => self.set(id, (self.get(id) ?? 0) + (profile.timeDeltas[i] ?? 0) / 1000));
  const keyOf = (n) => {
    const f = n.callFrame;
    const name = f.functionName || '(anonymous)';
    return f.url ? `${sourceName(f.url)}:${name}` : name;
  };
  const rows = new Map();
  const row = (k) => rows.get(k) ?? rows.set(k, { key: k, self: 0, total: 0 }).get(k);
  // Inclusive time counts a function once per stack, however deeply it recurses.
  const walk = (id, onStack) => {
    const n = byId.get(id);
    const k = keyOf(n);
    let sum = self.get(id) ?? 0;
    row(k).self += sum;
    const stack = new Set(onStack).add(k);
    for (const c of n.children ?? []) sum += walk(c, stack);
    n.subtotal = sum;
    return sum;
  };
  const rootNode = profile.nodes[0];
  const all = walk(rootNode.id, new Set());
  const addTotals = (id, onStack) => {
    const n = byId.get(id);
    const k = keyOf(n);
    if (!onStack.has(k)) row(k).total += n.subtotal;
    const stack = new Set(onStack).add(k);
    for (const c of n.children ?? []) addTotals(c, stack);
  };
  addTotals(rootNode.id, new Set());
  return { totalMs: all, rows: [...rows.values()], startupMs: startupTime(profile, byId, keyOf) };
}

/** Milliseconds from the start of the profile to the first sample inside the capture or analysis stage. */
function startupTime(profile, byId, keyOf) {
  const inStage = new Map();
  const mark = (id, under) => {
    const n = byId.get(id);
    const here = under || /^src\/(capture|analysis)\//.test(keyOf(n));
    inStage.set(id, here);
    for (const c of n.children ?? []) mark(c, here);
  };
  mark(profile.nodes[0].id, false);
  let t = 0;
  for (let i = 0; i < profile.samples.length; i++) {
    t += (profile.timeDeltas[i] ?? 0) / 1000;
    if (inStage.get(profile.samples[i])) return t;
  }
  return null;
}

/** Self time grouped by where it is spent: our stages, packages, module loading, GC, the rest. */
export function byArea(rows) {
  const area = (key) => {
    if (key.startsWith('src/')) return key.split('/').slice(0, 2).join('/');
    if (key.startsWith('bin/')) return 'src/cli';
    if (/^node:internal\/(modules|bootstrap)|^node:internal\/deps\/cjs-module-lexer|compileSourceTextModule|wrapSafe/.test(key)) return 'module loading (node)';
    if (key.startsWith('node:internal/crypto')) return 'SHA-256 (node:crypto)';
    if (key.startsWith('(')) return key;
    const pkg = /^([^:]+):/.exec(key);
    if (pkg && !key.startsWith('node:') && !key.startsWith('/')) return `package ${pkg[1]}`;
    return 'other node internals and I/O';
  };
  const sums = new Map();
  for (const r of rows) sums.set(area(r.key), (sums.get(area(r.key)) ?? 0) + r.self);
  return [...sums.entries()].sort((a, b) => b[1] - a[1]);
}

async function main() {
  const args = process.argv.slice(2);
  const file = args.find((a) => !a.startsWith('--'));
  const topAt = args.indexOf('--top');
  const top = topAt >= 0 ? Number(args[topAt + 1]) : 25;
  if (!file) {
    process.stderr.write('usage: node bench/profile.js CAPTURE.csv [--top 25] [--keep]\n');
    process.exit(2);
  }
  const dir = mkdtempSync(join(tmpdir(), 'benchproof-prof-'));
  // The module tree (dist/cli/main.js), not the bundle bin/benchproof.js takes, so that each
  // function is named by its own source file.
  const entry = `import { run } from ${JSON.stringify(pathToFileURL(join(root, 'dist', 'cli', 'main.js')).href)}; process.exitCode = await run(process.argv.slice(1));`;
  const r = await runTimed(process.execPath, ['--cpu-prof', '--cpu-prof-dir', dir, '--input-type=module', '-e', entry, 'measure', file, '--json'], { cwd: root, useTime: false });
  if (!r.ok) process.stderr.write(`note: the run failed (${r.error}); profiling what ran\n`);
  // One profile per thread (CPU.<date>.<time>.<pid>.<thread>.<n>.cpuprofile): the main thread's is 0;
  // the capture reader's worker threads, on large files, write their own.
  const profiles = readdirSync(dir).filter((f) => f.endsWith('.cpuprofile'));
  const name = profiles.find((f) => f.split('.')[4] === '0') ?? profiles[0];
  if (profiles.length > 1) process.stderr.write(`note: ${profiles.length - 1} worker thread profile(s) not shown (--keep keeps them in ${dir})\n`);
  if (!name) throw new Error(`no profile written in ${dir}`);
  const { totalMs, rows, startupMs } = summarizeProfile(JSON.parse(readFileSync(join(dir, name), 'utf8')));
  const pct = (ms) => `${((100 * ms) / totalMs).toFixed(1).padStart(5)} %`;
  const line = (x, ms) => `${pct(ms)}  ${ms.toFixed(0).padStart(6)} ms  ${x.key}`;
  const out = [`profile of ${file}: ${(totalMs / 1000).toFixed(2)} s sampled, wall ${r.wall.toFixed(2)} s`];
  if (startupMs !== null) out.push(`start-up (process start to the first capture/analysis sample: module loading, CLI set-up): ${startupMs.toFixed(0)} ms (${((100 * startupMs) / totalMs).toFixed(1)} %)`);
  out.push('', 'self time:');
  out.push(...rows.sort((a, b) => b.self - a.self).slice(0, top).map((x) => line(x, x.self)));
  out.push('', 'self time by area:');
  out.push(...byArea(rows).filter(([, ms]) => ms >= totalMs / 200).map(([k, ms]) => line({ key: k }, ms)));
  out.push('', 'inclusive time of benchproof functions:');
  out.push(...rows.filter((x) => x.key.startsWith('src/')).sort((a, b) => b.total - a.total).slice(0, top).map((x) => line(x, x.total)));
  process.stdout.write(`${out.join('\n')}\n`);
  if (args.includes('--keep')) process.stderr.write(`profile kept in ${join(dir, name)}\n`);
  else rmSync(dir, { recursive: true, force: true });
}

if (process.argv[1] && fileURLToPath(import.meta.url) === process.argv[1]) {
  main().catch((e) => {
    process.stderr.write(`${e?.message ?? e}\n`);
    process.exit(1);
  });
}
