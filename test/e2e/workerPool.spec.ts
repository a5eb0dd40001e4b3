// The worker pool in a real browser (Debian's Chromium): the page reports 4 cores, so a run is
// split across 3 Web Workers whose blocks of replications are merged in one of them; the figures
// shown must be exactly those of a page that reports 1 core (one worker). The check is identity of
// the simulation section's text: replication i always draws from its own stream (seed, i).
import { expect, test, type Page } from '@playwright/test';
import { openFreshPlanner, retype, trackForeignRequests } from './plannerHelpers';

async function simulatedText(page: Page, cores: number): Promise<{ text: string; workers: number }> {
  await page.addInitScript((n) => Object.defineProperty(navigator, 'hardwareConcurrency', { get: () => n }), cores);
  let workers = 0;
  page.on('worker', (w) => {
    if (/\/assets\/worker-[^/]*\.js$/.test(w.url())) workers++;
  });
  await openFreshPlanner(page);
  await retype(page, /^Replications/, '600');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  const status = page.getByTestId('sim-status');
  await expect(status).toHaveAttribute('data-status', 'done', { timeout: 60_000 });
  await expect(status).toContainText('Done: 600 replications.');
  const text = (await page.locator('section.simulation').innerText()).replace(/Estimated time:[^\n]*/g, '');
  return { text, workers };
}

test('a run split across 3 workers shows exactly the figures of one worker', async ({ browser }) => {
  const many = await browser.newPage();
  const foreign = trackForeignRequests(many);
  const split = await simulatedText(many, 4);
  expect(split.workers).toBe(3);
  expect(foreign).toEqual([]);
  const one = await browser.newPage();
  const single = await simulatedText(one, 1);
  expect(single.workers).toBe(1);
  expect(split.text).toBe(single.text);
  expect(split.text).toMatch(/\d/);
  await many.close();
  await one.close();
});
