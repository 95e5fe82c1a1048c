#!/usr/bin/env node
// Bundles the built command line (dist/cli/main.js, from `tsc`) into a few files in dist/bundle/, so
// that a run loads a handful of chunks instead of some 120 modules: start-up is the fixed cost of
// every `benchproof measure` (issue 21). Run by `npm run build` (and so by `npm ci`);
// bin/benchproof.js uses the bundle when it is at least as new as dist/cli/main.js, and
// dist/cli/main.js otherwise.
//
// - The command line is one CommonJS bundle (main.cjs and chunks *.cjs, one per stage or so, loaded
//   when a command needs them), with V8 code caches beside the chunks (*.cjs.v8cache, made here with
//   every function compiled), loaded by bin/bundleLoader.js. Packages are bundled too, so that they
//   come from the cache as well, except those that must stay files in node_modules: native modules,
//   packages that start worker threads from their own files, and the web server's (started once by
//   `serve`, whose start-up does not matter). The chunks are plain ASCII without JSDoc (licence
//   comments stay), so V8 holds each source with one byte per character.
// - The worker threads' entries (the capture reader's, measure's) stay ES modules (dist/bundle/*.js):
//   the main thread starts them by file name, as when run from dist/.
import process from 'node:process';
import { readdirSync, rmSync, statSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { setFlagsFromString } from 'node:v8';
import { Script } from 'node:vm';
import { build } from 'rolldown';
import loader from '../bin/bundleLoader.js';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
const out = join(root, 'dist', 'bundle');

/** Packages left in node_modules (better-sqlite3 is native; pg's worker requires pg by path; cli-progress is required on first use). */
const KEPT_PACKAGES = new Set(['better-sqlite3', 'pg', 'fastify', '@fastify/multipart', '@fastify/static', 'cli-progress']);
const packageOf = (id) => (id.startsWith('@') ? id.split('/').slice(0, 2).join('/') : id.split('/')[0]);
const isPackage = (id) => !(id.startsWith('.') || id.startsWith('/') || id.startsWith('\0'));

/**
 * commander requires node:child_process when it loads, for commands that are separate programs
 * (ours are not); loading it also loads net, dgram and the stream modules, some 5 ms of every start.
 * Inside commander it becomes a stand-in that requires the real module on first use.
 */
const isCommandersChildProcess = (id, importer) =>
  (id === 'node:child_process' || id === 'child_process') && /[\\/]node_modules[\\/]commander[\\/]/.test(importer ?? '');
const lazyChildProcess = {
  name: 'lazy-child-process-for-commander',
  resolveId(id, importer) {
    return isCommandersChildProcess(id, importer) ? '\0lazy-child-process' : null;
  },
  load(id) {
    if (id !== '\0lazy-child-process') return null;
    return "module.exports = new Proxy({}, { get: (_, key) => require('node:child_process')[key] });";
  },
};

/**
 * A chunk runs as a vm.Script, where `import()` has no loader behind it (Node 20 offers one only as
 * an experimental feature that prints a warning), so the bundle may hold none: a module's
 * `import('node:zlib')` becomes an import of a small bundled module that re-exports the built-in,
 * which the CommonJS output loads with require. Any other `import()` left in a chunk fails the build.
 */
const DYNAMIC_BUILTIN = /\bimport\((['"])(node:[\w/]+)\1\)/g;
const builtinsWithoutImport = {
  name: 'dynamic-builtins-as-require',
  transform(code) {
    const changed = code.replace(DYNAMIC_BUILTIN, (_, q, id) => `import(${q}\0builtin:${id}${q})`);
    return changed === code ? null : changed;
  },
  resolveId(id) {
    return id.startsWith('\0builtin:') ? id : null;
  },
  load(id) {
    if (!id.startsWith('\0builtin:')) return null;
    const builtin = JSON.stringify(id.slice('\0builtin:'.length));
    return `export * from ${builtin};\nexport { default } from ${builtin};\n`;
  },
};

rmSync(out, { recursive: true, force: true });
await build({
  input: { main: join(root, 'dist', 'cli', 'main.js') },
  platform: 'node',
  plugins: [lazyChildProcess, builtinsWithoutImport],
  external: (id, importer) =>
    !isCommandersChildProcess(id, importer) && (id.startsWith('node:') || (isPackage(id) && KEPT_PACKAGES.has(packageOf(id)))),
  logLevel: 'warn',
  // A module both imported and loaded on demand by different commands simply stays in its chunk.
  checks: { ineffectiveDynamicImport: false },
  output: { dir: out, format: 'cjs', strict: true, charset: 'ascii', comments: { legal: true, annotation: false, jsdoc: false }, entryFileNames: '[name].cjs', chunkFileNames: '[name]-[hash].cjs', sourcemap: false },
});
await build({
  input: {
    pieceWorker: join(root, 'dist', 'capture', 'pieceWorker.js'),
    measureWorker: join(root, 'dist', 'cli', 'measureWorker.js'),
  },
  platform: 'node',
  // Workers start once per large file: their packages stay in node_modules, as before the bundle.
  external: (id) => id.startsWith('node:') || isPackage(id),
  logLevel: 'warn',
  output: { dir: out, format: 'esm', entryFileNames: '[name].js', chunkFileNames: 'worker-[name]-[hash].js', sourcemap: false },
});

/**
 * Writes each chunk's code cache with every function compiled (V8 compiles a function's body only
 * when first called, so a cache made right after compiling would hold little more than the top
 * level). The lazy-compilation flag is restored before the cache is made, as V8 stamps each cache
 * with the flags it was made under; a cache that this process would refuse is not written.
 */
let cached = 0;
for (const name of readdirSync(out).filter((f) => f.endsWith('.cjs'))) {
  const file = join(out, name);
  const chunk = loader.readChunk(file);
  const left = /\bimport\(\s*(['"`][^'"`]*['"`])?/.exec(chunk.source);
  if (left) throw new Error(`${name} holds ${left[0]}…): a bundle chunk cannot import() (see builtinsWithoutImport in scripts/bundleCli.js)`);
  const source = loader.wrapChunk(chunk.source);
  setFlagsFromString('--no-lazy');
  let script;
  try {
    script = new Script(source, { filename: file });
  } finally {
    setFlagsFromString('--lazy');
  }
  const data = script.createCachedData();
  if (new Script(source, { filename: file, cachedData: data }).cachedDataRejected === true) continue;
  loader.writeCache(file, chunk, data);
  cached++;
}
process.stderr.write(
  `bundled the command line into ${join('dist', 'bundle')} (${statSync(join(out, 'main.cjs')).size} bytes for main.cjs; code cache for ${cached} chunks)\n`,
);
