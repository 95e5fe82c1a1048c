'use strict';
/* global require, module, process, Buffer -- CommonJS (bin/package.json) */
/* eslint-disable @typescript-eslint/no-require-imports -- a CommonJS file imports with require */
/**
 * Loads the command line's CommonJS bundle (dist/bundle/*.cjs, made by scripts/bundleCli.js) with
 * V8's code cache, so that a run deserialises each chunk's bytecode instead of parsing and compiling
 * its source (issue 21: start-up is the fixed cost of every command). Node 20 has no code cache for
 * its own module loaders, hence this small loader; it only handles the bundle's chunks and hands
 * everything else (node: modules, packages kept in node_modules) to Node's require.
 *
 * Each chunk's cache sits beside it in `<chunk>.v8cache`. The build writes them with every function
 * compiled; a run that finds a cache missing or refused (V8 refuses a cache from another V8 version
 * or other V8 flags) writes a fresh one when it exits, from what it compiled, and carries on without
 * it meanwhile. A cache is used only with the very file it was made from: V8 checks the source's
 * length, and each cache starts with a line naming the size and modification time of its chunk, so a
 * rebuilt chunk of the same length never runs stale code.
 */
const { closeSync, fstatSync, openSync, readFileSync, renameSync, rmSync, writeFileSync } = require('node:fs');
const { createRequire } = require('node:module');
const { dirname, resolve } = require('node:path');
const { Script } = require('node:vm');

/** A chunk's source as one function of the CommonJS parameters (as Node's own loader wraps a file). */
function wrapChunk(source) {
  return `(function (exports, require, module, __filename, __dirname) {${source}\n})`;
}

/** The source of a chunk and the size and time of the file it was read from (one open, no race). */
function readChunk(file) {
  const fd = openSync(file, 'r');
  try {
    const { size, mtimeMs } = fstatSync(fd);
    return { source: readFileSync(fd, 'utf8'), size, mtimeMs };
  } finally {
    closeSync(fd);
  }
}

function cacheFileOf(file) {
  return `${file}.v8cache`;
}

function cacheHeader(chunk) {
  return Buffer.from(`benchproof code cache 1 ${chunk.size} ${chunk.mtimeMs}\n`);
}

/** The cached bytecode made from exactly this chunk file, or undefined. */
function readCache(file, chunk) {
  let bytes;
  try {
    bytes = readFileSync(cacheFileOf(file));
  } catch {
    return undefined;
  }
  const header = cacheHeader(chunk);
  return bytes.length > header.length && bytes.subarray(0, header.length).equals(header) ? bytes.subarray(header.length) : undefined;
}

/**
 * Writes a chunk's cache through a temporary file and a rename, so that a run reading it at the same
 * moment sees the old cache or the new one, never half of one. Failures are ignored: a read-only
 * install simply runs without a cache.
 */
function writeCache(file, chunk, data) {
  const target = cacheFileOf(file);
  const temporary = `${target}.${process.pid}.tmp`;
  try {
    writeFileSync(temporary, Buffer.concat([cacheHeader(chunk), data]));
    renameSync(temporary, target);
  } catch {
    try {
      rmSync(temporary, { force: true });
    } catch {
      // Nothing more to tidy.
    }
  }
}

/** Loads the bundle's entry chunk and returns its exports; chunks it requires load the same way. */
function loadBundle(entry) {
  const packages = createRequire(entry);
  const loaded = new Map();
  const toCache = [];
  const requireChunk = (id) => (/^\.\.?\//.test(id) && id.endsWith('.cjs') ? load(resolve(dirname(entry), id)) : packages(id));
  requireChunk.resolve = packages.resolve;

  function load(file) {
    const known = loaded.get(file);
    if (known) return known.exports;
    // Registered before it runs, so that chunks requiring each other get the exports made so far.
    const module = { id: file, filename: file, exports: {}, loaded: false };
    loaded.set(file, module);
    const chunk = readChunk(file);
    const cachedData = readCache(file, chunk);
    const script = new Script(wrapChunk(chunk.source), { filename: file, cachedData });
    if (cachedData === undefined || script.cachedDataRejected === true) toCache.push({ file, chunk, script });
    script.runInThisContext().call(module.exports, module.exports, requireChunk, module, file, dirname(file));
    module.loaded = true;
    return module.exports;
  }

  process.once('exit', () => {
    for (const { file, chunk, script } of toCache) writeCache(file, chunk, script.createCachedData());
  });
  return load(entry);
}

module.exports = { loadBundle, wrapChunk, readChunk, readCache, writeCache, cacheFileOf };
