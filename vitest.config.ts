import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    setupFiles: ['tests/setupDataFolder.ts'],
    // Reference-tool suites (ngspice, numpy, Chromium) start processes; two cores on the bench PC and in CI.
    testTimeout: 60_000,
    hookTimeout: 60_000,
    pool: 'forks',
    maxWorkers: 2,
  },
});
