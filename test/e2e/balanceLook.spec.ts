// The balance per covariate and the matching options in our own words, in a
// real browser (Debian's Chromium) at a laptop's and a phone's width: the
// invented covariate example matched on the pretest alone with a less reliable
// pretest, so one row looks balanced but is not; screenshots of the chart and the matching section.
import { expect, test } from '@playwright/test';
import { openFreshPlanner, retype } from './plannerHelpers';

const SHOTS = 'test-results/screens';

for (const [device, width, height] of [
  ['laptop', 1280, 800],
  ['phone', 390, 844],
] as const) {
  test(`balance per covariate as two lanes, matching options in plain words (${device}, ${width} px)`, async ({ page }) => {
    await openFreshPlanner(page);
    await page.setViewportSize({ width, height });
    // The matching section asks plain questions; the plan-file values sit underneath.
    const order = page.getByRole('combobox', { name: /^Who picks first/ });
    await expect(order.locator('option')).toHaveText(['Anyone: a random order', 'Those with the lowest pretest', 'Those with the highest pretest']);
    await expect(page.getByRole('checkbox', { name: 'May a comparison person be used more than once?' })).toBeVisible();
    await page.locator('fieldset', { has: order }).screenshot({ path: `${SHOTS}/${device}-matching-words.png` });

    await page.getByLabel('Invented examples').selectOption('after-school-maths');
    await page.getByRole('combobox', { name: /^Match on/ }).selectOption('pretest');
    // A less reliable pretest (invented: .6 instead of .85) leaves more of its true gap behind.
    await retype(page, /^Reliability/, '0.6');
    await expect(page.getByTestId('verdict')).not.toContainText('Out of date');
    const card = page.locator('figure[data-chart="covariateBalance"]');
    await expect(card.locator('svg [data-covariate]')).toHaveCount(5);
    // Matched on the pretest alone, the pretest looks balanced as measured but not on its true scores.
    await expect(card.locator('svg [data-covariate="Pretest"]')).toHaveAttribute('data-status', 'hidden');
    await expect(card.locator('svg [data-covariate="Family engagement"]')).toHaveAttribute('data-status', 'unmeasured');
    const right = await card.locator('svg').evaluate((e) => e.getBoundingClientRect().right);
    expect(right).toBeLessThanOrEqual(width);
    await card.screenshot({ path: `${SHOTS}/${device}-covariate-balance-lanes.png` });
    await page.screenshot({ path: `${SHOTS}/${device}-covariate-balance-page.png` });
  });
}
