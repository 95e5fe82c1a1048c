#!/usr/bin/env node
// The demo: the whole job on the shipped samples, as a technician would run it, step by step.
// Uses the embedded default store ./benchproof-data/ (BENCHPROOF_DATA or --data override it).
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readdirSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const bin = join(root, 'bin', 'benchproof.js');
const captures = 'samples/captures';
const spec = 'samples/fh210-spec.yaml';
const reports = 'benchproof-data/reports';

if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) {
  process.stderr.write('benchproof is not built yet: run `npm ci` (or `npm run build`) first.\n');
  process.exit(2);
}

function step(title, args, { allowFail = false } = {}) {
  process.stdout.write(`\n\x1b[1m━━ ${title}\x1b[0m\n$ benchproof ${args.join(' ')}\n\n`);
  const r = spawnSync(process.execPath, [bin, ...args], { cwd: root, stdio: 'inherit', env: process.env });
  if (r.status === 2 || r.status === 3 || (r.status !== 0 && !allowFail)) {
    process.stderr.write(`demo: step "${title}" ended with exit status ${r.status}\n`);
    process.exit(r.status ?? 3);
  }
  return r.status;
}

const files = (serial) =>
  readdirSync(join(root, captures))
    .filter((f) => f.startsWith(`${serial}_`))
    .map((f) => `${captures}/${f}`);
const units = [...new Set(readdirSync(join(root, captures)).map((f) => f.split('_')[0]))].sort();

process.stdout.write(
  'benchproof demo: Fernhollow Audio Lab, FH-210 "Kestrel" VCO (fictional), six units at three control settings.\n',
);

step('1. Measure one capture (triangle and pulse of a good unit at the mid setting)', ['measure', `${captures}/FK-0101_mid.csv`]);
step('2. Check the design spec itself', ['spec', 'validate', spec]);
for (const serial of units) {
  // Exit 1 means the unit failed its spec: expected for the faulty demo units.
  step(`3. Check unit ${serial} against the spec and store the run`, ['check', ...files(serial), '--spec', spec, '--operator', 'demo'], { allowFail: true });
}
step('4. Units in the store with their latest status', ['units']);
mkdirSync(join(root, reports), { recursive: true });
step('5. Test record of a faulty unit (HTML, with plots)', ['record', 'FK-0104', '--format', 'html', '--out', `${reports}/FK-0104.html`]);
step('6. Test record as Markdown', ['record', 'FK-0103', '--format', 'md']);
step('7. Batch statistics for the spec (yield, Cp, Cpk)', ['batch', '--format', 'html', '--out', `${reports}/batch.html`]);
step('7b. Batch statistics in the terminal', ['batch', '--format', 'md']);

process.stdout.write(`\nDone. Reports are in ${reports}/; the store is benchproof-data/ (runs accumulate: each demo run adds history).\n`);
