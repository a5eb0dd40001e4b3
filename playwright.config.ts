import { defineConfig } from '@playwright/test';
import { E2E_ORIGIN as ORIGIN, E2E_PORT as PORT } from './test/e2e/origin';

// Browser suite: Debian's Chromium (never a downloaded browser), against the
// production build served by `vite preview`. See shared toolchain notes.

export default defineConfig({
  testDir: 'test/e2e',
  testMatch: '**/*.spec.ts',
  outputDir: 'test-results',
  workers: 1,
  fullyParallel: false,
  timeout: 120_000,
  expect: { timeout: 15_000 },
  reporter: [['list']],
  use: {
    baseURL: `${ORIGIN}/`,
    viewport: { width: 1366, height: 768 },
    screenshot: 'only-on-failure',
    trace: 'off',
    acceptDownloads: true,
    // The built page registers a service worker (offline use). It would answer requests from its
    // cache, past page.route() and a rebuilt server, so it is off here; test/e2e/offline.spec.ts
    // turns it on and serves its own copy of dist/.
    serviceWorkers: 'block',
    launchOptions: {
      executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
      args: [
        '--headless',
        '--no-sandbox',
        '--disable-gpu',
        '--disable-quic',
        '--no-first-run',
        '--disable-background-networking',
        '--disable-component-update',
        '--disable-sync',
      ],
    },
  },
  webServer: {
    command: `npm run build && npx vite preview --host 127.0.0.1 --port ${PORT} --strictPort`,
    url: `${ORIGIN}/`,
    // Always build and serve afresh: reusing a server could test a stale build.
    reuseExistingServer: false,
    timeout: 120_000,
  },
});
