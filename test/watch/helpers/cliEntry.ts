// The command line as bin/benchproof.js runs it, but from the TypeScript sources: a spawned `watch`
// child runs this when the build in dist/ is older than the sources (child.ts), so it never tests a stale build.
import { run } from '../../../src/cli/main.js';

run(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
