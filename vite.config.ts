/// <reference types="vitest/config" />
import { defineConfig } from 'vite';
import react from '@vitejs/plugin-react';

// One config for the app build, `vite preview` and Vitest.
export default defineConfig({
  plugins: [react()],
  base: './',
  worker: { format: 'es' },
  // The app chunk holds React, d3, jstat and zod (~520 kB); the PDF builder and its fonts load
  // only when a PDF is made, in their own chunks.
  build: { outDir: 'dist', sourcemap: false, chunkSizeWarningLimit: 800 },
  preview: { host: '127.0.0.1', port: 4173, strictPort: true },
  test: {
    include: ['test/**/*.test.{ts,tsx}'],
    exclude: ['test/e2e/**', 'node_modules/**'],
    environment: 'node',
    setupFiles: ['test/setup.ts'],
    testTimeout: 60_000,
    alias: {
      // svg2pdf.js' `main` is a UMD bundle; Vitest needs its ES build.
      'svg2pdf.js': 'svg2pdf.js/dist/svg2pdf.es.min.js',
    },
  },
});
