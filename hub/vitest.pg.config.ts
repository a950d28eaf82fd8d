import { defineConfig } from 'vitest/config';

/**
 * The data-layer and batch tests again, on a real PostgreSQL server (a throwaway cluster from
 * Debian's `postgresql`, see test/support/pg-cluster.ts), plus the tests of several hubs on one
 * server. Each test hub gets its own database. `npm test` runs it after the PGlite suite.
 */
export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: [
      'test/batches.test.ts',
      'test/batch-desk.test.ts',
      'test/people.test.ts',
      'test/demo.test.ts',
      'test/alerts.test.ts',
      'test/materials.test.ts',
      'test/pour-plans.test.ts',
      'test/scale-fitness.test.ts',
      'test/**/*.pg.test.ts',
    ],
    globalSetup: ['test/support/pg-global-setup.ts'],
    maxWorkers: 2,
    testTimeout: 30_000,
    hookTimeout: 60_000,
  },
});
