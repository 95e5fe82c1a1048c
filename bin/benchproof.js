#!/usr/bin/env node
// The executable only loads the built command line; `npm ci` builds it (prepare).
import { run } from '../dist/cli/main.js';

run(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
