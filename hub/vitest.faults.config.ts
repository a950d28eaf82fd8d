import { defineConfig } from 'vitest/config';

// The fault suite: the built hub killed with SIGKILL in every batch state, and two built hubs on
// one throwaway PostgreSQL server killed in turn. `npm run test:faults`.
export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['test/faults/**/*.faults.test.ts'],
    globalSetup: ['test/support/pg-global-setup.ts'],
    testTimeout: 600_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
