// `watch` with many captures at once (issue 21): N captures of R rows land together in the watched
// folder (moved in from a staging folder on the same file system, as a copy tool finishing a batch
// does); the time until `watch` has recorded every one of them is set against N separate `check`
// processes on the same files, one file each, in the same order, into a data folder of their own.
//   target  watch ≤ 0.25 × the N check processes (wall time), with bounded memory (peak RSS)
// The N check processes are timed on the first K files (whole units, so each unit's later files
// re-read its open attempt's earlier captures, as they do under watch) and scaled to N; their CPU
// time (user + system from /proc) is scaled the same way and printed beside, since wall time on a
// shared machine moves with the load. Also printed: the watch's peak and idle RSS after the batch.
// Usage: node bench/watch.js [--captures N] [--rows R] [--check-runs K] [--dist DIR] [--keep] [--cpu-prof DIR]
//        node bench/watch.js --large-rows 22000000   memory given back after one large capture (about
//        1 GB at 22 M rows; written by bench/makeSynth.js, some minutes): idle RSS ≤ start + 64 MiB
// (--cpu-prof writes the watch process's CPU profile into DIR, for Chrome DevTools or `node bench/profile.js`.)
// (npm run bench runs it with the defaults: 1 000 captures of 20 000 rows, 30 check processes.)
import process from 'node:process';
import { spawn } from 'node:child_process';
import { closeSync, existsSync, mkdirSync, mkdtempSync, openSync, readFileSync, renameSync, rmSync, statSync, writeFileSync, writeSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { performance } from 'node:perf_hooks';
import { clearInterval, setInterval, setTimeout } from 'node:timers';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const SPEC = join(root, 'samples', 'fh210-spec.yaml');
const log = (msg) => process.stderr.write(`bench watch: ${msg}\n`);
const TARGET = 0.25;

function parseArgs(argv) {
  const opts = { captures: 1000, rows: 20_000, checkRuns: 30, dist: join(root, 'dist'), keep: false, profile: null, largeRows: null };
  for (let i = 0; i < argv.length; i++) {
    const a = argv[i];
    const next = () => argv[++i];
    if (a === '--captures') opts.captures = Number(next());
    else if (a === '--rows') opts.rows = Number(next());
    else if (a === '--check-runs') opts.checkRuns = Number(next());
    else if (a === '--dist') opts.dist = resolve(next());
    else if (a === '--keep') opts.keep = true;
    else if (a === '--cpu-prof') opts.profile = resolve(next());
    else if (a === '--large-rows') opts.largeRows = Number(next());
    else throw new Error(`bench/watch.js: unknown option ${a}`);
  }
  for (const k of ['captures', 'rows', 'checkRuns', ...(opts.largeRows === null ? [] : ['largeRows'])]) if (!Number.isInteger(opts[k]) || opts[k] < 1) throw new Error(`bench/watch.js: --${k} must be a positive integer`);
  return opts;
}

/**
 * The command as users run it: bin/benchproof.js for the build in dist/ (it takes the bundle when
 * current); for another build folder, an entry that does the same there.
 */
function entryFor(dist, work) {
  if (resolve(dist) === join(root, 'dist')) return join(root, 'bin', 'benchproof.js');
  const bundle = join(dist, 'bundle', 'main.js');
  const modules = join(dist, 'cli', 'main.js');
  const target = existsSync(bundle) && statSync(bundle).mtimeMs >= statSync(modules).mtimeMs ? bundle : modules;
  const entry = join(work, 'benchproof.mjs');
  writeFileSync(entry, `import { run } from ${JSON.stringify(pathToFileURL(target).href)};\nrun(process.argv.slice(2)).then((c) => { process.exitCode = c; });\n`);
  return entry;
}

/** Capture i: unit FK-(5000 + i/3), conditions low, mid, high in turn; every file's bytes its own (seed). */
async function writeCaptures(dir, count, rows, dist) {
  const { synthesize, writeCsvChunks, KESTREL_UNITS, KESTREL_CONDITIONS } = await import(pathToFileURL(join(dist, 'syntheticCaptures', 'index.js')).href);
  const names = [];
  for (let i = 0; i < count; i++) {
    const traits = KESTREL_UNITS[Math.floor(i / 3) % KESTREL_UNITS.length];
    const condition = KESTREL_CONDITIONS[i % 3];
    const frequency = condition.nominal * traits.frequencyScale;
    // 40 cycles per record whatever R, as a scope's timebase set for the condition gives.
    const sampleRate = (rows * frequency) / 40;
    const common = { frequency, phase: 0.137, sampleRate, samples: rows, bits: 8, seed: 70_000 + 2 * i };
    const triangle = synthesize({ ...common, shape: 'triangle', amplitude: traits.swing, offset: traits.triangleOffset, riseFraction: traits.riseFraction, noise: traits.noise, fullScale: 20 });
    const pulse = synthesize({ ...common, shape: 'pulse', amplitude: traits.pulseHigh / 2, duty: traits.riseFraction, edge: { tau: 1.5e-6 }, noise: 2 * traits.noise, fullScale: 40, seed: common.seed + 1 });
    const name = `FK-${5000 + Math.floor(i / 3)}_${condition.name}.csv`;
    const fd = openSync(join(dir, name), 'w');
    try {
      for (const chunk of writeCsvChunks([{ name: 'CH1', unit: 'V', signal: triangle }, { name: 'CH2', unit: 'V', signal: pulse }], { format: 'exponential', precision: 7 })) writeSync(fd, chunk);
    } finally {
      closeSync(fd);
    }
    names.push(name);
  }
  return names;
}

/** user + system CPU seconds of a live process and its threads (/proc/PID/stat, clock ticks of 1/100 s). */
function cpuOf(pid) {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1].split(' ');
    return (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    return null;
  }
}

function rssOf(pid, key = 'VmRSS') {
  try {
    const m = new RegExp(`${key}:\\s+(\\d+) kB`).exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return m ? Number(m[1]) * 1024 : null;
  } catch {
    return null;
  }
}

/** One child to its end, with its CPU time read just before it exits (GNU time is not needed). */
function runChild(entry, args) {
  return new Promise((done) => {
    const t0 = performance.now();
    const child = spawn(process.execPath, [entry, ...args], { cwd: root, stdio: ['ignore', 'ignore', 'pipe'], env: { ...process.env, BENCHPROOF_OPERATOR: 'bench' } });
    let err = '';
    let cpu = 0;
    child.stderr.on('data', (b) => void (err += b));
    const probe = setInterval(() => (cpu = cpuOf(child.pid) ?? cpu), 20);
    child.on('close', (code) => {
      clearInterval(probe);
      done({ code, wall: (performance.now() - t0) / 1000, cpu, err });
    });
  });
}

async function timeChecks(entry, stage, names, dataDir) {
  const walls = [];
  const cpus = [];
  for (const name of names) {
    const r = await runChild(entry, ['check', join(stage, name), '--spec', SPEC, '--data', dataDir, '--summary']);
    // 0 pass, 1 fail, 4 incomplete: all are a check that ran and stored its run.
    if (![0, 1, 4].includes(r.code)) throw new Error(`check ${name} exited ${r.code}: ${r.err.slice(-400)}`);
    walls.push(r.wall);
    cpus.push(r.cpu);
  }
  const sum = (xs) => xs.reduce((a, b) => a + b, 0);
  return { perFileWall: sum(walls) / walls.length, perFileCpu: sum(cpus) / cpus.length };
}

async function timeWatch(entry, stage, drop, dataDir, names, profile) {
  const child = spawn(process.execPath, [...(profile ? ['--cpu-prof', '--cpu-prof-dir', profile] : []), entry, 'watch', drop, '--spec', SPEC, '--data', dataDir, '--json', '--settle', '500'], {
    cwd: root, stdio: ['ignore', 'pipe', 'pipe'], env: { ...process.env, BENCHPROOF_OPERATOR: 'bench' },
  });
  let out = '';
  let err = '';
  let handled = 0;
  let checked = 0;
  const problems = [];
  const countLine = (line) => {
    if (!line.trim()) return;
    let e;
    try {
      e = JSON.parse(line);
    } catch {
      return;
    }
    if (e.event === 'checked' || e.event === 'recorded-already' || e.event === 'error' || e.event === 'unmatched') handled += 1;
    if (e.event === 'checked') checked += 1;
    else if (e.event === 'error' || e.event === 'unmatched' || e.event === 'recorded-already') problems.push(e);
  };
  const drain = (text, keep) => {
    const lines = text.split('\n');
    const rest = lines.pop();
    for (const l of lines) keep(l);
    return rest;
  };
  let started = false;
  const errLine = (line) => {
    if (line.includes('"event":"watching"')) started = true;
    else if (line.startsWith('{')) countLine(line);
  };
  child.stdout.on('data', (b) => void (out = drain(out + b, countLine)));
  child.stderr.on('data', (b) => void (err = drain(err + b, errLine)));
  const until = async (cond, ms, what) => {
    const end = Date.now() + ms;
    while (!cond()) {
      if (Date.now() > end || child.exitCode !== null) throw new Error(`watch: gave up waiting for ${what} (${handled} handled)`);
      await new Promise((r) => setTimeout(r, 20));
    }
  };
  await until(() => started, 120_000, 'the start line');
  const baseRss = rssOf(child.pid);
  const cpu0 = cpuOf(child.pid);
  const t0 = performance.now();
  for (const name of names) renameSync(join(stage, name), join(drop, name));
  let peak = 0;
  const sampler = setInterval(() => (peak = Math.max(peak, rssOf(child.pid, 'VmHWM') ?? 0)), 100);
  await until(() => handled >= names.length, 4 * 3600_000, `all ${names.length} captures`);
  const wall = (performance.now() - t0) / 1000;
  const cpu = cpuOf(child.pid) - cpu0;
  clearInterval(sampler);
  peak = Math.max(peak, rssOf(child.pid, 'VmHWM') ?? 0);
  // Idle a little, as a watch between batches does, then read what it holds.
  await new Promise((r) => setTimeout(r, 3000));
  const idleRss = rssOf(child.pid);
  child.kill('SIGTERM');
  await new Promise((r) => child.on('close', r));
  return { wall, cpu, checked, problems, baseRss, peak, idleRss };
}

/** Runs stored, and distinct capture bytes among them: both N when every capture was recorded once. */
async function countRuns(dataDir) {
  const { default: Database } = await import('better-sqlite3');
  const db = new Database(join(dataDir, 'records.db'), { readonly: true });
  try {
    const runs = db.prepare('SELECT COUNT(*) AS n FROM runs').get().n;
    const distinct = db.prepare('SELECT COUNT(DISTINCT sha256) AS n FROM run_captures').get().n;
    return { runs, distinct };
  } finally {
    db.close();
  }
}

const mib = (b) => (b === null ? '?' : `${(b / 2 ** 20).toFixed(0)} MiB`);

export async function watchLine(opts) {
  const work = mkdtempSync(join(tmpdir(), 'benchproof-bench-watch-'));
  try {
    const stage = join(work, 'stage');
    const drop = join(work, 'drop');
    mkdirSync(stage);
    mkdirSync(drop);
    const entry = entryFor(opts.dist, work);
    log(`writing ${opts.captures} captures of ${opts.rows} rows`);
    const names = await writeCaptures(stage, opts.captures, opts.rows, opts.dist);
    const sample = names.slice(0, Math.min(names.length, Math.max(3, Math.round(opts.checkRuns / 3) * 3)));
    log(`timing ${sample.length} check processes`);
    const checks = await timeChecks(entry, stage, sample, join(work, 'data-check'));
    log(`timing watch on ${names.length} captures landing at once`);
    const watch = await timeWatch(entry, stage, drop, join(work, 'data-watch'), names, opts.profile);
    const stored = await countRuns(join(work, 'data-watch'));
    const checkWall = checks.perFileWall * names.length;
    const checkCpu = checks.perFileCpu * names.length;
    const ratio = watch.wall / checkWall;
    const complete = watch.checked === names.length && stored.runs === names.length && stored.distinct === names.length;
    const status = complete && ratio <= TARGET ? 'PASS' : 'MISS';
    const line =
      `watch, ${names.length} captures of ${opts.rows} rows landing at once: ${status} — recorded in ${watch.wall.toFixed(1)} s ` +
      `(CPU ${watch.cpu.toFixed(1)} s) against ${checkWall.toFixed(0)} s for ${names.length} check processes ` +
      `(CPU ${checkCpu.toFixed(0)} s; ${(checks.perFileWall * 1000).toFixed(0)} ms each, mean of ${sample.length}): ${ratio.toFixed(3)}× (target ≤ ${TARGET}×; CPU ${(watch.cpu / checkCpu).toFixed(3)}×); ` +
      `${stored.runs} runs stored, ${watch.problems.length} not checked; watch RSS ${mib(watch.baseRss)} at start, peak ${mib(watch.peak)}, ${mib(watch.idleRss)} idle after`;
    if (watch.problems.length) log(`not checked: ${JSON.stringify(watch.problems.slice(0, 3))}`);
    return { line, status, ratio, watch, checks, stored };
  } finally {
    if (!opts.keep) rmSync(work, { recursive: true, force: true });
    else log(`kept ${work}`);
  }
}

/**
 * One large capture lands in an idle watch (issue 22: watch kept 490–700 MiB while idle after a 1 GB
 * capture). Recorded, and a few seconds after it, resident memory back within 64 MiB of the start.
 */
export async function largeCaptureLine(opts) {
  const work = mkdtempSync(join(tmpdir(), 'benchproof-bench-watch-large-'));
  try {
    const stage = join(work, 'stage');
    const drop = join(work, 'drop');
    mkdirSync(stage);
    mkdirSync(drop);
    const entry = entryFor(opts.dist, work);
    const name = 'FK-0901_mid.csv';
    log(`writing a capture of ${opts.largeRows} rows`);
    const made = await runChild(join(root, 'bench', 'makeSynth.js'), [String(opts.largeRows), join(stage, name)]);
    if (made.code !== 0) throw new Error(`bench/makeSynth.js exited ${made.code}: ${made.err.slice(-300)}`);
    const bytes = statSync(join(stage, name)).size;
    log(`timing watch on one capture of ${(bytes / 1e9).toFixed(2)} GB`);
    const w = await timeWatch(entry, stage, drop, join(work, 'data'), [name], null);
    const ok = w.checked === 1 && w.idleRss !== null && w.baseRss !== null && w.idleRss - w.baseRss <= 64 * 2 ** 20;
    return {
      status: ok ? 'PASS' : 'MISS',
      line: `watch, memory after one ${(bytes / 1e9).toFixed(2)} GB capture: ${ok ? 'PASS' : 'MISS'} — ${w.checked === 1 ? 'recorded' : `NOT recorded (${JSON.stringify(w.problems[0] ?? {})})`} in ${w.wall.toFixed(1)} s; RSS ${mib(w.baseRss)} at start, peak ${mib(w.peak)}, ${mib(w.idleRss)} idle 3 s after (target ≤ start + 64 MiB)`,
    };
  } finally {
    rmSync(work, { recursive: true, force: true });
  }
}

if (process.argv[1] && resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  const opts = parseArgs(process.argv.slice(2));
  if (!existsSync(join(opts.dist, 'cli', 'main.js'))) throw new Error(`${opts.dist} has no cli/main.js: run \`npm run build\` first`);
  (opts.largeRows === null ? watchLine(opts) : largeCaptureLine(opts)).then(
    (r) => process.stdout.write(`${r.line}\n`),
    (e) => {
      // On stdout too: npm run bench prints this script's stdout as its line.
      process.stdout.write(`watch: did not complete (${e.message})\n`);
      process.exitCode = 1;
    },
  );
}
