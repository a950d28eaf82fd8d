import { defineConfig } from 'vitest/config';

export default defineConfig({
  ssr: { resolve: { conditions: ['@tareline/source'] } },
  test: {
    include: ['src/**/*.test.ts'],
  },
});
