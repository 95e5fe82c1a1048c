#!/usr/bin/env node
// Regenerates the demo captures in samples/captures/ from the seeded scenario (src/syntheticCaptures/scenario.ts).
// Run after `npm run build`; the files are committed, so the demo never needs this step.
import { mkdirSync, writeFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { kestrelCalibrationFiles, kestrelSampleFiles } from '../dist/syntheticCaptures/index.js';

const out = join(dirname(fileURLToPath(import.meta.url)), '..', 'samples', 'captures');
mkdirSync(out, { recursive: true });
let bytes = 0;
for (const f of kestrelSampleFiles()) {
  writeFileSync(join(out, f.name), f.content);
  bytes += Buffer.byteLength(f.content);
}
process.stderr.write(`wrote ${kestrelSampleFiles().length} captures (${(bytes / 1e6).toFixed(2)} MB) to ${out}\n`);
// The demo calibration of FK-0104: samples/calibration/{before,after}/FK-0104_cv{0..5}.csv.
for (const f of kestrelCalibrationFiles()) {
  const file = join(out, '..', 'calibration', f.name);
  mkdirSync(dirname(file), { recursive: true });
  writeFileSync(file, f.content);
}
