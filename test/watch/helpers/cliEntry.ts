// The command line as bin/benchproof.js runs it, but from the TypeScript sources, so a spawned
// `watch` child tests the code in the tree rather than a possibly stale build in dist/.
import { run } from '../../../src/cli/main.js';

run(process.argv.slice(2)).then((code) => {
  process.exitCode = code;
});
