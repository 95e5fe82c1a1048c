// The shared store's targets (issue 20), on both engines: `units` and `batch` over 10 000 units × 5
// test attempts each answer in under 1 s, and a check's store step adds under 50 ms on a loopback
// PostgreSQL server.
//
// The runs are shaped like real check runs (the demo's): three conditions with 24 checks, three
// captures whose measurement reports carry their plot data (a waveform of 710 points and a spectrum
// of 809 bins per channel, harmonics, fits), so a verdict is about 135 kB and a diagnosis about 10 kB;
// the store step stores three new captures of 237 kB, as a check of three conditions does. The
// plot arrays come from 16 templates (made once, with a seeded generator) and each run's scalars
// vary, so filling 50 000 runs does not spend its time making random numbers.
//
// Runs are written through the store API (saveRuns, one transaction per 500 runs). `units` and
// `batch` are then timed two ways: in this process as the commands call the store (a fresh store
// opened, the listing verified, the listing or batch computed), and as the commands themselves in a
// child process (node bin/benchproof.js units|batch --json), CPU time beside wall time since the
// machine is shared. The PostgreSQL half starts a throwaway cluster (initdb + pg_ctl, as the
// postgres user when run as root) on a loopback TCP port and removes it afterwards; it is skipped
// with a note when the server binaries are missing.
//
//   node bench/store.js [--units N] [--attempts N] [--check-runs N] [--engines sqlite,pg]
//                       [--compare DIST] [--keep DIR]       (after npm run build)
//
// --compare DIST also times another build (the dist/ folder of an earlier commit, e.g. made with
// `npx tsc --outDir DIST` in a worktree of it), alternating the two builds three times. An older
// build cannot open a store of a newer schema, so each build fills a store of its own with the
// same runs.
import process from 'node:process';
import { Buffer } from 'node:buffer';
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const log = (msg) => process.stderr.write(`bench store: ${msg}\n`);
const arg = (name, fallback) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? process.argv[i + 1] : fallback;
};
const UNITS = Number(arg('units', 10_000));
const ATTEMPTS = Number(arg('attempts', 5));
const CHECK_RUNS = Number(arg('check-runs', 30));
const ENGINES = String(arg('engines', 'sqlite,pg')).split(',');
const COMPARE = arg('compare', undefined);
/** Keep the filled stores in this folder (not removed at the end), to profile commands on them. */
const KEEP = arg('keep', undefined);
const PG_BIN = process.env.BENCHPROOF_PG_BIN ?? '/usr/lib/postgresql/15/bin';

const builds = [{ name: 'this build', records: await import(join(root, 'dist', 'records', 'index.js')), bin: join(root, 'bin', 'benchproof.js') }];
if (COMPARE) {
  const dist = resolve(COMPARE);
  builds.push({ name: `build in ${dist}`, records: await import(join(dist, 'records', 'index.js')), bin: join(dist, 'cli', 'main.js') });
}

const SPEC_TEXT = 'name: bench store\nrevision: A\n';
const SPEC = { name: 'bench store', revision: 'A', sha256: createHash('sha256').update(SPEC_TEXT).digest('hex'), text: SPEC_TEXT };
const CONDITIONS = ['low', 'mid', 'high'];
const OUTPUTS = ['triangle', 'pulse'];
const MEASURED = ['frequency', 'peakToPeak', 'offset', 'symmetry'];

/** A small seeded generator (mulberry32), so every run of the bench writes the same data. */
function seeded(seed) {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** 16 plot templates: per channel a waveform, a spectrum, crossings and ramp fits, as measure reports carry them. */
const TEMPLATES = Array.from({ length: 16 }, (_, k) => {
  const rnd = seeded(1000 + k);
  const channel = () => ({
    waveform: {
      t0: 0,
      dt: 2.5065753500973592e-6,
      values: Array.from({ length: 710 }, (_, i) => Math.round((3.2 * Math.sin(i / 40) + 0.01 * rnd()) * 1e6) / 1e6),
      highLevel: 3.203125,
      lowLevel: -3.203125,
      midReference: 0.03 + 0.01 * rnd(),
      crossings: Array.from({ length: 7 }, (_, i) => (i + rnd()) * 2.5e-4),
      slopeFits: Array.from({ length: 6 }, () => ({ t1: rnd() * 1e-3, v1: 1.9 + rnd(), t2: rnd() * 1e-3, v2: -1.9 - rnd(), slope: 2.6e4 * (1 + 0.01 * rnd()) })),
    },
    spectrum: { binWidth: 48.700037082571086, dbc: Array.from({ length: 809 }, () => Math.round(-120 * rnd() * 100) / 100), window: '4-term Blackman-Harris (Harris 1978)', reference: 'fundamental' },
  });
  return { triangle: channel(), pulse: channel() };
});

const METHOD = 'least-squares fit of 30 rising and 29 falling mid-reference crossings against cycle number';

function channelReport(name, plot, rnd, f) {
  const measurements = {};
  for (const id of ['frequency', 'period', 'peakToPeak', 'offset', 'symmetry', 'riseTime', 'fallTime', 'highLevel', 'lowLevel', 'dutyCycle', 'thd', 'sinad', 'enob', 'slewRise', 'slewFall', 'overshoot', 'undershoot', 'rms', 'mean', 'crest', 'hum', 'noise', 'jitter', 'drift']) {
    measurements[id] = { value: f * (1 + 0.001 * rnd()), unit: 'Hz', uncertainty: 0.04 * (1 + rnd()), method: METHOD };
  }
  const harmonics = Array.from({ length: 20 }, (_, i) => ({ n: i + 1, frequency: f * (i + 1), amplitude: 2.5 / (i + 1) ** 2, dbc: -20 * Math.log10((i + 1) ** 2) - rnd(), ...(i % 2 === 0 ? { idealDbc: -20 * Math.log10((i + 1) ** 2) } : {}) }));
  return { name, unit: 'V', shape: name === 'pulse' ? 'pulse' : 'triangle', measurements, harmonics, harmonicsMethod: 'amplitudes of the first 20 harmonics from a Blackman-Harris-windowed spectrum, parabolic peak interpolation', warnings: [], plot };
}

/** One complete check run of a unit: three conditions, 24 checks, three captures' reports; ~135 kB of verdict. */
function benchRun(unit, attempt, when, captures = []) {
  const rnd = seeded(unit * 31 + attempt);
  const serial = `BS-${String(unit).padStart(5, '0')}`;
  const spec = { name: SPEC.name, revision: SPEC.revision, sha256: SPEC.sha256 };
  const check = (condition, output, measurement, nominal, tol) => {
    const value = nominal + tol * 0.6 * (2 * rnd() - 1);
    const U = tol / 20;
    const margin = Math.min(value - (nominal - tol), nominal + tol - value);
    return { output, condition, measurement, unit: 'Hz', lower: nominal - tol, upper: nominal + tol, nominal, value, expandedUncertainty: U, guard: U, margin, statement: margin > U ? 'pass' : margin >= 0 ? 'conditional-pass' : 'fail' };
  };
  const conditions = CONDITIONS.map((condition, ci) => {
    const checks = OUTPUTS.flatMap((output) => MEASURED.map((m, mi) => check(condition, output, m, 65.41 * 4 ** ci * (mi + 1), 1 + mi)));
    const statement = checks.some((c) => c.statement === 'fail') ? 'fail' : checks.some((c) => c.statement === 'conditional-pass') ? 'conditional-pass' : 'pass';
    return { condition, statement, checks };
  });
  const statement = conditions.some((c) => c.statement === 'fail') ? 'fail' : conditions.some((c) => c.statement === 'conditional-pass') ? 'conditional-pass' : 'pass';
  const template = TEMPLATES[(unit + attempt) % TEMPLATES.length];
  const reports = CONDITIONS.map((condition, ci) => {
    const sha256 = createHash('sha256').update(`${serial}/${attempt}/${condition}`).digest('hex');
    const f = 65.41 * 4 ** ci;
    return {
      path: `${serial}_${condition}.csv`, sha256, size: 236939, layout: 'time,triangle,pulse', unit: serial, condition,
      outputs: OUTPUTS.map((output) => ({ output, channel: output })),
      report: { schemaVersion: 1, file: `${serial}_${condition}.csv`, sha256, sampleInterval: 2.5e-6, samples: 8000, duration: 0.02, warnings: [], channels: OUTPUTS.map((o) => channelReport(o, template[o], rnd, f)) },
    };
  });
  const causes = ['switching-delay', 'current-mismatch', 'timing-capacitor'].map((id, i) => ({
    id, title: `${id.replace('-', ' ')} (bench cause ${i + 1})`, score: 1 / (i + 1),
    evidence: Array.from({ length: 8 }, (_, k) => `ramps run ${(186 + k + rnd()).toFixed(0)} mV past each threshold at the fastest condition ≈ ${(7.4 + rnd()).toFixed(1)} µs of delay per flip; seen against the design (mean over 3 condition(s)): ramp slopes against I/C −0.1 % rising, +0.0 % falling; turns +1.2 % / −0.8 % of the swing off the thresholds`),
    confirm: 'measure the comparator delay directly with a fast edge at its input',
  }));
  return {
    unit: serial, startedAt: new Date(when).toISOString(), operator: 'bench', station: 'bench-store', spec: SPEC, toolVersion: '0.1.0',
    verdict: { schemaVersion: 1, unit: serial, spec, decisionRule: 'guarded', statement, conditions, captures: reports, state: 'complete', waitingFor: [], soFar: statement },
    diagnosis: { causes },
    captures,
  };
}

/** Three new capture files' bytes for a check's store step (237 kB each, like the demo's). */
function newCaptures(i) {
  return CONDITIONS.map((condition) => {
    const rows = [`time,triangle,pulse,# bench store step ${i} ${condition}`];
    for (let k = 0, size = rows[0].length; size < 236_000 && k < 8000; k++) {
      rows.push(`${(k * 2.5e-6).toExponential(6)},${(3.2 * Math.sin(k / 40 + i)).toFixed(6)},${k % 400 < 200 ? '10.000000' : '0.000000'}`);
      size += rows[rows.length - 1].length + 1;
    }
    const bytes = Buffer.from(rows.join('\n'));
    return { path: `step${i}_${condition}.csv`, sha256: createHash('sha256').update(bytes).digest('hex'), size: bytes.length, layout: 'time,triangle,pulse', condition, bytes };
  });
}

function fill(store) {
  const t0 = process.hrtime.bigint();
  let batch = [];
  const start = Date.parse('2026-01-05T08:00:00Z');
  for (let a = 0; a < ATTEMPTS; a++) {
    for (let u = 0; u < UNITS; u++) {
      batch.push(benchRun(u, a, start + (a * UNITS + u) * 1000));
      if (batch.length === 500) {
        store.saveRuns(batch);
        batch = [];
      }
    }
    log(`  ${(a + 1) * UNITS} runs written`);
  }
  if (batch.length) store.saveRuns(batch);
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

const med = (xs) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];

/** Wall and CPU seconds of fn in this process. */
function timedOnce(fn) {
  const c0 = process.cpuUsage();
  const t0 = process.hrtime.bigint();
  fn();
  const c = process.cpuUsage(c0);
  return { wall: Number(process.hrtime.bigint() - t0) / 1e9, cpu: (c.user + c.system) / 1e6 };
}

/** What `units` and `batch` do after opening, through the store API of `build`. */
function readsOnce(build, open) {
  const light = (s) => typeof s.batchRuns === 'function';
  const units = timedOnce(() => {
    const s = open(build);
    try {
      if (light(s)) s.audit('listing');
      else s.audit();
      if (s.listUnits().length !== UNITS) throw new Error('units: wrong count');
    } finally {
      s.close();
    }
  });
  const batch = timedOnce(() => {
    const s = open(build);
    try {
      const runs = light(s) ? (s.audit('listing'), s.batchRuns()) : (s.audit(), s.runs());
      const report = build.records.summarizeBatch(runs.filter((r) => r.intact), {});
      if (report.specs[0].units.length !== UNITS) throw new Error('batch: wrong count');
    } finally {
      s.close();
    }
  });
  return { units, batch };
}

/** The command itself in a child process: wall time, and its CPU time from /usr/bin/time. */
function commandOnce(build, argv, env) {
  const t0 = process.hrtime.bigint();
  // An earlier build's modules are started through their run() (bin/benchproof.js starts this build's bundle).
  const start = build.bin.endsWith('main.js')
    ? ['--input-type=module', '-e', 'const { run } = await import(process.argv[1]); process.exitCode = await run(process.argv.slice(2));', build.bin]
    : [build.bin];
  const r = spawnSync('/usr/bin/time', ['-f', '%U %S %M', process.execPath, ...start, ...argv], { env: { ...process.env, ...env }, encoding: 'utf8', maxBuffer: 1 << 30 });
  const wall = Number(process.hrtime.bigint() - t0) / 1e9;
  if (r.status !== 0) throw new Error(`${argv.join(' ')} exited ${r.status}: ${r.stderr.slice(-400)}`);
  const [user, sys, maxKb] = r.stderr.trim().split('\n').at(-1).split(' ').map(Number);
  return { wall, cpu: user + sys, maxMb: maxKb / 1024 };
}

/** `units --json` and `batch --json` as commands, and the store API reads, each the median of three, builds alternating. */
function measure(target, readyBuilds) {
  const out = new Map(readyBuilds.map(({ build }) => [build.name, { units: [], batch: [], cmdUnits: [], cmdBatch: [] }]));
  for (let i = 0; i < 3; i++) {
    for (const { build, open, argv, env } of readyBuilds) {
      const o = out.get(build.name);
      const api = readsOnce(build, open);
      o.units.push(api.units);
      o.batch.push(api.batch);
      o.cmdUnits.push(commandOnce(build, ['units', '--json', ...argv], env));
      o.cmdBatch.push(commandOnce(build, ['batch', '--json', ...argv], env));
    }
  }
  const pick = (xs) => ({ wall: med(xs.map((x) => x.wall)), cpu: med(xs.map((x) => x.cpu)), ...(xs[0].maxMb !== undefined ? { maxMb: med(xs.map((x) => x.maxMb)) } : {}) });
  return [...out].map(([name, o]) => ({ name, target, units: pick(o.units), batch: pick(o.batch), cmdUnits: pick(o.cmdUnits), cmdBatch: pick(o.cmdBatch) }));
}

/**
 * A check's store step: opening the store and saving one run of a unit with history and three new
 * captures. As check does it, the store was opened once before in the process to read the unit's
 * open attempt (untimed; `warm`), unless the check starts a new attempt (`warm` false: the first
 * open of the process is the store step's own).
 */
function measureCheckStep(open, warm) {
  const steps = [];
  const cpus = [];
  // Ten cold steps are enough: each waits out the kept connection first.
  for (let i = 0; i < (warm ? CHECK_RUNS : Math.min(CHECK_RUNS, 10)); i++) {
    const run = benchRun(i % UNITS, ATTEMPTS + (warm ? i : CHECK_RUNS + i), Date.parse('2026-06-01T08:00:00Z') + (warm ? i : CHECK_RUNS + i) * 1000, newCaptures(warm ? i : CHECK_RUNS + i));
    if (warm) {
      const s = open();
      s.openAttempt(run.unit, run.spec.name);
      s.close();
    } else {
      // A store opened earlier in this loop must not lend its connection: wait out the kept one.
      Atomics.wait(new Int32Array(new SharedArrayBuffer(4)), 0, 0, KEEP_MS);
    }
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    const s = open();
    try {
      s.saveRun(run);
    } finally {
      s.close();
    }
    steps.push(Number(process.hrtime.bigint() - t0) / 1e6);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1e3);
  }
  const sorted = [...steps].sort((x, y) => x - y);
  return { median: med(steps), p90: sorted[Math.floor(sorted.length * 0.9)], cpu: med(cpus) };
}

function startCluster(dir) {
  for (const bin of ['initdb', 'pg_ctl', 'postgres']) if (!existsSync(join(PG_BIN, bin))) return { skip: `PostgreSQL server binaries not found in ${PG_BIN}` };
  const asRoot = process.getuid?.() === 0;
  if (asRoot && spawnSync('id', ['postgres']).status !== 0) return { skip: 'running as root without a postgres user' };
  const run = (bin, args) => execFileSync(asRoot ? 'runuser' : join(PG_BIN, bin), asRoot ? ['-u', 'postgres', '--', join(PG_BIN, bin), ...args] : args, { stdio: 'pipe', timeout: 120_000 });
  chmodSync(dir, 0o700);
  if (asRoot) execFileSync('chown', ['postgres:', dir]);
  const port = 55_400 + (process.pid % 500);
  run('initdb', ['-D', join(dir, 'data'), '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync']);
  run('pg_ctl', ['-D', join(dir, 'data'), '-l', join(dir, 'log'), '-w', '-o', `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories='${dir}'`, 'start']);
  const url = (db) => `postgres://postgres@127.0.0.1:${port}/${db}`;
  return {
    url,
    createDatabase: (name) => {
      run('psql', ['-h', dir, '-p', String(port), '-U', 'postgres', '-d', 'postgres', '-c', `CREATE DATABASE ${name}`]);
      return url(name);
    },
    stop: () => run('pg_ctl', ['-D', join(dir, 'data'), '-m', 'fast', '-w', 'stop']),
  };
}

/** A little longer than the shared store keeps a closed store's connection (pgStore.ts, IDLE_MS). */
const KEEP_MS = 5_200;

const report = [];
const s2 = (x) => `${x.wall.toFixed(2)} s (CPU ${x.cpu.toFixed(2)} s${x.maxMb !== undefined ? `, ${x.maxMb.toFixed(0)} MB` : ''})`;
const say = (engine, results, fills, check) => {
  for (const r of results) {
    report.push(
      `${engine}, ${r.name}: filled ${UNITS * ATTEMPTS} runs in ${fills.get(r.name).toFixed(0)} s; ` +
        `units command ${s2(r.cmdUnits)}, batch command ${s2(r.cmdBatch)} [target < 1 s each]; ` +
        `in process: units ${s2(r.units)}, batch ${s2(r.batch)}`,
    );
  }
  for (const [how, c] of Object.entries(check ?? {})) {
    report.push(`${engine}, this build: check's store step (${how}) median ${c.median.toFixed(1)} ms (CPU ${c.cpu.toFixed(1)} ms), p90 ${c.p90.toFixed(1)} ms [target < 50 ms on loopback]`);
  }
};

/** Each build's store on one engine, filled by that build (an older build cannot open a newer schema). */
function runEngine(engine, makeTarget) {
  const ready = [];
  const fills = new Map();
  for (const build of builds) {
    const t = makeTarget(build);
    log(`${engine}, ${build.name}: writing ${UNITS} units × ${ATTEMPTS} attempts`);
    const s = t.open(build);
    fills.set(build.name, fill(s));
    s.close();
    ready.push({ build, ...t });
  }
  log(`${engine}: timing units and batch`);
  const results = measure(engine, ready);
  log(`${engine}: timing the store step of a check`);
  const step = (warm) => measureCheckStep(() => ready[0].open(ready[0].build), warm);
  const check = CHECK_RUNS > 0 ? { 'after the open-attempt read, as check does': step(true), ...(engine.startsWith('shared') ? { 'first open of the process': step(false) } : {}) } : undefined;
  say(engine, results, fills, check);
}

const scratch = KEEP ? resolve(KEEP) : mkdtempSync(join(tmpdir(), 'benchproof-bench-store-'));
const pgDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-pg-'));
let cluster;
try {
  if (ENGINES.includes('sqlite')) {
    runEngine('embedded (SQLite)', (build) => {
      const data = join(scratch, `data-${builds.indexOf(build)}`);
      return { open: (b) => b.records.openStore(data), argv: ['--data', data], env: {} };
    });
  }
  if (ENGINES.includes('pg')) {
    cluster = startCluster(pgDir);
    if (cluster.skip) report.push(`shared (PostgreSQL): skipped (${cluster.skip})`);
    else {
      runEngine('shared (PostgreSQL, loopback TCP)', (build) => {
        const i = builds.indexOf(build);
        const url = cluster.createDatabase(`bench${i}`);
        const cache = join(scratch, `bench-data-${i}`);
        // As the command line opens it (cli/store.ts): the connection kept a moment after close.
        return { open: (b) => b.records.openPgStore(url, { cacheDir: cache, keepConnection: true }), argv: ['--data', cache, '--store', url], env: {} };
      });
    }
  }
} finally {
  if (cluster && !cluster.skip) cluster.stop();
  if (!KEEP) rmSync(scratch, { recursive: true, force: true });
  rmSync(pgDir, { recursive: true, force: true });
}
const verdictKb = (JSON.stringify(benchRun(0, 0, 0).verdict).length / 1000).toFixed(0);
process.stdout.write(`Shared store (node bench/store.js, ${new Date().toISOString()}, ${UNITS} units × ${ATTEMPTS} attempts, verdicts of ${verdictKb} kB):\n${report.map((l) => `  ${l}`).join('\n')}\n`);
