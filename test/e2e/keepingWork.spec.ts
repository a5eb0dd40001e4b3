// Not losing work, in a real browser (Debian's Chromium): a malformed "#plan"
// link is reported; an unreadable autosave is reported and can be downloaded;
// every replace can be undone by keyboard; a link opened in a second tab leaves
// the first tab's draft alone; and a half-typed pre–post correlation never
// becomes "the last complete plan". Screens at 1280×800 and 390×844.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { encodePlanForLink } from '../../src/io/shareLink';
import { AUTOSAVE_KEY, UNREADABLE_KEY } from '../../src/state/persistenceSlice';
import { openFreshPlanner, retype, trackForeignRequests, waitForPlannedFigures } from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

/** The planner is there: its main heading and the plan form. */
async function expectPlannerShown(page: Page) {
  await expect(page.getByRole('heading', { level: 1, name: 'Meanward' })).toBeVisible();
  await expect(page.getByRole('form', { name: 'Study plan' })).toBeVisible();
}

test('a "#plan" link without "=" says it could not be read and keeps the plan', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  await retype(page, /^Caliper/, '0.35');
  await page.getByRole('textbox', { name: /^Caliper/ }).press('Enter');
  await page.goto('/#plan');
  await expect(page.getByTestId('notice')).toHaveAttribute('data-kind', 'error');
  await expect(page.getByTestId('notice')).toContainText('The shared link could not be read, so your current plan is unchanged.');
  await expect(page.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.35');
  await expectPlannerShown(page);
  expect(foreign).toEqual([]);
});

test('an unreadable autosave is reported, downloadable as stored, and kept until dismissed', async ({ page }) => {
  const raw = '{"version":1,"draft":{"title":"Reading study","groups":{"programme"'; // cut short
  await page.evaluate(([key, text]) => localStorage.setItem(key!, text!), [AUTOSAVE_KEY, raw]);
  await page.evaluate(() => sessionStorage.clear());
  await page.reload();
  const box = page.getByTestId('unreadable-draft-notice');
  await expect(box).toBeVisible();
  await expect(box).toContainText('could not be read');
  await expectPlannerShown(page);
  for (const [w, h] of [
    [1280, 800],
    [390, 844],
  ] as const) {
    await page.setViewportSize({ width: w, height: h });
    await page.screenshot({ path: `${SHOTS}/unreadable-autosave-${w}x${h}.png` });
  }
  await page.setViewportSize({ width: 1280, height: 800 });
  const [download] = await Promise.all([page.waitForEvent('download'), box.getByRole('button', { name: 'Download the unreadable draft' }).click()]);
  expect(readFileSync((await download.path())!, 'utf8')).toBe(raw);
  // Still kept after a reload (not yet dismissed); gone once dismissed.
  await page.reload();
  await expect(page.getByTestId('unreadable-draft-notice')).toBeVisible();
  await page.getByRole('button', { name: 'Dismiss and forget it' }).click();
  await expect(page.getByTestId('unreadable-draft-notice')).toHaveCount(0);
  expect(await page.evaluate((key) => localStorage.getItem(key), UNREADABLE_KEY)).toBeNull();
});

test('Reset to demo, then Undo by keyboard brings back the text as typed (announced as a status)', async ({ page }) => {
  await retype(page, /^Pre–post correlation/, '0.5 maybe');
  await page.getByRole('button', { name: 'Reset to demo' }).focus();
  await page.keyboard.press('Enter');
  await expect(page.getByRole('textbox', { name: /^Pre–post correlation/ })).toHaveValue(String(demoPlan().outcome.prePostCorrelation));
  const notice = page.getByRole('status').filter({ has: page.getByTestId('notice') });
  await expect(notice).toContainText('reset to the demo plan');
  for (const [w, h] of [
    [1280, 800],
    [390, 844],
  ] as const) {
    await page.setViewportSize({ width: w, height: h });
    await page.screenshot({ path: `${SHOTS}/undo-notice-${w}x${h}.png` });
  }
  await page.setViewportSize({ width: 1280, height: 800 });
  const undo = page.getByRole('button', { name: 'Undo' });
  for (let i = 0; i < 10; i++) {
    if (await undo.evaluate((el) => el === document.activeElement)) break;
    await page.keyboard.press('Tab');
  }
  await expect(undo).toBeFocused();
  await page.keyboard.press('Enter');
  await expect(page.getByRole('textbox', { name: /^Pre–post correlation/ })).toHaveValue('0.5 maybe');
  await expect(page.getByTestId('notice')).toContainText('Brought back your plan');
});

test("a link opened in a second tab leaves the first tab's edits alone; a new tab without a link gets the last draft", async ({ page, context }) => {
  await retype(page, /^Caliper/, '0.31');
  await retype(page, 'Plan title', 'Tab A study');
  await page.getByRole('textbox', { name: 'Plan title' }).press('Enter');
  const link = encodePlanForLink({ ...demoPlan(), title: 'Linked plan' });
  const tabB = await context.newPage();
  await tabB.goto(`/${link}`);
  await expect(tabB.getByRole('textbox', { name: 'Plan title' })).toHaveValue('Linked plan');
  await page.reload();
  await expect(page.getByRole('textbox', { name: 'Plan title' })).toHaveValue('Tab A study');
  await expect(page.getByRole('textbox', { name: /^Caliper/ })).toHaveValue('0.31');
  const tabC = await context.newPage();
  await tabC.goto('/');
  await expect(tabC.getByRole('textbox', { name: 'Plan title' })).toHaveValue('Tab A study');
  await tabB.close();
  await tabC.close();
});

test('typing 0.95 into the pre–post correlation never shows the verdict for r = 0 (a keystroke on the way)', async ({ page }) => {
  // The check can fail: r = 0 gives another artefact than the demo's r (closed form, analysePlan).
  const demo = demoPlan();
  const atZero = analysePlan({ ...demo, outcome: { ...demo.outcome, prePostCorrelation: 0 } }).analyses.matchedDifference!.bias;
  expect(Math.abs(atZero - analysePlan(demo).analyses.matchedDifference!.bias)).toBeGreaterThan(0.05);
  await waitForPlannedFigures(page); // the figures settle (quick simulation) before the comparison
  const bias = page.getByTestId('verdict-bias');
  const before = (await bias.textContent())!;
  const verdict = (await page.getByTestId('verdict').getAttribute('data-verdict'))!;
  const box = page.getByRole('textbox', { name: /^Pre–post correlation/ });
  await box.fill('');
  await box.pressSequentially('0.95', { delay: 40 });
  await expect(page.getByText(/^Out of date/)).toBeVisible();
  await expect(bias).toHaveText(before);
  await box.press('Tab'); // leaving the field adopts nothing: the value is invalid
  await page.waitForTimeout(1000); // past the typing pause (700 ms): nothing was waiting to be adopted
  await expect(page.getByText(/^Out of date/)).toBeVisible();
  await expect(bias).toHaveText(before);
  await expect(page.getByTestId('verdict')).toHaveAttribute('data-verdict', verdict);
  await expect(box).toHaveValue('0.95');
});
