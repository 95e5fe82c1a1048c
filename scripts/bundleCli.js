#!/usr/bin/env node
// Bundles the built command line (dist/cli/main.js, from `tsc`) into a few files in dist/bundle/, so
// that a run loads a handful of modules instead of some 120: start-up is the fixed cost of every
// `benchproof measure` (issue 21). Our own modules are bundled; packages stay in node_modules, loaded
// as they are (native modules, worker scripts and package files keep working). The capture reader's
// worker thread is a second entry. Run by `npm run build` (and so by `npm ci`); bin/benchproof.js
// uses the bundle when it is at least as new as dist/cli/main.js, and dist/cli/main.js otherwise.
import process from 'node:process';
import { rmSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build } from 'rolldown';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const out = join(root, 'dist', 'bundle');
rmSync(out, { recursive: true, force: true });
await build({
  input: {
    main: join(root, 'dist', 'cli', 'main.js'),
    pieceWorker: join(root, 'dist', 'capture', 'pieceWorker.js'),
    measureWorker: join(root, 'dist', 'cli', 'measureWorker.js'),
  },
  platform: 'node',
  // Every package import stays an import: only the project's own relative modules are bundled.
  external: (id) => id.startsWith('node:') || !(id.startsWith('.') || id.startsWith('/')),
  logLevel: 'warn',
  // A module both imported and loaded on demand by different commands simply stays in its chunk.
  checks: { ineffectiveDynamicImport: false },
  output: { dir: out, format: 'esm', entryFileNames: '[name].js', chunkFileNames: '[name]-[hash].js', sourcemap: false },
});
process.stderr.write(`bundled the command line into ${join('dist', 'bundle')} (${statSync(join(out, 'main.js')).size} bytes for main.js)\n`);
