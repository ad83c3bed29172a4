import { defineConfig } from 'vite';
import { svelte } from '@sveltejs/vite-plugin-svelte';

// The workbench: a static site in dist/web that works offline. Heavy work runs in a Web Worker.
export default defineConfig({
  root: 'web',
  base: './',
  plugins: [svelte({ configFile: false })],
  worker: { format: 'es' },
  build: {
    outDir: '../dist/web',
    emptyOutDir: true,
    target: 'es2022',
    chunkSizeWarningLimit: 2000,
  },
  server: { host: '127.0.0.1' },
  preview: { host: '127.0.0.1' },
});
