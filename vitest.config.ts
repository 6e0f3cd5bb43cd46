import { defineConfig } from 'vitest/config';

// Three projects, each runnable alone (`npx vitest run --project unit`):
// - unit: the rules core, the tablet's modules and server services on their own;
// - server: the built server and the command-line scripts against real SQLite files;
// - browser: Debian's Chromium driving the built app.
// `npm run test:fast` runs unit and server; `npm test` runs all three after format, lint,
// type check and a build.
export default defineConfig({
  test: {
    globalSetup: ['tests/helpers/global-setup.ts'],
    testTimeout: 60_000,
    hookTimeout: 120_000,
    // Two cores: server and browser tests each start a process of their own.
    maxWorkers: 2,
    projects: [
      { extends: true, test: { name: 'unit', include: ['tests/lib/**/*.test.ts', 'tests/docs/**/*.test.ts'] } },
      {
        extends: true,
        test: {
          name: 'server',
          include: ['tests/api/**/*.test.ts', 'tests/db/**/*.test.ts', 'tests/scripts/**/*.test.ts'],
        },
      },
      { extends: true, test: { name: 'browser', include: ['tests/e2e/**/*.test.ts'] } },
    ],
  },
});
