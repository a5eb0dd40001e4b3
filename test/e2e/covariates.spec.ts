// Several covariates in a real browser (Debian's Chromium): add one by hand,
// break and fix a correlation cell, match on a propensity score, simulate and
// see the balance per covariate; load the invented covariate example and see
// the unmeasured part; accessibility (axe) in the covariate state.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { openFreshPlanner, retype, trackForeignRequests } from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('add a covariate, break a correlation cell and fix it, then simulate and see balance per covariate', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  // No covariates: the page is as before (pretest-only balance chart, no distance choice).
  await expect(page.locator('figure[data-chart="balance"]')).toHaveCount(1);
  await expect(page.getByRole('combobox', { name: /^Match on/ })).toHaveCount(0);

  await page.getByRole('button', { name: 'Add a covariate' }).click();
  // Focus goes to the new covariate's name.
  await expect(page.getByRole('textbox', { name: 'Covariate 1: Name', exact: true })).toBeFocused();
  await page.keyboard.press('Control+A');
  await page.keyboard.type('Attendance');
  await retype(page, 'Covariate 1: Programme mean', '85');
  await retype(page, 'Covariate 1: Comparison mean', '90');
  await retype(page, 'Covariate 1: SD within a group', '10');
  await retype(page, 'Covariate 1: Reliability', '0.7');
  await retype(page, 'Covariate 1: Correlation with the outcome', '0.3');

  // An impossible correlation: kept as typed, both mirror cells marked, the message beside the grid.
  const upper = page.getByRole('textbox', { name: 'Correlation of Pretest and Attendance', exact: true });
  const lower = page.getByRole('textbox', { name: 'Correlation of Attendance and Pretest', exact: true });
  await retype(page, 'Correlation of Pretest and Attendance', '1.2');
  await expect(lower).toHaveValue('1.2');
  await expect(upper).toHaveAttribute('aria-invalid', 'true');
  await expect(lower).toHaveAttribute('aria-invalid', 'true');
  const matrix = page.getByTestId('correlation-matrix');
  await expect(matrix.locator('.matrix-problems')).toContainText('Pretest × Attendance:');
  await expect(matrix.locator('.matrix-problems')).toContainText('1.2');
  await expect(page.getByTestId('verdict')).toContainText('Out of date');
  await matrix.screenshot({ path: `${SHOTS}/covariate-matrix-invalid.png` });

  // Within −1..1 but impossible with these reliabilities: .9 exceeds sqrt(.75 × .7) = .72 for the
  // true scores (Spearman 1904: a correlation of fallible scores is bounded by the root of the
  // product of reliabilities), so the whole matrix is flagged with the variables named.
  await retype(page, 'Correlation of Attendance and Pretest', '0.9');
  await expect(upper).toHaveValue('0.9');
  await expect(matrix.locator('.matrix-problems')).toContainText('Attendance');
  await expect(page.getByTestId('verdict')).toContainText('Out of date');

  // Fixed: the marks go, the results update.
  await retype(page, 'Correlation of Pretest and Attendance', '0.3');
  await expect(upper).not.toHaveAttribute('aria-invalid', 'true');
  await expect(matrix.locator('.matrix-problems')).toHaveCount(0);
  await expect(page.getByTestId('verdict')).not.toContainText('Out of date');
  await expect(page.getByTestId('verdict-unmeasured')).toContainText('Every covariate you listed is measured');

  // Match on a propensity score: the caliper's unit follows.
  await page.getByRole('combobox', { name: /^Match on/ }).selectOption('propensity');
  await expect(page.locator('[data-field="matching.caliper"]')).toContainText('SDs of the logit of the propensity score');
  await expect(page.getByTestId('verdict-lead')).toContainText('Matching on the propensity score');

  // Before a simulation the balance chart per covariate shows the closed form.
  const card = page.locator('figure[data-chart="covariateBalance"]');
  await expect(page.locator('figure[data-chart="balance"]')).toHaveCount(0);
  await expect(card.locator('svg [data-covariate]')).toHaveCount(2);
  await expect(card.locator('svg')).toContainText('Closed form');

  await retype(page, /^Replications/, '400');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await expect(card.locator('svg')).toContainText('From 400 simulated studies');
  await expect(card.locator('svg [data-covariate="Attendance"]')).toHaveCount(1);
  await card.locator('details summary').click();
  await expect(card.getByRole('table')).toContainText('Attendance');
  await card.screenshot({ path: `${SHOTS}/covariate-balance-simulated.png` });
  expect(foreign).toEqual([]);
});

test('the invented covariate example: the unmeasured confounder in the verdict; keyboard reorder; no axe violations', async ({ page }) => {
  // Opened as a plan file (JSON of the invented example), as a researcher would open a saved plan.
  await page.getByTestId('open-file-input').setInputFiles({
    name: 'after-school-maths.json',
    mimeType: 'application/json',
    buffer: Buffer.from(JSON.stringify(AFTER_SCHOOL_MATHS, null, 2)),
  });
  await expect(page.getByTestId('notice')).toContainText('Opened');
  const unmeasured = page.getByTestId('verdict-unmeasured');
  await expect(unmeasured).toContainText('Not measured: Family engagement.');
  await expect(page.getByTestId('verdict-unmeasured-bias')).toHaveText(/^[−+]?\d+\.\d\d points$/);
  await expect(page.locator('[data-covariate-card]')).toHaveCount(4);
  await page.screenshot({ path: `${SHOTS}/covariate-example.png`, fullPage: true });

  // Reorder with the keyboard: the correlations move with their covariate.
  const before = await page.getByRole('textbox', { name: 'Correlation of Pretest and Deprivation index', exact: true }).inputValue();
  await page.getByRole('button', { name: 'Move covariate 2 (Deprivation index) up' }).focus();
  await page.keyboard.press('Enter');
  await expect(page.getByRole('textbox', { name: 'Covariate 1: Name', exact: true })).toHaveValue('Deprivation index');
  await expect(page.getByRole('textbox', { name: 'Correlation of Pretest and Deprivation index', exact: true })).toHaveValue(before);
  await expect(page.getByRole('button', { name: 'Move covariate 1 (Deprivation index) down' })).toBeFocused();

  // Accessibility with covariates on the page, including an invalid cell.
  await retype(page, 'Correlation of Deprivation index and Attendance', '1.5');
  await expect(page.getByRole('textbox', { name: 'Correlation of Deprivation index and Attendance', exact: true })).toHaveAttribute('aria-invalid', 'true');
  const result = await new AxeBuilder({ page }).analyze();
  expect(result.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(' ; ')})`)).toEqual([]);
});
