import { defineConfig } from 'vitest/config';

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
    // Three workers per core: much of the suite waits on child processes (killed writers, the page's
    // server, PostgreSQL, ngspice, Chromium) rather than computing. On this 2-core machine, idle, the
    // whole suite took 240 s with one worker per core, 121 s with two, 99 s with three and 118 s with
    // four (each worker loads the stages once, so more workers spend more CPU on loading).
    maxWorkers: '300%',
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
