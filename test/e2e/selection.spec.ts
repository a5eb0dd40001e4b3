// Who gets the programme, in a real browser (Debian's Chromium), by keyboard
// alone: a researcher enters a screened cut-off study and a one-group
// pre–post study from scratch, gets a verdict that names the rule, and axe
// finds no accessibility violations. Figures on screen are compared with the
// same core functions run in Node (2-decimal display; tolerance 0.01 for the
// quick simulation of the planned procedure, exact for closed forms).
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { CLINIC_HIGH_READINGS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';
import { fmtSigned } from '../../src/ui/format';
import { choose, clippedChartLabels, openFreshPlanner, shownNumber, startAtPlanTitle, trackForeignRequests, typeInto, waitForPlannedFigures } from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('a screened cut-off study, entered by keyboard: the verdict names the rule, five analyses, no axe violations', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  await startAtPlanTitle(page);
  await page.keyboard.press('Control+A');
  await page.keyboard.type('Reading support by a screening cut-off');
  await choose(page, 'Study design', 'Two groups compared');
  await choose(page, 'How people got into the programme', 'A cut-off on a score');
  await choose(page, 'What the rule looked at', 'A separate screening test');
  await typeInto(page, 'Screener reliability', '0.7');
  await typeInto(page, 'Cut-off', '85');
  await choose(page, 'Who is selected', 'Those below it');
  await typeInto(page, 'Population name', 'Year 2 pupils in the district');
  await typeInto(page, 'Population size', '3000');
  await typeInto(page, 'Pretest mean in the population', '100');
  await typeInto(page, 'Pretest SD in the population', '15');
  await typeInto(page, 'Name of the selected group', 'Pupils given reading support');
  await typeInto(page, 'Name of the people not selected', 'Pupils not selected');
  await typeInto(page, 'Reliability', '0.85');
  await typeInto(page, 'Reference SD', '15');
  await typeInto(page, 'Posttest SD', '15');
  await typeInto(page, 'Pre–post correlation', '0.7');
  await typeInto(page, 'Growth gap', '0');
  await typeInto(page, 'Hypothesised effect', '4');
  await page.keyboard.press('Enter');

  // The same plan in Node: the invented example has exactly these inputs; the matching, analysis and
  // simulation settings are the demo's, left as they were.
  const demo = demoPlan();
  const plan = { ...structuredClone(SCREENED_READING_SUPPORT), title: 'Reading support by a screening cut-off', matching: demo.matching, analysis: demo.analysis, simulation: demo.simulation };
  const a = analysePlan(plan);
  await expect(page.getByTestId('verdict-rule')).toHaveText(a.design.rule);
  await expect(page.getByTestId('verdict-meaning')).toHaveText(a.design.meaning);
  await expect(page.getByTestId('verdict-rule')).toContainText('screener score was below 85');
  await expect(page.locator('[data-testid="comparison-table"] tbody tr')).toHaveCount(5);
  await expect(page.locator('tr[data-analysis="regressionDiscontinuity"]')).toContainText('about 2.75 times at a cut-off in the middle of the scores');
  await expect(page.getByRole('note').first()).toContainText('statistician');
  await waitForPlannedFigures(page);
  const planned = analysePlannedProcedure(plan).analyses.matchedDifference!;
  expect(Math.abs(shownNumber(await page.getByTestId('verdict-bias').innerText()) - planned.bias)).toBeLessThanOrEqual(0.01);
  await expect(page.locator('figure[data-chart="pretest"] svg')).toContainText('Chance of selection');
  await page.screenshot({ path: `${SHOTS}/selection-screened-1366.png`, fullPage: true });

  const result = await new AxeBuilder({ page }).analyze();
  expect(result.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(' ; ')})`)).toEqual([]);
  expect(foreign).toEqual([]);
});

test('a one-group pre–post study, entered by keyboard: the change expected with no programme beside the hoped-for effect; no axe violations', async ({ page }) => {
  await startAtPlanTitle(page);
  await page.keyboard.press('Control+A');
  await page.keyboard.type('Clinic course for high readings');
  await choose(page, 'Study design', 'One group, measured before and after');
  // A one-group study needs a rule: the rule has moved to a cut-off by itself.
  await expect(page.getByRole('combobox', { name: /^How people got into the programme/ })).toHaveValue('cut-off');
  await choose(page, 'What the rule looked at', 'The pretest');
  await typeInto(page, 'Cut-off', '150');
  await choose(page, 'Who is selected', 'Those above it');
  await typeInto(page, 'Population name', 'Adults seen at the health-check clinic');
  await typeInto(page, 'Population size', '5000');
  await typeInto(page, 'Pretest mean in the population', '130');
  await typeInto(page, 'Pretest SD in the population', '16');
  await typeInto(page, 'Name of the selected group', 'Patients invited to the course');
  await typeInto(page, 'Reliability', '0.7');
  await typeInto(page, 'Reference SD', '16');
  await typeInto(page, 'Posttest SD', '16');
  await typeInto(page, 'Pre–post correlation', '0.6');
  await typeInto(page, 'Change everyone shows anyway', '0');
  await typeInto(page, 'Hypothesised effect', '-5');
  await page.keyboard.press('Enter');

  const demo = demoPlan();
  const plan = { ...structuredClone(CLINIC_HIGH_READINGS), title: 'Clinic course for high readings', matching: demo.matching, analysis: demo.analysis, simulation: demo.simulation };
  const a = analysePlan(plan);
  await expect(page.getByTestId('verdict')).toContainText('Verdict: the pre–post change');
  await expect(page.getByTestId('verdict-rule')).toHaveText(a.design.rule);
  await expect(page.getByTestId('verdict-no-programme-change')).toHaveText(`${fmtSigned(a.design.noProgrammeChange)} points`);
  await expect(page.getByTestId('verdict-beside')).toContainText(`${fmtSigned(a.tau)} points`);
  await expect(page.locator('[data-testid="comparison-table"] tbody tr')).toHaveCount(1);
  await expect(page.getByRole('group', { name: /The matching plan/ })).toHaveCount(0);
  await expect(page.locator('figure[data-chart="balance"]')).toHaveCount(0);
  await page.screenshot({ path: `${SHOTS}/selection-one-group-1366.png`, fullPage: true });

  const result = await new AxeBuilder({ page }).analyze();
  expect(result.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(' ; ')})`)).toEqual([]);
});

for (const [device, width, height] of [
  ['phone', 390, 844],
  ['laptop', 1280, 800],
] as const) {
  test(`on a ${device} (${width} × ${height}): both selection examples fit, with every chart label inside its chart`, async ({ page }) => {
    await page.setViewportSize({ width, height });
    for (const [id, charts] of [
      ['screened-reading-support', 4],
      ['clinic-high-readings', 3], // a one-group study has no balance chart
    ] as const) {
      await page.getByLabel('Invented examples').selectOption(id);
      await expect(page.getByTestId('verdict-rule')).toBeVisible();
      await expect.poll(() => page.locator('figure[data-chart] svg title').count(), { timeout: 15_000 }).toBe(charts);
      await page.waitForTimeout(600);
      expect(await page.evaluate(() => document.documentElement.scrollWidth), `${id}: page width`).toBeLessThanOrEqual(width);
      for (const right of await page.locator('figure[data-chart] svg').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().right))) {
        expect(right, `${id}: a chart runs off the right edge`).toBeLessThanOrEqual(width);
      }
      expect(await clippedChartLabels(page), `${id}: chart labels outside their chart`).toEqual([]);
      await page.screenshot({ path: `${SHOTS}/${device}-${id}.png`, fullPage: true });
    }
  });
}
