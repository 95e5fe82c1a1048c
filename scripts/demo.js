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
// Reports go beside the store, never inside it: benchproof refuses to write into its data folder.
const reports = 'benchproof-reports';

if (!existsSync(join(root, 'dist', 'cli', 'main.js'))) {
  process.stderr.write('benchproof is not built yet: run `npm ci` (or `npm run build`) first.\n');
  process.exit(2);
}

// Bold step titles only on a terminal, and never with NO_COLOR set (https://no-color.org).
const colour = process.stdout.isTTY && !process.env.NO_COLOR && process.env.TERM !== 'dumb';
const bold = (s) => (colour ? `\x1b[1m${s}\x1b[0m` : s);

function step(title, args, { allowFail = false } = {}) {
  const shown = args.map((a) => (/^[\w./:@%+=-]+$/.test(a) ? a : `"${a}"`)).join(' ');
  process.stdout.write(`\n${bold(`━━ ${title}`)}\n$ benchproof ${shown}\n\n`);
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
const calibration = (set) =>
  readdirSync(join(root, 'samples', 'calibration', set))
    .sort()
    .map((f) => `samples/calibration/${set}/${f}`);
const units = [...new Set(readdirSync(join(root, captures)).map((f) => f.split('_')[0]))].sort();

process.stdout.write(
  'benchproof demo: Fernhollow Audio Lab, FH-210 "Kestrel" VCO (fictional), six units at three control settings.\n',
);

step('1. Measure one capture (triangle and pulse of a good unit at the mid setting)', ['measure', `${captures}/FK-0101_mid.csv`]);
step('2. Check the design spec itself', ['spec', 'validate', spec]);
// Exit 1 means a unit failed its spec: expected for the faulty demo units.
step('3. Check a good unit in full, and store the run', ['check', ...files('FK-0101'), '--spec', spec, '--operator', 'demo'], { allowFail: true });
step('4. Check a faulty unit: the circuit view and the likely causes', ['check', ...files('FK-0104'), '--spec', spec, '--operator', 'demo'], { allowFail: true });
for (const serial of units.filter((u) => u !== 'FK-0101' && u !== 'FK-0104')) {
  step(`5. Check unit ${serial} (one line; the full tables are in its record)`, ['check', ...files(serial), '--spec', spec, '--operator', 'demo', '--summary'], { allowFail: true });
}
step('6. Units in the store with their latest status', ['units']);
step('7. Calibrate FK-0104 across 0…5 V: the first iteration, before trimming', ['calibrate', '--spec', spec, '--unit', 'FK-0104', '--operator', 'demo', '--iteration', 'as built', ...calibration('before')], { allowFail: true });
step('8. Calibrate FK-0104 again after turning the scale and offset trimmers', ['calibrate', '--spec', spec, '--unit', 'FK-0104', '--operator', 'demo', '--iteration', 'after scale and offset trims', ...calibration('after')], { allowFail: true });
mkdirSync(join(root, reports), { recursive: true });
step('9. Test record of FK-0104 (HTML, with waveform, spectrum and tracking plots)', ['record', 'FK-0104', '--format', 'html', '--out', `${reports}/FK-0104.html`]);
step('10. Test record of FK-0103 as Markdown', ['record', 'FK-0103', '--format', 'md']);
step('11. Batch statistics for the spec (yield, Cp, Cpk), HTML with histograms', ['batch', '--format', 'html', '--out', `${reports}/batch.html`]);
step('12. Batch statistics in the terminal', ['batch', '--format', 'md']);

process.stdout.write(`\nDone. Open ${reports}/FK-0104.html and ${reports}/batch.html in a browser. The store is ./benchproof-data/;\neach demo run adds to its history, as re-tests do at the bench (delete the folder to start afresh).\n`);
