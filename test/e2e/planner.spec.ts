// The planner in a real browser (Debian's Chromium): the demo, editing,
// simulation with progress and cancel, files, links, autosave, accessibility,
// no traffic off the machine, and a responsive main thread during a run.
import AxeBuilder from '@axe-core/playwright';
import { readFileSync } from 'node:fs';
import { expect, test } from '@playwright/test';
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { demoPlan } from '../../src/io/demoPlan';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';
import {
  openFreshPlanner,
  retype,
  shownFigure,
  shownNumber,
  trackForeignRequests,
  waitForPlannedFigures,
  watchedLongTasks,
  watchLongTasks,
} from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  // A fresh start: no autosave from an earlier test.
  await openFreshPlanner(page);
});

test('the demo loads, and changing the reliability updates the verdict and the charts', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  await page.reload();
  // The figures on screen become those of the planned procedure (a quick seeded simulation, the
  // same function in Node and in the page: 2-decimal display, tolerance 0.01). The formula for
  // unlimited pools stays beside it: demo bias beta(1 − rho)·Delta = 0.8 × 0.25 × (−10) = −2.00
  // points, so the formula estimate is 2.5 − 2 = +0.50 (Thorndike 1942 closed form; computed).
  await waitForPlannedFigures(page);
  const planned = analysePlannedProcedure(demoPlan()).analyses.matchedDifference!;
  expect(Math.abs(shownNumber(await page.getByTestId('verdict-bias').innerText()) - planned.bias)).toBeLessThanOrEqual(0.01);
  await expect(page.getByTestId('verdict-basis')).toContainText('formula for unlimited pools and exact matching gives +0.50');
  await expect(page.locator('figure[data-chart] svg')).toHaveCount(4);
  await page.screenshot({ path: `${SHOTS}/demo-1366x768.png` });
  const sensitivityBefore = await page.locator('figure[data-chart="sensitivity"] svg').innerHTML();
  const pretestBefore = await page.locator('figure[data-chart="pretest"] svg').innerHTML();

  await retype(page, /^Reliability/, '0.9');
  // rho .9: beta = .6·10/(10·.9) = 2/3; formula bias = (2/3)(.1)(−10) = −0.67, estimate 2.5 − 0.67 = +1.83
  // (same closed form, computed); the planned figure from the same quick simulation as in Node.
  await expect(page.getByTestId('verdict-basis')).toContainText('gives +1.83', { timeout: 15_000 });
  const rho9 = demoPlan();
  rho9.pretest.reliability = 0.9;
  const planned9 = analysePlannedProcedure(rho9).analyses.matchedDifference!;
  const bias9 = await page.getByTestId('verdict-bias').innerText();
  expect(Math.abs(shownNumber(bias9) - planned9.bias)).toBeLessThanOrEqual(0.01);
  await expect(page.getByTestId('derived-reliability-comparison')).toHaveText('.900');
  // Charts redraw in their own tasks just after the verdict: poll.
  await expect.poll(() => page.locator('figure[data-chart="sensitivity"] svg').innerHTML()).not.toBe(sensitivityBefore);
  await expect.poll(() => page.locator('figure[data-chart="pretest"] svg').innerHTML()).not.toBe(pretestBefore);

  // Invalid input: kept as typed, explained beside the field, results marked stale.
  await retype(page, /^Reliability/, '1.4');
  const box = page.getByRole('textbox', { name: /^Reliability/ });
  await expect(box).toHaveAttribute('aria-invalid', 'true');
  await expect(page.locator('[data-field="pretest.reliability"] .field-error')).toContainText('1.4');
  await expect(page.getByTestId('verdict')).toContainText('Out of date');
  await expect(page.getByTestId('verdict-bias')).toHaveText(bias9);
  await page.locator('[data-field="pretest.reliability"]').screenshot({ path: `${SHOTS}/invalid-reliability.png` });
  expect(foreign).toEqual([]);
});

test('a simulation shows progress and can be cancelled; a full run agrees with the closed form', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  // Long enough to watch: 40,000 replications.
  await retype(page, /^Replications/, '40000');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  const bar = page.getByRole('progressbar');
  await expect(bar).toBeVisible();
  await expect.poll(async () => Number(await bar.getAttribute('aria-valuenow')), { timeout: 30_000 }).toBeGreaterThan(0);
  await page.screenshot({ path: `${SHOTS}/simulation-running.png` });
  await page.getByRole('button', { name: 'Cancel' }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'cancelled');
  await expect(bar).toHaveCount(0);

  await retype(page, /^Replications/, '2000');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-stale', 'false');
  await page.screenshot({ path: `${SHOTS}/simulation-done.png`, fullPage: true });

  // Simulated bias within 4 Monte Carlo SEs of the closed form, plus 0.01 for
  // the 2-decimal display of both figures (a 4-MCSE miss has probability
  // < 1e-4 per analysis if the engine is right). Closed forms: ANCOVA and
  // corrected ANCOVA (Lord 1960; Porter 1967), gain score (computed, REFERENCES.md).
  for (const id of ['ancova', 'gainScore', 'correctedAncova']) {
    const row = page.locator(`tr[data-analysis="${id}"]`);
    const expected = shownNumber((await row.locator('td').nth(0).innerText()).split('/')[0]!);
    const sim = shownFigure(await row.locator('td').nth(1).innerText());
    expect(Math.abs(sim.value - expected), `${id}: simulated ${sim.value} ± ${sim.mcse} vs expected ${expected}`).toBeLessThanOrEqual(
      4 * sim.mcse + 0.01,
    );
  }

  // Changing the plan marks the simulated figures stale.
  await retype(page, /^Caliper/, '0.1');
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-stale', 'true');
  await expect(page.getByTestId('sim-status')).toContainText('out of date');
  expect(foreign).toEqual([]);
});

test('save a plan file and open it again', async ({ page }, testInfo) => {
  await retype(page, /^Caliper/, '0.35');
  await retype(page, /^Hypothesised effect/, '3.5');
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Save plan file' }).click()]);
  expect(download.suggestedFilename()).toMatch(/\.meanward\.json$/);
  const file = testInfo.outputPath('saved-plan.json');
  await download.saveAs(file);
  const saved = JSON.parse(readFileSync(file, 'utf8')) as { format: string; matching: { caliper: number } };
  expect(saved.format).toBe('meanward-plan');
  expect(saved.matching.caliper).toBe(0.35);

  await page.getByRole('button', { name: 'Reset to demo' }).click();
  await expect(page.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.2');
  await page.getByTestId('open-file-input').setInputFiles(file);
  await expect(page.getByTestId('notice')).toContainText('Opened');
  await expect(page.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.35');
  await expect(page.getByRole('textbox', { name: /^Hypothesised effect/ })).toHaveValue('3.5');

  // A file that is not a plan: a clear message, and the plan stays.
  await page.getByTestId('open-file-input').setInputFiles({ name: 'shopping.json', mimeType: 'application/json', buffer: Buffer.from('["milk"]') });
  await expect(page.getByTestId('notice')).toHaveAttribute('data-kind', 'error');
  await expect(page.getByTestId('notice')).toContainText('your current plan is unchanged');
  await expect(page.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.35');
});

test('a share link reopens the plan in a fresh browser; a bad link explains itself and keeps the plan', async ({ page, browser }) => {
  await retype(page, /^Pretest mean\b.*programme/, '47');
  await page.getByRole('button', { name: 'Copy share link' }).click();
  await expect(page.getByTestId('notice')).toBeVisible();
  const url = page.url();
  expect(url).toMatch(/#plan=[A-Za-z0-9_-]+$/);

  const fresh = await browser.newContext();
  const other = await fresh.newPage();
  const foreign = trackForeignRequests(other);
  await other.goto(url);
  await expect(other.getByRole('textbox', { name: /^Pretest mean\b.*programme/ })).toHaveValue('47');
  await expect(other.getByTestId('notice')).toContainText('shared link');
  // Editing after opening a link, then reloading, keeps the edit (the old link no longer wins).
  await retype(other, /^Caliper/, '0.3');
  await other.reload();
  await expect(other.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.3');
  await expect(other.getByRole('textbox', { name: /^Pretest mean\b.*programme/ })).toHaveValue('47');

  // A truncated link: explained, and the plan on screen is untouched.
  await other.goto(`${url.split('#')[0]}#plan=eyJmb3JtYXQi`);
  await other.reload();
  await expect(other.getByTestId('notice')).toHaveAttribute('data-kind', 'error');
  await expect(other.getByTestId('notice')).toContainText('could not be read');
  await expect(other.getByRole('textbox', { name: /^Pretest mean\b.*programme/ })).toHaveValue('47');
  await other.screenshot({ path: `${SHOTS}/bad-link.png` });
  expect(foreign).toEqual([]);
  await fresh.close();
});

test('reloading restores what was typed, even an unfinished value', async ({ page }) => {
  await retype(page, /^Ratio/, '2');
  await retype(page, /^Pre–post correlation/, '0.');
  await page.reload();
  await expect(page.getByRole('textbox', { name: /^Ratio/ })).toHaveValue('2');
  await expect(page.getByRole('textbox', { name: /^Pre–post correlation/ })).toHaveValue('0.');
});

test('no accessibility violations (axe), before and after a simulation', async ({ page }) => {
  const before = await new AxeBuilder({ page }).analyze();
  expect(before.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(' ; ')})`)).toEqual([]);
  await retype(page, /^Reliability/, '1.4');
  await page.getByRole('button', { name: 'Reset to demo' }).click();
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await page.locator('figure[data-chart] details').first().locator('summary').click();
  const after = await new AxeBuilder({ page }).analyze();
  expect(after.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.length})`)).toEqual([]);
});

test('the main thread stays responsive while 2,000 replications run (no long task over 50 ms)', async ({ page }) => {
  await expect(page.getByRole('textbox', { name: /^Replications/ })).toHaveValue('2000');
  // Let the page settle first, then watch long tasks from the click until the run reports done.
  const startedAt = await watchLongTasks(page, 'sim-status', 'done');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  const { tasks, during, doneAt } = await watchedLongTasks(page, startedAt);
  expect(doneAt).not.toBeNull();
  test.info().annotations.push({
    type: 'long tasks',
    description: `run ${Math.round(doneAt! - startedAt)} ms; during: ${JSON.stringify(during)}; all: ${JSON.stringify(tasks)}`,
  });
  console.log(`run ${Math.round(doneAt! - startedAt)} ms; long tasks during the run: ${JSON.stringify(during)}; after: ${JSON.stringify(tasks.filter((t) => t.start >= doneAt!))}`);
  expect(during.filter((t) => t.duration > 50)).toEqual([]);
});
