#!/usr/bin/env node
/* global process, setTimeout, clearTimeout */
// The long hardening run (`npm run hardening`, after `npm run build`): the tests in test/hardening
// with BENCHPROOF_HARDENING=long (thousands of fuzzed captures and specs, 100+ killed processes),
// then a summary of inputs tried, crashes, hangs, records lost, tamperings missed and hostile texts that
// reached the output raw (injected) — all but the inputs must be 0.
//
// Options: --seed N (fresh fuzz inputs; every failure names its seed), --limit-minutes M (watchdog:
// a run still going after M minutes is stopped and counted as a hang; default 90).
//
// Try:
//   npm run hardening
//   npm run hardening -- --seed 7
import { spawn } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const AREAS = ['reader', 'limits', 'spec', 'numeric', 'store-crash', 'concurrency', 'hostile-paths', 'tampering', 'injection'];
const COUNTS = ['inputs', 'crashes', 'hangs', 'lost', 'missed', 'injected'];

function option(name, fallback) {
  const i = process.argv.indexOf(name);
  return i > 0 && process.argv[i + 1] !== undefined ? process.argv[i + 1] : fallback;
}

if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) {
  process.stderr.write('hardening: benchproof is not built: run `npm run build` first (npm run hardening does).\n');
  process.exit(2);
}

const seed = option('--seed', '20260302');
const limitMs = Number(option('--limit-minutes', '90')) * 60_000;
const tallyDir = mkdtempSync(join(tmpdir(), 'benchproof-hardening-tally-'));
const started = Date.now();
process.stderr.write(`hardening: long run, seed ${seed}, watchdog ${limitMs / 60_000} min; tallies in ${tallyDir}\n`);

const vitest = spawn(process.execPath, [join(root, 'node_modules', 'vitest', 'vitest.mjs'), 'run', 'test/hardening'], {
  cwd: root,
  stdio: 'inherit',
  env: { ...process.env, BENCHPROOF_HARDENING: 'long', BENCHPROOF_HARDENING_TALLY: tallyDir, BENCHPROOF_HARDENING_SEED: seed },
});
let watchdogFired = false;
const watchdog = setTimeout(() => {
  watchdogFired = true;
  process.stderr.write(`hardening: still running after ${limitMs / 60_000} min; stopping it (counted as a hang)\n`);
  vitest.kill('SIGKILL');
}, limitMs);

vitest.on('close', (code) => {
  clearTimeout(watchdog);
  const tallies = readTallies();
  rmSync(tallyDir, { recursive: true, force: true });
  const total = { inputs: 0, crashes: 0, hangs: watchdogFired ? 1 : 0, lost: 0, missed: 0, injected: 0 };
  const lines = [];
  for (const area of AREAS) {
    const t = tallies.get(area);
    if (!t) {
      lines.push(`  ${area.padEnd(14)} no tally (the area did not run to its end)`);
      total.crashes++;
      continue;
    }
    for (const k of COUNTS) total[k] += t[k] ?? 0;
    lines.push(`  ${area.padEnd(14)} ${COUNTS.map((k) => fmt(t[k] ?? 0)).join(' ')}`);
  }
  const notes = [...tallies.values()].flatMap((t) => t.notes).slice(0, 15);
  const ok = code === 0 && COUNTS.slice(1).every((k) => total[k] === 0);
  const minutes = ((Date.now() - started) / 60_000).toFixed(1);
  process.stdout.write(
    [
      '',
      `benchproof hardening summary (seed ${seed}, ${minutes} min)`,
      `  ${'area'.padEnd(14)} ${COUNTS.map((k) => k.padStart(8)).join(' ')}`,
      ...lines,
      `  ${'total'.padEnd(14)} ${COUNTS.map((k) => fmt(total[k])).join(' ')}`,
      ...(notes.length ? ['', 'first problems:', ...notes.map((n) => `  - ${n}`)] : []),
      '',
      ok ? 'hardening: PASS (0 crashes, 0 hangs, 0 records lost or doubled, 0 tamperings missed, 0 injections reached the output)' : `hardening: FAIL (tests exit ${code}${watchdogFired ? ', watchdog fired' : ''})`,
      '',
    ].join('\n'),
  );
  process.exit(ok ? 0 : 1);
});

function fmt(n) {
  return String(n).padStart(8);
}

function readTallies() {
  const out = new Map();
  if (!existsSync(tallyDir)) return out;
  for (const f of readdirSync(tallyDir)) {
    try {
      const t = JSON.parse(readFileSync(join(tallyDir, f), 'utf8'));
      out.set(t.area, t);
    } catch {
      // A tally cut short by a killed run: that area counts as not finished.
    }
  }
  return out;
}
