#!/usr/bin/env node
// The executable only loads the built command line; `npm ci` builds it (prepare). It takes the bundle
// (dist/bundle, a few files: faster to start) unless it is older than the modules it was made from,
// e.g. after a bare `tsc`; then the modules themselves (dist/cli/main.js).
import process from 'node:process';
import { statSync } from 'node:fs';
import { URL } from 'node:url';

const modified = (path) => {
  try {
    return statSync(new URL(path, import.meta.url)).mtimeMs;
  } catch {
    return -1;
  }
};
const entry = modified('../dist/bundle/main.js') >= modified('../dist/cli/main.js') ? '../dist/bundle/main.js' : '../dist/cli/main.js';
const { run } = await import(entry);

run(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
