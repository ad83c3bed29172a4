import { defineConfig } from 'vitest/config';
import { svelte } from '@sveltejs/vite-plugin-svelte';

export default defineConfig({
  plugins: [svelte({ configFile: false, compilerOptions: { hmr: false } })],
  test: {
    include: ['test/**/*.test.ts'],
    exclude: ['test/bench/**', 'node_modules/**'],
    testTimeout: 120_000,
    hookTimeout: 300_000,
    // Two cores: keep the pool small so heavy numeric tests do not starve each other.
    maxWorkers: 2,
  },
});
