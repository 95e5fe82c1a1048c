#!/usr/bin/env node
'use strict';
/* global require, process, __dirname -- CommonJS (bin/package.json) */
/* eslint-disable @typescript-eslint/no-require-imports -- a CommonJS file imports with require */
// The executable only loads the built command line; `npm ci` builds it (prepare). It takes the
// bundle (dist/bundle/main.cjs, a few files compiled from V8's code cache: the fastest start, see
// bundleLoader.js) unless it is older than the modules it was made from, e.g. after a bare `tsc`;
// then the modules themselves (dist/cli/main.js). This folder is CommonJS (bin/package.json): a
// CommonJS entry starts without setting up Node's ES module loader.
const { statSync } = require('node:fs');
const { join } = require('node:path');

const root = join(__dirname, '..');
const bundle = join(root, 'dist', 'bundle', 'main.cjs');
const modules = join(root, 'dist', 'cli', 'main.js');
const modified = (path) => statSync(path, { throwIfNoEntry: false })?.mtimeMs ?? -1;

const start = ({ run }) =>
  run(process.argv.slice(2)).then((code) => {
    process.exitCode = code;
  });

const bundleTime = modified(bundle);
const modulesTime = modified(modules);
if (bundleTime < 0 && modulesTime < 0) {
  process.stderr.write(`benchproof: the command line is not built in ${root}; run npm run build there (npm ci does it too)\n`);
  process.exitCode = 3;
} else if (bundleTime >= modulesTime) {
  start(require('./bundleLoader.js').loadBundle(bundle));
} else {
  import(require('node:url').pathToFileURL(modules).href).then(start);
}
