// The design explorer on the page: a small 3 × 2 grid of the demo plan (invented)
// fills in on the worker pool; the heat map has one cell per grid cell, the
// table alternative shows the same figures the core gives for the same
// simulation run in Node (seeded per replication, so the pool's result is
// the one-process result bit for bit); clicking a cell and pressing Enter on
// a focused cell make candidate plans; a bigger grid is cancelled; axe finds
// no violations in the panel; screenshots at 1280 × 800 and 390 px.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { expect, test, type Page } from '@playwright/test';
import { exploreCells, summariseExploreCell } from '../../src/core/explore';
import type { ExploreSpec } from '../../src/core/explore/exploreTypes';
import { demoPlan } from '../../src/io/demoPlan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { fmtPct } from '../../src/ui/format';
import { readPdfText } from '../report/readPdfText';
import { openFreshPlanner } from './plannerHelpers';

const SHOTS = 'docs/screenshots';

async function setAxis(page: Page, axis: 0 | 1, input: string, from: string, to: string, steps: string): Promise<void> {
  const box = page.locator(`fieldset[data-axis="${axis}"]`);
  await box.getByLabel('Input').selectOption(input);
  await box.getByLabel('From').fill(from);
  await box.getByLabel('To').fill(to);
  await box.getByLabel('Steps').fill(steps);
}

async function openExplorer(page: Page): Promise<void> {
  await page.getByTestId('explorer-toggle').click();
  await expect(page.getByTestId('explorer')).toBeVisible();
}

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('a small grid fills in; heat map, table and details agree with the core; cells become candidate plans', async ({ page }) => {
  test.setTimeout(120_000);
  await page.setViewportSize({ width: 1280, height: 800 });
  await openExplorer(page);
  await setAxis(page, 0, 'reliability', '0.6', '0.9', '3');
  await setAxis(page, 1, 'caliper', '0.1', '0.4', '2');
  await page.getByLabel('Replications per cell').fill('200');
  await page.getByTestId('explorer-run').click();
  const status = page.getByTestId('explorer-status');
  await expect(status).toHaveAttribute('data-status', 'done', { timeout: 60_000 });
  await expect(page.getByTestId('explorer-progress')).toHaveText('6 of 6 cells.');

  // The heat map: one focusable cell per grid cell, each with its index.
  const chart = page.locator('figure[data-chart="explorer"] svg');
  const cells = chart.locator('[data-cell-index][tabindex]');
  await expect(cells).toHaveCount(6);
  expect((await cells.evaluateAll((els) => els.map((e) => e.getAttribute('data-cell-index')))).sort()).toEqual(['0', '1', '2', '3', '4', '5']);

  // The table alternative: six rows, each with the figures the core gives for the same seeded run in Node.
  await page.getByLabel('Show as table').check();
  const rows = page.getByTestId('explorer-table').locator('tbody tr');
  await expect(rows).toHaveCount(6);
  const plan = demoPlan();
  const spec: ExploreSpec = {
    axes: [
      { input: 'reliability', from: 0.6, to: 0.9, steps: 3 },
      { input: 'caliper', from: 0.1, to: 0.4, steps: 2 },
    ],
    analysisId: 'matchedDifference',
    replications: 200,
    seed: plan.simulation.seed,
  };
  const expected = exploreCells(plan, spec).map((c) => summariseExploreCell(c, simulatePlan(c.plan!, { replications: 200, seed: spec.seed }), spec));
  for (const [i, c] of expected.entries()) {
    const td = rows.nth(i).locator('td');
    await expect(rows.nth(i)).toHaveAttribute('data-status', 'done');
    // Columns: caliper, simulated share, ± MC SE, closed form, discarded, power, tolerable.
    await expect(td.nth(1)).toHaveText(fmtPct(c.artefactShare));
    await expect(td.nth(2)).toHaveText(fmtPct(c.artefactShareMCSE));
    await expect(td.nth(3)).toHaveText(fmtPct(c.closedFormShare));
    await expect(td.nth(4)).toHaveText(fmtPct(c.discardedShare));
  }

  // Hover shows a cell's figures in the details box.
  await cells.nth(0).hover();
  await expect(page.getByTestId('explorer-details')).toContainText('Simulated artefact');

  // Click a cell: it becomes a candidate plan, listed among the variants.
  await chart.locator('[data-cell-index="5"][tabindex]').click();
  await expect(page.getByTestId('explorer-message')).toContainText('Added the candidate plan "Explorer: reliability 0.90, caliper 0.40"');
  await expect(page.locator('li[data-variant="Explorer: reliability 0.90, caliper 0.40"]')).toBeVisible();

  // Keyboard only: Tab forwards from the "Show as table" box (above the chart) into the chart to a cell, and press Enter.
  await page.getByLabel('Show as table').focus();
  let focusedIndex: string | null = null;
  for (let i = 0; i < 40 && focusedIndex === null; i++) {
    await page.keyboard.press('Tab');
    focusedIndex = await page.evaluate(() => document.activeElement?.getAttribute('data-cell-index') ?? null);
  }
  expect(focusedIndex).not.toBeNull();
  await expect(page.getByTestId('explorer-details')).toContainText('Simulated artefact');
  await page.keyboard.press('Enter');
  await expect(page.getByTestId('explorer-message')).toContainText('Added the candidate plan "Explorer:');
  await expect(page.locator('li[data-variant^="Explorer:"]')).toHaveCount(2);

  // A button in the table does the same.
  await rows.nth(0).getByRole('button', { name: /Make candidate plan/ }).click();
  await expect(page.locator('li[data-variant="Explorer: reliability 0.60, caliper 0.10"]')).toBeVisible();

  // axe: no violations in the explorer panel.
  const axe = await new AxeBuilder({ page }).include('[data-testid="explorer"]').analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)).toEqual([]);

  // The PDF summary carries the grid (the plan in the form is the one explored).
  await page.getByRole('button', { name: /^Exports/ }).click();
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download PDF summary' }).click()]);
  const file = path.resolve('test-results', 'explorer-summary.pdf');
  await download.saveAs(file);
  const pdf = (await readPdfText(new Uint8Array(readFileSync(file)))).body.join(' ').replace(/\s+/g, ' ');
  expect(pdf).toContain('Design explorer');
  expect(pdf).not.toContain('run on another version of this plan');
  await page.getByRole('button', { name: /^Exports/ }).click();

  // Screenshots of the finished two-input grid at 1280 × 800 and 390 px wide.
  mkdirSync(SHOTS, { recursive: true });
  await page.getByLabel('Show as table').uncheck();
  await page.getByTestId('explorer').scrollIntoViewIfNeeded();
  await page.locator('section.explorer').screenshot({ path: `${SHOTS}/explorer-grid-1280.png` });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.waitForTimeout(400);
  await page.locator('section.explorer').screenshot({ path: `${SHOTS}/explorer-grid-390.png` });
});

test('one input draws curves; a bigger grid can be cancelled and its unfinished cells say so', async ({ page }) => {
  test.setTimeout(120_000);
  await page.setViewportSize({ width: 1280, height: 800 });
  await openExplorer(page);
  await setAxis(page, 0, 'reliability', '0.6', '0.95', '6');
  await page.getByLabel('Replications per cell').fill('300');
  await page.getByTestId('explorer-run').click();
  await expect(page.getByTestId('explorer-status')).toHaveAttribute('data-status', 'done', { timeout: 60_000 });
  await expect(page.locator('figure[data-chart="explorer"] svg [data-cell-index][tabindex]')).toHaveCount(6);
  mkdirSync(SHOTS, { recursive: true });
  await page.locator('section.explorer').screenshot({ path: `${SHOTS}/explorer-curve-1280.png` });
  await page.setViewportSize({ width: 390, height: 844 });
  await page.waitForTimeout(400);
  await page.locator('section.explorer').screenshot({ path: `${SHOTS}/explorer-curve-390.png` });
  await page.setViewportSize({ width: 1280, height: 800 });

  // Printed, the chart and the caution stay; the form and the buttons do not.
  await page.emulateMedia({ media: 'print' });
  await expect(page.getByTestId('explorer-run')).toBeHidden();
  await expect(page.locator('fieldset[data-axis="0"]')).toBeHidden();
  await expect(page.locator('figure[data-chart="explorer"] svg')).toBeVisible();
  await expect(page.locator('.explorer-caution')).toBeVisible();
  mkdirSync('test-results/screens', { recursive: true });
  await page.locator('section.explorer').screenshot({ path: 'test-results/screens/explorer-print.png' });
  await page.emulateMedia({ media: 'screen' });

  // A bigger grid: 8 × 4 cells of 20,000 replications; cancel it once it is under way.
  await setAxis(page, 0, 'reliability', '0.6', '0.95', '8');
  await setAxis(page, 1, 'caliper', '0.05', '0.5', '4');
  await page.getByLabel('Replications per cell').fill('20000');
  await page.getByTestId('explorer-run').click();
  await expect(page.getByTestId('explorer-status')).toHaveAttribute('data-status', 'running');
  await expect(page.getByTestId('explorer-progress')).toContainText('of 32 cells');
  await page.waitForTimeout(800);
  await page.getByTestId('explorer-cancel').click();
  await expect(page.getByTestId('explorer-status')).toHaveAttribute('data-status', 'cancelled');
  await expect(page.getByTestId('explorer-run')).toHaveText('Run the grid again');
  const progress = await page.getByTestId('explorer-progress').textContent();
  await page.waitForTimeout(1500);
  await expect(page.getByTestId('explorer-progress')).toHaveText(progress ?? '');
  await page.getByLabel('Show as table').check();
  const pending = page.getByTestId('explorer-table').locator('tbody tr[data-status="pending"]');
  expect(await pending.count()).toBeGreaterThan(0);
  await expect(pending.first()).toContainText('not run (the grid was cancelled)');
});

test('bad explorer input keeps what was typed and says what is wrong', async ({ page }) => {
  await openExplorer(page);
  const box = page.locator('fieldset[data-axis="0"]');
  await box.getByLabel('From').fill('0.6x');
  await page.getByTestId('explorer-run').click();
  await expect(box.getByLabel('From')).toHaveValue('0.6x');
  await expect(box).toContainText('"From" of the first input must be a number; got "0.6x".');
  await expect(page.getByTestId('explorer-status')).toHaveAttribute('data-status', 'idle');
});
