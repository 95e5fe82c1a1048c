import { defineConfig } from 'vitest/config';
import { slowFirst } from './test/helpers/slowFirstSequencer.ts';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    reporters: ['default', './test/helpers/summaryReporter.ts'],
    // One seed for every property-based run, printed with a failure (BENCHPROOF_PROPERTY_SEED overrides it).
    // Temporary folders made by the shared helpers are removed when each file ends (tempFolders.ts).
    setupFiles: ['./test/helpers/propertySeed.ts', './test/helpers/tempFolders.ts'],
    // One folder per run for the PostgreSQL clusters: one initdb per run, each file's cluster a copy of
    // it, and every server in it stopped at the end of the run, or at the next run if this one was killed.
    globalSetup: ['./test/helpers/pgRunFolder.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // A number, not a share of the cores: vitest caps a percentage at the number of cores, so the
    // '300%' written here before ran two workers on this 2-core machine. Much of the suite waits on
    // child processes (killed writers, PostgreSQL, ngspice, Chromium) rather than computing, which
    // more workers fill; each worker loads the stages once (about 2-3 s of CPU), so more is not free.
    maxWorkers: 4,
    sequence: {
      // The files that take longest start first (they are known here by name: a clean clone has no
      // timing cache, and file size says little about time), longest first as measured on this
      // 2-core machine; the rest follow in vitest's order. test/helpers/slowFirstSequencer.ts.
      sequencer: slowFirst([
        /test\/web\/benchPage\.test\.ts$/,
        /test\/hardening\/storeCrash\.test\.ts$/,
        /test\/records\/storeEngines\.test\.ts$/,
        /test\/server\/sharedStoreServe\.test\.ts$/,
        /test\/records\/sharedStoreCli\.test\.ts$/,
        /test\/records\/reliability\.test\.ts$/,
        /test\/ngspice\/.*\.test\.ts$/,
        /test\/watch\/watchSession\.test\.ts$/,
        /test\/records\/pgSchema\.test\.ts$/,
        /test\/cli\/checkTerminalWidth\.test\.ts$/,
        /test\/hardening\/(concurrency|specFuzz)\.test\.ts$/,
        /test\/cli\/watch\.test\.ts$/,
      ]),
    },
    // Test files share each worker's loaded modules instead of importing every stage afresh: module
    // loading was most of the suite's time (test/design, docs and calibration: 95 s → 31 s wall, 21 → 7.7 s
    // of CPU, here under load). Tests already share modules within a file, so nothing may depend on a
    // fresh module; fake timers are restored after each test. `npx vitest run --isolate` brings back
    // one fresh module graph per file.
    isolate: false,
    // Times are shown in the local zone; tests pin it so their expected text holds on any machine.
    env: { TZ: 'UTC' },
  },
});
