// The machine the figures were taken on, and the outside tools the harness needs (GNU time, the
// peer's python3 with numpy and pandas), installed from Debian's packages when missing.
import process from 'node:process';
import { spawnSync } from 'node:child_process';
import { existsSync, readFileSync } from 'node:fs';
import { cpus, totalmem } from 'node:os';
import { GNU_TIME } from './proc.js';

/** Debian's interpreter: `python3` on PATH may be a pyenv shim that does not see Debian's packages. */
export const PYTHON = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';

function sh(cmd, args, timeout = 15 * 60_000) {
  const r = spawnSync(cmd, args, { encoding: 'utf8', timeout, env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } });
  return { ok: r.status === 0, out: `${r.stdout ?? ''}${r.stderr ?? ''}`.trim() };
}

export function machineInfo() {
  const cpuModel = cpus()[0]?.model?.trim() || 'unknown';
  let memTotal = totalmem();
  try {
    const m = /MemTotal:\s*(\d+) kB/.exec(readFileSync('/proc/meminfo', 'utf8'));
    if (m) memTotal = Number(m[1]) * 1024;
  } catch {
    // /proc is Linux only; os.totalmem() stands in.
  }
  const nproc = sh('nproc', []);
  const loadavg = readLoad();
  return {
    nproc: nproc.ok ? Number(nproc.out) : cpus().length,
    memTotalBytes: memTotal,
    cpuModel,
    node: process.version,
    platform: `${process.platform} ${process.arch}`,
    loadAverageAtStart: loadavg,
  };
}

function readLoad() {
  try {
    return readFileSync('/proc/loadavg', 'utf8').split(' ').slice(0, 3).map(Number);
  } catch {
    return null;
  }
}

let aptUpdated = false;
function aptInstall(packages, log) {
  if (typeof process.getuid !== 'function' || process.getuid() !== 0) return { ok: false, out: 'not root, cannot apt-get install' };
  if (!existsSync('/usr/bin/apt-get')) return { ok: false, out: 'apt-get not found' };
  log(`installing Debian packages: ${packages.join(' ')}`);
  if (!aptUpdated) {
    sh('apt-get', ['update', '-qq']);
    aptUpdated = true;
  }
  return sh('apt-get', ['install', '-y', '-qq', ...packages]);
}

/** GNU time for peak RSS; returns true when usable. */
export function ensureGnuTime(log) {
  if (existsSync(GNU_TIME)) return true;
  const r = aptInstall(['time'], log);
  if (!r.ok) log(`peak memory will not be reported: GNU time is missing (${r.out.split('\n').pop()})`);
  return existsSync(GNU_TIME);
}

/** { ok, python, versions | note }: numpy and pandas importable, installing them when missing. */
export function ensurePeerPython(log) {
  const probe = () => sh(PYTHON, ['-c', 'import numpy, pandas; print(numpy.__version__, pandas.__version__)'], 60_000);
  let p = probe();
  if (!p.ok) {
    const r = aptInstall(['python3-numpy', 'python3-pandas'], log);
    if (!r.ok) return { ok: false, note: `peer skipped: numpy/pandas missing and could not be installed (${r.out.split('\n').pop()})` };
    p = probe();
  }
  if (!p.ok) return { ok: false, note: `peer skipped: ${PYTHON} cannot import numpy and pandas (${p.out.split('\n').pop()})` };
  const [numpy, pandas] = p.out.split(/\s+/);
  const py = sh(PYTHON, ['--version']).out.replace(/^Python\s*/, '');
  return { ok: true, python: PYTHON, versions: { python: py, numpy, pandas } };
}
