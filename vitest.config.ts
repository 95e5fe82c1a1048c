import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    reporters: ['default', './test/helpers/summaryReporter.ts'],
    // One seed for every property-based run, printed with a failure (BENCHPROOF_PROPERTY_SEED overrides it).
    // Temporary folders made by the shared helpers are removed when each file ends (tempFolders.ts).
    setupFiles: ['./test/helpers/propertySeed.ts', './test/helpers/tempFolders.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // Times are shown in the local zone; tests pin it so their expected text holds on any machine.
    env: { TZ: 'UTC' },
  },
});
