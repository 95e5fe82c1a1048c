import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['test/**/*.test.ts'],
    reporters: ['default', './test/helpers/summaryReporter.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    // Times are shown in the local zone; tests pin it so their expected text holds on any machine.
    env: { TZ: 'UTC' },
  },
});
