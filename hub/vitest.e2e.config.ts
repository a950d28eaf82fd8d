import { defineConfig } from 'vitest/config';

// Serial tests through real pseudo-terminals (Debian's socat). Run by `npm run test:e2e`.
export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['test/**/*.pty.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    fileParallelism: false,
  },
});
