// The shared store's targets (issue 20), on both engines: `units` and `batch` over 10 000 units × 5
// test attempts each answer in under 1 s, and a check's store step adds under 50 ms on a loopback
// PostgreSQL server. Runs are written through the store API (saveRuns, one transaction per 1 000
// runs) in this process; `units` and `batch` are then timed as the commands run them (a fresh store
// opened and verified, the listing or the batch computed), CPU time beside wall time since the
// machine is shared. The PostgreSQL half starts a throwaway cluster (initdb + pg_ctl, as the
// postgres user when run as root) on a loopback TCP port and removes it afterwards; it is skipped
// with a note when the server binaries are missing.
//
//   node bench/store.js [--units N] [--attempts N] [--check-runs N]      (after npm run build)
import process from 'node:process';
import { execFileSync, spawnSync } from 'node:child_process';
import { chmodSync, existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createHash } from 'node:crypto';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = dirname(dirname(fileURLToPath(import.meta.url)));
const log = (msg) => process.stderr.write(`bench store: ${msg}\n`);
const arg = (name, fallback) => {
  const i = process.argv.indexOf(`--${name}`);
  return i > 0 ? Number(process.argv[i + 1]) : fallback;
};
const UNITS = arg('units', 10_000);
const ATTEMPTS = arg('attempts', 5);
const CHECK_RUNS = arg('check-runs', 30);
const PG_BIN = process.env.BENCHPROOF_PG_BIN ?? '/usr/lib/postgresql/15/bin';

const records = await import(join(root, 'dist', 'records', 'index.js'));
const SPEC_TEXT = 'name: bench store\nrevision: A\n';
const SPEC = { name: 'bench store', revision: 'A', sha256: createHash('sha256').update(SPEC_TEXT).digest('hex'), text: SPEC_TEXT };

/** A complete run of one condition with two checks (so each run closes its attempt), no capture bytes. */
function benchRun(unit, attempt, when) {
  const f = 1000 * (1 + 0.01 * Math.sin(unit * 7 + attempt));
  const check = (measurement, unitName, value, nominal, tol) => {
    const margin = Math.min(value - (nominal - tol), nominal + tol - value);
    return { condition: 'mid', output: 'out', measurement, unit: unitName, value, expandedUncertainty: tol / 20, lower: nominal - tol, upper: nominal + tol, nominal, guard: tol / 20, margin, statement: margin > tol / 20 ? 'pass' : margin >= 0 ? 'conditional-pass' : 'fail' };
  };
  const checks = [check('frequency', 'Hz', f, 1000, 15), check('dutyCycle', '%', 50 + 0.5 * Math.cos(unit + attempt), 50, 2)];
  const statement = checks.some((c) => c.statement === 'fail') ? 'fail' : checks.some((c) => c.statement === 'conditional-pass') ? 'conditional-pass' : 'pass';
  const serial = `BS-${String(unit).padStart(5, '0')}`;
  const spec = { name: SPEC.name, revision: SPEC.revision, sha256: SPEC.sha256 };
  return {
    unit: serial, startedAt: new Date(when).toISOString(), operator: 'bench', station: 'bench-store', spec: SPEC, toolVersion: '0.1.0',
    verdict: { schemaVersion: 1, unit: serial, spec, decisionRule: 'guarded', statement, conditions: [{ condition: 'mid', statement, checks }], captures: [] },
    diagnosis: { causes: [] }, captures: [],
  };
}

function fill(store) {
  const t0 = process.hrtime.bigint();
  let batch = [];
  const start = Date.parse('2026-01-05T08:00:00Z');
  for (let a = 0; a < ATTEMPTS; a++) {
    for (let u = 0; u < UNITS; u++) {
      batch.push(benchRun(u, a, start + (a * UNITS + u) * 1000));
      if (batch.length === 1000) {
        store.saveRuns(batch);
        batch = [];
      }
    }
  }
  if (batch.length) store.saveRuns(batch);
  return Number(process.hrtime.bigint() - t0) / 1e9;
}

/** Wall and CPU seconds of fn, median of n alternating repeats. */
function timed(fn, n = 3) {
  const walls = [];
  const cpus = [];
  for (let i = 0; i < n; i++) {
    const c0 = process.cpuUsage();
    const t0 = process.hrtime.bigint();
    fn();
    walls.push(Number(process.hrtime.bigint() - t0) / 1e9);
    const c = process.cpuUsage(c0);
    cpus.push((c.user + c.system) / 1e6);
  }
  const med = (xs) => [...xs].sort((x, y) => x - y)[Math.floor(xs.length / 2)];
  return { wall: med(walls), cpu: med(cpus) };
}

/** What `units` and `batch` do after opening: verify (fingerprints and chain), then list or summarise. */
function measureReads(open) {
  const units = timed(() => {
    const s = open();
    try {
      s.audit();
      if (s.listUnits().length !== UNITS) throw new Error('units: wrong count');
    } finally {
      s.close();
    }
  });
  const batch = timed(() => {
    const s = open();
    try {
      s.audit();
      records.summarizeBatch(s.runs().filter((r) => r.intact), {});
    } finally {
      s.close();
    }
  });
  return { units, batch };
}

/** A check's store step: opening the store and saving one run of a unit with history, as check does. */
function measureCheckStep(open) {
  const steps = [];
  for (let i = 0; i < CHECK_RUNS; i++) {
    const run = benchRun(i % UNITS, ATTEMPTS + i, Date.parse('2026-06-01T08:00:00Z') + i * 1000);
    const t0 = process.hrtime.bigint();
    const s = open();
    try {
      s.saveRun(run);
    } finally {
      s.close();
    }
    steps.push(Number(process.hrtime.bigint() - t0) / 1e6);
  }
  steps.sort((x, y) => x - y);
  return { median: steps[Math.floor(steps.length / 2)], p90: steps[Math.floor(steps.length * 0.9)] };
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
  return { url: `postgres://postgres@127.0.0.1:${port}/postgres`, stop: () => run('pg_ctl', ['-D', join(dir, 'data'), '-m', 'fast', '-w', 'stop']) };
}

const report = [];
const say = (engine, r, fillS, check) =>
  report.push(
    `${engine}: filled ${UNITS * ATTEMPTS} runs in ${fillS.toFixed(1)} s; units ${r.units.wall.toFixed(2)} s (CPU ${r.units.cpu.toFixed(2)} s), ` +
      `batch ${r.batch.wall.toFixed(2)} s (CPU ${r.batch.cpu.toFixed(2)} s) [target < 1 s each]; check's store step median ${check.median.toFixed(1)} ms, p90 ${check.p90.toFixed(1)} ms [target < 50 ms on loopback]`,
  );

const sqliteDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-store-'));
try {
  const data = join(sqliteDir, 'data');
  log(`embedded store: writing ${UNITS} units × ${ATTEMPTS} attempts`);
  const s = records.openStore(data);
  const fillS = fill(s);
  s.close();
  log('embedded store: timing units and batch');
  say('embedded (SQLite)', measureReads(() => records.openStore(data, { mode: 'read' })), fillS, measureCheckStep(() => records.openStore(data)));
} finally {
  rmSync(sqliteDir, { recursive: true, force: true });
}

const pgDir = mkdtempSync(join(tmpdir(), 'benchproof-bench-pg-'));
let cluster;
try {
  cluster = startCluster(pgDir);
  if (cluster.skip) report.push(`shared (PostgreSQL): skipped (${cluster.skip})`);
  else {
    const cache = join(pgDir, 'bench-data');
    const open = () => records.openPgStore(cluster.url, { cacheDir: cache });
    log(`shared store on 127.0.0.1: writing ${UNITS} units × ${ATTEMPTS} attempts`);
    const s = open();
    const fillS = fill(s);
    s.close();
    log('shared store: timing units and batch');
    say('shared (PostgreSQL, loopback TCP)', measureReads(open), fillS, measureCheckStep(open));
  }
} finally {
  if (cluster && !cluster.skip) cluster.stop();
  rmSync(pgDir, { recursive: true, force: true });
}
process.stdout.write(`Shared store (node bench/store.js, ${new Date().toISOString()}):\n${report.map((l) => `  ${l}`).join('\n')}\n`);
