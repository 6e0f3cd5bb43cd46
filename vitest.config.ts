import { defineConfig } from 'vitest/config';

export default defineConfig({
  test: {
    include: ['tests/**/*.test.ts'],
    globalSetup: ['tests/helpers/global-setup.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Two cores: server and browser tests each start a process of their own.
    maxWorkers: 2,
  },
});
