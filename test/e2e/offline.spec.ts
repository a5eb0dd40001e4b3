// The built planner on a plain static host under a sub-path, and offline once visited: the
// service worker precaches every built file (scripts, lazy chunks, workers, PDF fonts), the page
// plans and simulates with the host gone and the browser offline, and a new version waits for
// the user's Reload. Each test serves its own copy of dist/ (built by the suite's web server) at
// /team/meanward/ with test/e2e/staticServer.ts.
import { cpSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { expect, test, type Page } from '@playwright/test';
import { retype, shownNumber } from './plannerHelpers';
import { startStaticHost, type StaticHost } from './staticServer';

const MOUNT = '/team/meanward/';
const SHOTS = 'docs/screenshots';

// This spec alone lets the page register its service worker (playwright.config.ts blocks it).
test.use({ serviceWorkers: 'allow' });

let copy: string;
let host: StaticHost;

test.beforeEach(async () => {
  copy = mkdtempSync(join(tmpdir(), 'meanward-dist-'));
  cpSync('dist', copy, { recursive: true });
  host = await startStaticHost(copy, MOUNT);
});

test.afterEach(async () => {
  await host.close();
  rmSync(copy, { recursive: true, force: true });
});

/** Open the planner at the sub-path and wait until its service worker controls the page. */
async function openControlled(page: Page): Promise<void> {
  await page.goto(host.url);
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  // First visit: the worker installs (precaching every file), activates and claims the page.
  await page.waitForFunction(() => navigator.serviceWorker.controller !== null, undefined, { timeout: 60_000 });
}

/** Change the reliability and wait for the verdict to change. */
async function changeReliability(page: Page, value: string): Promise<void> {
  const before = await page.getByTestId('verdict-bias').innerText();
  await retype(page, /^Reliability/, value);
  await page.getByRole('textbox', { name: /^Reliability/ }).press('Enter');
  await expect(page.getByTestId('verdict-bias')).not.toHaveText(before);
}

/** Open the exports and download the PDF summary. */
async function downloadPdf(page: Page): Promise<void> {
  await page.getByRole('button', { name: /^Exports/ }).click();
  const pdfButton = page.getByRole('button', { name: 'Download PDF summary' });
  await expect(pdfButton).toBeEnabled();
  const [download] = await Promise.all([page.waitForEvent('download'), pdfButton.click()]);
  expect(download.suggestedFilename()).toMatch(/-summary\.pdf$/);
  await expect(page.getByTestId('export-status')).toContainText('PDF summary downloaded.');
}

test('from a sub-path of a plain static host: the page, its lazy chunks, its workers and the PDF fonts all load from under that path', async ({ page }) => {
  await page.goto(host.url);
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  await expect(page.locator('figure[data-chart] svg').first()).toBeVisible();
  // The pilot reader, the exports and the PDF builder with its fonts are not fetched before they are asked for.
  for (const lazy of [/PilotBody-/, /ExportPanel-/, /buildReportPdf-/, /DejaVuSans/]) expect(host.requests.filter((p) => lazy.test(p)), String(lazy)).toEqual([]);
  await page.getByRole('button', { name: /Estimate from pilot data/ }).click();
  await expect(page.getByText(/Your data stay on this computer\./)).toBeVisible();
  expect(host.requests.some((p) => /PilotBody-/.test(p))).toBe(true);
  // A short simulation runs in its worker.
  await retype(page, /^Replications/, '200');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 60_000 });
  // The PDF: its builder and fonts load from under the sub-path too.
  await downloadPdf(page);
  expect(host.requests.some((p) => p.startsWith(`${MOUNT}assets/DejaVuSans-`))).toBe(true);
  // Everything was asked for under the mount path: nothing assumed the site's root.
  expect(host.requests.filter((p) => !p.startsWith(MOUNT))).toEqual([]);
  expect(host.requests.some((p) => /\/assets\/worker-/.test(p))).toBe(true);
  // The service worker's precache list names the PDF fonts and the workers, relative to sw.js.
  const sw = readFileSync(join(copy, 'sw.js'), 'utf8');
  for (const name of ['DejaVuSans-', 'DejaVuSans-Bold-', 'worker-', 'pilotWorker-', 'quickFiguresWorker-', 'buildReportPdf-', 'index.html']) {
    expect(sw, name).toMatch(new RegExp(`url:"(assets/)?${name}`));
  }
  const scope = await page.evaluate(async () => (await navigator.serviceWorker.ready).scope);
  expect(scope).toBe(host.url);
});

test('once visited, the planner works with no network: reload, change a field, simulate, make the PDF, open the pilot reader', async ({ page, context }) => {
  await openControlled(page);
  // The host is gone and the browser is offline.
  await host.close();
  await context.setOffline(true);
  await page.reload();
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  const biasBefore = shownNumber(await page.getByTestId('verdict-bias').innerText());
  // Demo: lower reliability, larger artefact (|bias| = beta(1 − rho)|Delta| grows as rho falls:
  // Thorndike 1942 closed form; the exact figure is checked elsewhere, here only that it moves).
  await changeReliability(page, '0.6');
  expect(Math.abs(shownNumber(await page.getByTestId('verdict-bias').innerText()))).toBeGreaterThan(Math.abs(biasBefore));
  // The charts (a lazy chunk) and the simulation worker come from the cache.
  await expect(page.locator('figure[data-chart] svg').first()).toBeVisible();
  await retype(page, /^Replications/, '200');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 60_000 });
  // The PDF summary, its builder and fonts never fetched online, is made from the cache.
  await downloadPdf(page);
  // The pilot reader, never opened online, also comes from the cache.
  await page.getByRole('button', { name: /Estimate from pilot data/ }).click();
  await expect(page.getByText(/Your data stay on this computer\./)).toBeVisible();
});

test('a new version waits for the user: a notice with a Reload button, and only that reloads', async ({ page }) => {
  await openControlled(page);
  // Publish a "new version": any change to sw.js makes the browser install it beside the old one.
  writeFileSync(join(copy, 'sw.js'), `${readFileSync(join(copy, 'sw.js'), 'utf8')}\n// next version\n`);
  await page.evaluate(() => {
    (window as unknown as { __sameDocument: boolean }).__sameDocument = true;
  });
  await page.evaluate(async () => (await navigator.serviceWorker.getRegistration())!.update());
  const notice = page.getByTestId('update-notice');
  await expect(notice).toBeVisible({ timeout: 30_000 });
  await expect(notice).toHaveText(/A new version of Meanward is ready\. Reload to use it\./);
  await expect(notice.locator('xpath=..')).toHaveAttribute('role', 'status');
  // Nothing reloads on its own: the page is the same document a while later.
  await page.waitForTimeout(1500);
  expect(await page.evaluate(() => (window as unknown as { __sameDocument?: boolean }).__sameDocument)).toBe(true);
  await page.setViewportSize({ width: 1280, height: 800 });
  await page.screenshot({ path: `${SHOTS}/update-notice-1280.png` });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.screenshot({ path: `${SHOTS}/update-notice-390.png` });
  // Reload: the new version takes over and the page reloads under it.
  await Promise.all([page.waitForEvent('load'), page.getByTestId('update-reload').click()]);
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  expect(await page.evaluate(() => (window as unknown as { __sameDocument?: boolean }).__sameDocument)).toBeUndefined();
  await expect(page.getByTestId('update-notice')).toHaveCount(0);
});
