import { defineConfig } from 'vitest/config';

// The fault suite: the built hub killed with SIGKILL in every batch state. `npm run test:faults`.
export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['test/faults/**/*.faults.test.ts'],
    testTimeout: 600_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
