// The "Methods text" panel in a real browser (Debian's Chromium): it shows the
// text core writes for the demo plan (compared with the same core functions run
// in Node, the quick figures from the same seed), the caution and the
// references; the copy button is reached and pressed by keyboard, puts the
// text on the clipboard and announces "Copied". Screenshot for review.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { expect, test } from '@playwright/test';
import { methodsText } from '../../src/core/methodsText';
import { demoPlan } from '../../src/io/demoPlan';
import { methodsPlainText } from '../../src/report/methodsTextRender';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';
import { openFreshPlanner, trackForeignRequests, waitForPlannedFigures } from './plannerHelpers';

test('the methods text panel shows core’s text for the demo and copies it by keyboard', async ({ page, context }) => {
  const foreign = trackForeignRequests(page);
  await context.grantPermissions(['clipboard-read', 'clipboard-write']);
  await openFreshPlanner(page);
  await waitForPlannedFigures(page);
  const plan = demoPlan();
  const expected = methodsPlainText(methodsText(plan, analysePlannedProcedure(plan)));

  const panel = page.getByTestId('methods-panel');
  await panel.scrollIntoViewIfNeeded();
  await expect(panel.getByRole('heading', { name: 'Methods text' })).toBeVisible();
  const body = page.getByTestId('methods-body');
  // Demo ANCOVA artefact .8·.25·(−10) = −2.00 (Lord 1960 closed form; computed).
  await expect(body).toContainText('ANCOVA on the observed pretest −2.00 (−80% of the effect)');
  await expect(body).toContainText('not a substitute for a statistician or an ethics board');
  await expect(body).toContainText('Thorndike, R. L. (1942)');

  const button = page.getByTestId('methods-copy');
  await button.focus();
  await page.keyboard.press('Enter');
  await expect(page.getByTestId('methods-status')).toHaveText('Copied the methods text.');
  const copied = await page.evaluate(() => navigator.clipboard.readText());
  expect(copied).toBe(expected);

  await page.setViewportSize({ width: 1280, height: 800 });
  await panel.scrollIntoViewIfNeeded();
  await panel.screenshot({ path: 'docs/screenshots/methods-text-1280.png' });
  expect(foreign).toEqual([]);
});
