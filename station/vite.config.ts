/// <reference types="vitest/config" />
import tailwindcss from '@tailwindcss/vite';
import react from '@vitejs/plugin-react';
import { defineConfig } from 'vite';

// The hub the dev server forwards API and socket traffic to.
const hubUrl = process.env.TARELINE_HUB_URL ?? 'http://localhost:3000';

export default defineConfig({
  plugins: [react(), tailwindcss()],
  resolve: {
    // Read protocol's TypeScript source directly: no build step for it in development.
    conditions: ['@tareline/source'],
  },
  server: {
    port: 5173,
    proxy: {
      '/api': hubUrl,
      '/socket.io': { target: hubUrl, ws: true },
    },
  },
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    // scripts/bench-bundle-size.mjs reads it to size what the bench route loads.
    manifest: true,
  },
  test: {
    environment: 'jsdom',
    include: ['src/**/*.test.{ts,tsx}'],
    setupFiles: ['./src/testing/setup.ts'],
  },
});
