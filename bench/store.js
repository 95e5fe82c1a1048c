// The shared store's targets (issue 20), on both engines: `units` and `batch` over 10 000 units × 5
// test attempts each answer in under 1 s, and a check's store step adds under 50 ms on a loopback
// PostgreSQL server. The runs are made by bench/lib/storeRuns.js (shaped like real check runs,
// verdicts of about 130 kB).
//
// Runs are written through the store API (saveRuns, one transaction per 500 runs). `units` and
// `batch` are then timed two ways: in this process as the commands call the store (a fresh store
// opened, the listing verified, the listing or batch computed), and as the commands themselves in a
// child process (node bin/benchproof.js units|batch --json), CPU time beside wall time since the
// machine is shared. The PostgreSQL half runs a cluster of its own (initdb + pg_ctl, as the postgres
// user when run as root) on a loopback TCP port; it is skipped with a note when the server binaries
// are missing.
//
// Filled stores are kept between runs in bench/data/stores/ (git-ignored): the SQLite data folders,
// and one PostgreSQL cluster folder with a database per store, each named by the schema version of
// the build that filled it, the SHA-256 of storeRuns.js and the size, and used again only when its
// filling finished (a mark written after the last run). So a rerun times the commands without
// filling for half an hour; --refill fills them again. The store step appends its runs (with new
// capture bytes each time) to the kept store, a few dozen per bench run; the store's run count is
// printed with the figures.
//
//   node bench/store.js [--units N] [--attempts N] [--check-runs N] [--engines sqlite,pg]
//                       [--compare DIST] [--stores DIR] [--refill] [--fill-only]   (after npm run build)
//
// --compare DIST also times another build (the dist/ folder of an earlier commit, e.g. made with
// `npx tsc --outDir DIST` in a worktree of it), alternating the two builds three times. An older
// build cannot open a store of a newer schema, so each schema gets a store of its own, filled by the
// first build of that schema.
import process from 'node:process';
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdirSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { createHash, randomBytes } from 'node:crypto';
import { basename, dirname, join, resolve } from 'node:path';
import { fileURLToPath } from 'node:url';
import { benchRun, fillStore, newCaptures } from './lib/storeRuns.js';

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
/** Where filled stores are kept between runs (also to profile commands on them). */
const STORES = resolve(arg('stores', join(root, 'bench', 'data', 'stores')));
const REFILL = process.argv.includes('--refill');
/** Fill (or find) the kept stores and time nothing: to make them ahead of a timed run. */
const FILL_ONLY = process.argv.includes('--fill-only');
/** What names a kept store besides the schema: the runs it was filled with and the size. */
const FILLER = `${createHash('sha256').update(readFileSync(join(root, 'bench', 'lib', 'storeRuns.js'))).digest('hex').slice(0, 12)}-${UNITS}x${ATTEMPTS}`;
/** New capture bytes for this bench run's store steps (the kept store has the earlier runs'). */
const NONCE = `${randomBytes(6).toString('hex')} `;
const PG_BIN = process.env.BENCHPROOF_PG_BIN ?? '/usr/lib/postgresql/15/bin';

const builds = [{ name: 'this build', records: await import(join(root, 'dist', 'records', 'index.js')), bin: join(root, 'bin', 'benchproof.js') }];
if (COMPARE) {
  const dist = resolve(COMPARE);
  builds.push({ name: `build in ${dist}`, records: await import(join(dist, 'records', 'index.js')), bin: join(dist, 'cli', 'main.js') });
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
    const run = benchRun(i % UNITS, ATTEMPTS + (warm ? i : CHECK_RUNS + i), Date.parse('2026-06-01T08:00:00Z') + (warm ? i : CHECK_RUNS + i) * 1000, newCaptures(warm ? i : CHECK_RUNS + i, NONCE));
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

/**
 * The bench's PostgreSQL cluster in `dir`, kept between runs: made with initdb the first time,
 * started here on a loopback port and stopped at the end. A server a killed bench run left running
 * on this folder is stopped first (it is this bench's own).
 */
function startCluster(dir) {
  for (const bin of ['initdb', 'pg_ctl', 'postgres', 'psql']) if (!existsSync(join(PG_BIN, bin))) return { skip: `PostgreSQL server binaries not found in ${PG_BIN}` };
  const asRoot = process.getuid?.() === 0;
  if (asRoot && spawnSync('id', ['postgres']).status !== 0) return { skip: 'running as root without a postgres user' };
  const run = (bin, args) => execFileSync(asRoot ? 'runuser' : join(PG_BIN, bin), asRoot ? ['-u', 'postgres', '--', join(PG_BIN, bin), ...args] : args, { stdio: 'pipe', timeout: 600_000, encoding: 'utf8' });
  const data = join(dir, 'data');
  // The server is this bench's own only while no other bench/store.js uses the folder.
  const released = claim(basename(dir));
  mkdirSync(dir, { recursive: true });
  chmodSync(dir, 0o700);
  if (asRoot) execFileSync('chown', ['postgres:', dir]);
  if (!existsSync(join(data, 'PG_VERSION'))) {
    rmSync(data, { recursive: true, force: true });
    rmSync(join(dir, 'filled'), { recursive: true, force: true });
    log(`making a PostgreSQL cluster in ${dir}`);
    run('initdb', ['-D', data, '-U', 'postgres', '--auth=trust', '-E', 'UTF8', '--locale=C', '--no-sync']);
  } else if (existsSync(join(data, 'postmaster.pid'))) {
    try {
      run('pg_ctl', ['-D', data, '-m', 'fast', '-w', 'stop']);
    } catch {
      // Not running (a stale pid file): the start below says if something is wrong.
    }
  }
  const port = 55_400 + (process.pid % 500);
  run('pg_ctl', ['-D', data, '-l', join(dir, 'log'), '-w', '-o', `-c listen_addresses=127.0.0.1 -p ${port} -c unix_socket_directories='${dir}'`, 'start']);
  const psql = (sql) => run('psql', ['-h', dir, '-p', String(port), '-U', 'postgres', '-d', 'postgres', '-tAc', sql]).trim();
  const url = (db) => `postgres://postgres@127.0.0.1:${port}/${db}`;
  const marks = join(dir, 'filled');
  mkdirSync(marks, { recursive: true });
  return {
    /** The database `name`: as kept when its filling finished (and no refill), else new and empty. */
    database: (name) => {
      const release = claim(name);
      const mark = join(marks, name);
      const kept = !REFILL && existsSync(mark) && psql(`SELECT 1 FROM pg_database WHERE datname = '${name}'`) === '1';
      if (!kept) {
        rmSync(mark, { force: true });
        psql(`DROP DATABASE IF EXISTS ${name}`);
        psql(`CREATE DATABASE ${name}`);
      }
      return { url: url(name), filled: kept, release, markFilled: () => writeFileSync(mark, `${new Date().toISOString()}\n`) };
    },
    stop: () => {
      run('pg_ctl', ['-D', data, '-m', 'fast', '-w', 'stop']);
      released();
    },
  };
}

/**
 * This process's claim on a kept store it is about to check or fill (`name` in STORES): a file made
 * exclusively, holding the pid, removed when done. Another bench/store.js still alive on the same store
 * stops this one (two fillers would remove each other's store); a claim left by a process that died is
 * taken over.
 */
function claim(name) {
  mkdirSync(STORES, { recursive: true });
  const file = join(STORES, `${name}.claimed`);
  for (;;) {
    try {
      writeFileSync(file, String(process.pid), { flag: 'wx' });
      // Only our own claim: after a takeover the file may be another process's.
      const release = () => existsSync(file) && readFileSync(file, 'utf8') === String(process.pid) && rmSync(file, { force: true });
      process.on('exit', release);
      return release;
    } catch (err) {
      if (err.code !== 'EEXIST') throw err;
      const pid = Number(readFileSync(file, 'utf8'));
      let alive = false;
      try {
        process.kill(pid, 0);
        alive = pid !== process.pid;
      } catch {
        // No such process: its claim is stale.
      }
      if (alive) throw new Error(`another bench/store.js (pid ${pid}) is using the kept store ${name} in ${STORES}; wait for it to finish`, { cause: err });
      rmSync(file, { force: true });
    }
  }
}

/** A kept SQLite data folder: as it was when its filling finished (and no refill), else removed to be filled anew. */
function keptFolder(dir) {
  const release = claim(basename(dir));
  const mark = `${dir}.filled`;
  const kept = !REFILL && existsSync(mark) && existsSync(join(dir, 'records.db'));
  if (!kept) {
    rmSync(mark, { force: true });
    rmSync(dir, { recursive: true, force: true });
  }
  mkdirSync(dirname(dir), { recursive: true });
  return { filled: kept, release, markFilled: () => writeFileSync(mark, `${new Date().toISOString()}\n`) };
}

/** The kept store's name part for a build: its schema version (an older build fills a store of its own). */
const schemaOf = (build) => `s${build.records.LATEST_SCHEMA ?? 'x'}`;

/** A little longer than the shared store keeps a closed store's connection (pgStore.ts, IDLE_MS). */
const KEEP_MS = 5_200;

const report = [];
const s2 = (x) => `${x.wall.toFixed(2)} s (CPU ${x.cpu.toFixed(2)} s${x.maxMb !== undefined ? `, ${x.maxMb.toFixed(0)} MB` : ''})`;
const say = (engine, results, fills, check, runs) => {
  for (const r of results) {
    const filled = fills.has(r.name) ? `filled ${UNITS * ATTEMPTS} runs in ${fills.get(r.name).toFixed(0)} s` : `kept store of ${UNITS * ATTEMPTS} runs`;
    report.push(
      `${engine}, ${r.name}: ${filled} (${runs} chain entries when timed); ` +
        `units command ${s2(r.cmdUnits)}, batch command ${s2(r.cmdBatch)} [target < 1 s each]; ` +
        `in process: units ${s2(r.units)}, batch ${s2(r.batch)}`,
    );
  }
  for (const [how, c] of Object.entries(check ?? {})) {
    report.push(`${engine}, this build: check's store step (${how}) median ${c.median.toFixed(1)} ms (CPU ${c.cpu.toFixed(1)} ms), p90 ${c.p90.toFixed(1)} ms [target < 50 ms on loopback]`);
  }
};

/** Each build's store on one engine: the kept one of its schema, or filled now by the first build of that schema. */
function runEngine(engine, makeTarget) {
  const ready = [];
  const fills = new Map();
  const made = new Map();
  for (const build of builds) {
    const key = schemaOf(build);
    let t = made.get(key);
    if (t === undefined) {
      t = makeTarget(build);
      made.set(key, t);
      if (t.filled) log(`${engine}: using the store kept in ${t.where} (--refill fills it again)`);
      else {
        log(`${engine}, ${build.name}: writing ${UNITS} units × ${ATTEMPTS} attempts into ${t.where}`);
        const s = t.open(build);
        try {
          fills.set(build.name, fillStore(s, UNITS, ATTEMPTS, log));
        } finally {
          s.close();
        }
        t.markFilled();
      }
    }
    ready.push({ build, ...t });
  }
  if (FILL_ONLY) {
    for (const t of made.values()) t.release();
    report.push(`${engine}: ${fills.size ? `filled ${UNITS * ATTEMPTS} runs in ${[...fills.values()][0].toFixed(0)} s` : 'kept store found'} (${ready[0].where})`);
    return;
  }
  const s = ready[0].open(ready[0].build);
  const runs = s.audit('listing').chained;
  s.close();
  log(`${engine}: timing units and batch`);
  const results = measure(engine, ready);
  log(`${engine}: timing the store step of a check`);
  const step = (warm) => measureCheckStep(() => ready[0].open(ready[0].build), warm);
  const check = CHECK_RUNS > 0 ? { 'after the open-attempt read, as check does': step(true), ...(engine.startsWith('shared') ? { 'first open of the process': step(false) } : {}) } : undefined;
  say(engine, results, fills, check, runs);
  for (const t of made.values()) t.release();
}

let cluster;
try {
  if (ENGINES.includes('sqlite')) {
    runEngine('embedded (SQLite)', (build) => {
      const data = join(STORES, `sqlite-${schemaOf(build)}-${FILLER}`);
      return { ...keptFolder(data), where: data, open: (b) => b.records.openStore(data), argv: ['--data', data], env: {} };
    });
  }
  if (ENGINES.includes('pg')) {
    cluster = startCluster(join(STORES, 'pg-cluster'));
    if (cluster.skip) report.push(`shared (PostgreSQL): skipped (${cluster.skip})`);
    else {
      runEngine('shared (PostgreSQL, loopback TCP)', (build) => {
        const name = `bench_${schemaOf(build)}_${FILLER.replace('-', '_')}`;
        const db = cluster.database(name);
        const cache = join(STORES, `pg-cache-${name}`);
        // As the command line opens it (cli/store.ts): the connection kept a moment after close.
        return { ...db, where: `database ${name} of ${join(STORES, 'pg-cluster')}`, open: (b) => b.records.openPgStore(db.url, { cacheDir: cache, keepConnection: true }), argv: ['--data', cache, '--store', db.url], env: {} };
      });
    }
  }
} finally {
  if (cluster && !cluster.skip) cluster.stop();
}
const verdictKb = (JSON.stringify(benchRun(0, 0, 0).verdict).length / 1000).toFixed(0);
process.stdout.write(`Shared store (node bench/store.js, ${new Date().toISOString()}, ${UNITS} units × ${ATTEMPTS} attempts, verdicts of ${verdictKb} kB):\n${report.map((l) => `  ${l}`).join('\n')}\n`);
