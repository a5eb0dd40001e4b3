/// <reference types="vitest/config" />
import { defineConfig, type Plugin } from 'vite';
import react from '@vitejs/plugin-react';
import { offlineServiceWorker } from './scripts/build/offlineServiceWorker.js';
import { firstScreenReport } from './scripts/build/firstScreenSize.js';

/**
 * The built page's Content-Security-Policy. Scripts, workers, styles, fonts and data only from the
 * page's own origin: no inline script and no eval (zod runs jitless, see src/core/planSchema.ts).
 * Styles: the stylesheet is a file, and React/d3 set styles through the CSSOM (element.style),
 * which CSP allows, so no 'unsafe-inline' is needed. Images also from blob: and data: (a chart
 * drawn to PNG goes through a blob: image). Nothing may be framed, posted or used as <base>.
 * Only the build gets it: the dev server injects inline scripts for hot reload.
 */
export const CONTENT_SECURITY_POLICY = [
  "default-src 'self'",
  "script-src 'self'",
  "worker-src 'self'",
  "style-src 'self'",
  "img-src 'self' blob: data:",
  "font-src 'self'",
  "connect-src 'self'",
  "object-src 'none'",
  "base-uri 'none'",
  "form-action 'none'",
].join('; ');

/** Adds the Content-Security-Policy meta tag to the built page. */
function contentSecurityPolicy(): Plugin {
  return {
    name: 'meanward-content-security-policy',
    apply: 'build',
    // Right after <meta charset> (which must come first), before any script or stylesheet.
    transformIndexHtml: (html) =>
      html.replace(/(<meta charset="UTF-8" \/>)/, `$1\n    <meta http-equiv="Content-Security-Policy" content="${CONTENT_SECURITY_POLICY}" />`),
  };
}

// One config for the app build, `vite preview` and Vitest.
export default defineConfig({
  plugins: [react(), contentSecurityPolicy(), offlineServiceWorker(), firstScreenReport()],
  base: './',
  worker: { format: 'es' },
  // The entry chunk holds React, the store, src/core with zod/mini (~450 kB; the first screen,
  // see DEVELOPERS.md); the charts with d3, the lower panels, the pilot reader, the PDF builder and
  // its fonts are chunks of their own, loaded when first needed.
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
