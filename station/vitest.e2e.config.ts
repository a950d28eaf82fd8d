import { defineConfig } from 'vitest/config';

// Browser tests: they start the built hub and drive Debian's Chromium. Run by `npm run test:e2e`.
export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['e2e/**/*.e2e.test.ts'],
    environment: 'node',
    testTimeout: 60_000,
    hookTimeout: 90_000,
    fileParallelism: false,
  },
});
