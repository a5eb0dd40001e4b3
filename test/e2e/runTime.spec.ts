// A run's time estimate in a real browser (Debian's Chromium): the largest plans are estimated
// before they run and need a go-ahead past the 10-minute bound; a simulation worker that goes
// silent, or crashes, is reported in plain words with an offer to run again.
import { expect, test } from '@playwright/test';
import { openFreshPlanner, retype, trackForeignRequests } from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('a very large plan is estimated first and waits for a go-ahead', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  // Pools of 100,000, 1:5, 100,000 replications: tens of minutes at the timed pace.
  const pools = page.getByRole('textbox', { name: /^Pool size/ });
  for (const i of [0, 1]) {
    await pools.nth(i).fill('100000');
    await expect(pools.nth(i)).toHaveValue('100000');
  }
  await retype(page, /^Ratio/, '5');
  await retype(page, /^Replications/, '100000');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  const status = page.getByTestId('sim-status');
  await expect(status).toHaveAttribute('data-status', 'too-long', { timeout: 60_000 });
  await expect(status).toContainText(/This run would take about \d+ (min|h)/);
  await expect(status).toContainText('longer than the 10 min a run in the page may take without asking');
  await expect(page.getByRole('button', { name: 'Run it anyway' })).toBeVisible();
  await page.locator('section.simulation').screenshot({ path: `${SHOTS}/simulation-too-long.png` });
  await page.getByRole('button', { name: 'Not now' }).click();
  await expect(status).toHaveAttribute('data-status', 'cancelled');
  expect(foreign).toEqual([]);
});

test('an ordinary run shows its estimated time while it runs', async ({ page }) => {
  // The demo with 100,000 replications: long enough to read the estimate, well under the bound.
  await retype(page, /^Replications/, '100000');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toContainText(/Estimated time: (about \d+ (s|min)|under 1 s) in all \(timed the first \d+ of 100,000 replications/, {
    timeout: 30_000,
  });
  await page.getByRole('button', { name: 'Cancel' }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'cancelled');
});

test('a simulation worker that ends without a word is reported, and can be run again', async ({ page }) => {
  // The worker is replaced by one that ends itself as soon as a run is asked for (as when the
  // browser ends a background process); the page's clock is then moved past the silence allowance.
  await page.clock.install();
  await page.route(/\/assets\/worker-[^/]*\.js$/, (route) =>
    route.fulfill({ contentType: 'text/javascript', body: 'self.onmessage = () => { self.close(); };' }),
  );
  await openFreshPlanner(page);
  // The client is loaded on first use: wait until it has asked for the worker (its silence timer
  // starts in the same step), then move the clock on in steps until the allowance has passed.
  const workerRequested = page.waitForRequest(/\/assets\/worker-[^/]*\.js$/);
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  const status = page.getByTestId('sim-status');
  await expect(status).toHaveAttribute('data-status', 'running');
  await workerRequested;
  await expect
    .poll(
      async () => {
        await page.clock.runFor(10_000);
        return status.getAttribute('data-status');
      },
      { timeout: 30_000 },
    )
    .toBe('error');
  await expect(status).toContainText('The simulation stopped responding: nothing was heard from it for 120 s');
  await expect(page.getByRole('button', { name: 'Run it again' })).toBeVisible();
  await page.locator('section.simulation').screenshot({ path: `${SHOTS}/simulation-stalled.png` });
});

test('a simulation worker that crashes is reported in plain words', async ({ page }) => {
  await page.route(/\/assets\/worker-[^/]*\.js$/, (route) =>
    route.fulfill({ contentType: 'text/javascript', body: 'self.onmessage = () => { throw new Error("out of memory"); };' }),
  );
  await openFreshPlanner(page);
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  const status = page.getByTestId('sim-status');
  await expect(status).toHaveAttribute('data-status', 'error');
  await expect(status).toContainText('The simulation stopped unexpectedly');
  await expect(status).toContainText('out of memory');
});
