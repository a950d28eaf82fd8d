import { defineConfig } from 'vitest/config';

export default defineConfig({
  // Use protocol's and simulator's TypeScript source directly, without a build.
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['src/**/*.test.ts', 'test/**/*.test.ts'],
    // Pseudo-terminal tests need socat from Debian: they run in `npm run test:e2e`.
    // Several hubs on one server need a PostgreSQL server: those run in vitest.pg.config.ts.
    exclude: ['test/**/*.pty.test.ts', 'test/**/*.pg.test.ts', 'test/faults/**'],
    // A folder for the data templates the test hubs start from (test/support/test-app.ts).
    globalSetup: ['test/support/global-setup.ts'],
    // Each e2e-style test opens its own PGlite; two at a time is what 2 cores take.
    maxWorkers: 2,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
