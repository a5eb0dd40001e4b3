import { VitePWA } from 'vite-plugin-pwa';
import type { PluginOption } from 'vite';

/**
 * The service worker that lets the planner work with no network once visited (see DEVELOPERS.md,
 * "Offline use and the service worker"). Workbox (through vite-plugin-pwa) writes `sw.js` at the
 * top of `dist/` with a precache list of every built file: the page, its scripts and lazy chunks,
 * the simulation and pilot workers, the stylesheet, the PDF fonts, the plan schema and the example
 * files. It answers only same-origin requests for those files, from its cache; there is no runtime
 * caching, so nothing else is stored and nothing is sent anywhere.
 *
 * - Registered by our own module (src/offline/registerServiceWorker.ts), never by an inline
 *   script, so the page's Content-Security-Policy holds (`worker-src 'self'`).
 * - A new version waits until the user asks for it (the update notice's Reload button sends
 *   SKIP_WAITING); it never takes over or reloads on its own. The first install claims the open
 *   page, so it works offline without a second visit.
 * - Paths are relative to sw.js, so dist/ works from any static host and any sub-path.
 * - Only the build has it: the dev server and the unit tests register nothing.
 */
export function offlineServiceWorker(): PluginOption {
  return VitePWA({
    strategies: 'generateSW',
    registerType: 'prompt',
    injectRegister: false,
    manifest: false,
    filename: 'sw.js',
    workbox: {
      globPatterns: ['**/*.{html,js,css,svg,ttf,json,csv}'],
      // The PDF's fonts and builder are the largest files (about 0.8 MB each); all are needed offline.
      maximumFileSizeToCacheInBytes: 4 * 1024 * 1024,
      // No navigation fallback: the page's own address (…/ or …/index.html) is in the precache; other
      // pages a team keeps on the same host and path are left to the network.
      navigateFallback: null,
      cleanupOutdatedCaches: true,
      clientsClaim: true,
      skipWaiting: false,
      runtimeCaching: [],
      // Hashed file names are their own version; the rest (index.html, public files) get a revision.
      dontCacheBustURLsMatching: /assets\/.+-[\w-]{8}\.\w+$/,
      sourcemap: false,
      // Workbox's own runtime is written beside sw.js (a same-origin file, allowed by the CSP).
      inlineWorkboxRuntime: false,
    },
  });
}
