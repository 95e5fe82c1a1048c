// Run one child process, timed as a whole: wall time from the harness's clock, peak resident memory
// from GNU time's `-v` report (written to a side file so it never mixes with the program's stderr).
import { Buffer } from 'node:buffer';
import process from 'node:process';
import { clearTimeout, setTimeout } from 'node:timers';
import { spawn } from 'node:child_process';
import { existsSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { performance } from 'node:perf_hooks';

export const GNU_TIME = '/usr/bin/time';
const STDOUT_LIMIT = 64 * 1024 * 1024;
let serial = 0;

/** Peak RSS in bytes from a `time -v` report, or null. */
export function parseMaxRss(report) {
  const m = /Maximum resident set size \(kbytes\):\s*(\d+)/.exec(report);
  return m ? Number(m[1]) * 1024 : null;
}

/**
 * CPU seconds (user + system, all threads) from a `time -v` report, or null. Steadier than wall time
 * on a shared machine: time spent waiting for another process's turn on a core is not counted.
 */
export function parseCpuSeconds(report) {
  const user = /User time \(seconds\):\s*([\d.]+)/.exec(report);
  const sys = /System time \(seconds\):\s*([\d.]+)/.exec(report);
  return user && sys ? Number(user[1]) + Number(sys[1]) : null;
}

/**
 * Run `cmd args` (under GNU time when available). Never throws: returns
 * { ok, code, signal, wall, maxRss, cpu, stdout, stderr, error }.
 */
export function runTimed(cmd, args, { cwd, env, timeoutMs = 15 * 60_000, useTime = existsSync(GNU_TIME) } = {}) {
  const report = join(tmpdir(), `benchproof-bench-${process.pid}-${serial++}.time`);
  const [file, argv] = useTime ? [GNU_TIME, ['-v', '-o', report, cmd, ...args]] : [cmd, args];
  return new Promise((resolve) => {
    const out = [];
    const err = [];
    let outBytes = 0;
    let timedOut = false;
    const t0 = performance.now();
    let child;
    try {
      child = spawn(file, argv, { cwd, stdio: ['ignore', 'pipe', 'pipe'], ...(env ? { env: { ...process.env, ...env } } : {}) });
    } catch (e) {
      resolve({ ok: false, code: null, signal: null, wall: null, maxRss: null, cpu: null, stdout: '', stderr: '', error: String(e) });
      return;
    }
    const timer = setTimeout(() => {
      timedOut = true;
      child.kill('SIGKILL');
    }, timeoutMs);
    child.stdout.on('data', (b) => {
      outBytes += b.length;
      if (outBytes <= STDOUT_LIMIT) out.push(b);
    });
    child.stderr.on('data', (b) => err.push(b));
    child.on('error', (e) => err.push(Buffer.from(String(e))));
    child.on('close', (code, signal) => {
      const wall = (performance.now() - t0) / 1000;
      clearTimeout(timer);
      let maxRss = null;
      let cpu = null;
      if (useTime && existsSync(report)) {
        const text = readFileSync(report, 'utf8');
        maxRss = parseMaxRss(text);
        cpu = parseCpuSeconds(text);
        rmSync(report, { force: true });
      }
      const stderr = Buffer.concat(err).toString('utf8');
      const ok = code === 0 && !timedOut;
      const error = ok ? null : timedOut ? `timed out after ${timeoutMs / 1000} s` : `exit ${code ?? signal}: ${lastLines(stderr)}`;
      resolve({ ok, code, signal, wall, maxRss, cpu, stdout: Buffer.concat(out).toString('utf8'), stderr, error });
    });
  });
}

function lastLines(text, n = 3) {
  return text.trim().split('\n').slice(-n).join(' / ').slice(0, 400);
}

/** Parse a child's JSON stdout; null when it is not JSON. */
export function parseJson(text) {
  try {
    return JSON.parse(text);
  } catch {
    return null;
  }
}
