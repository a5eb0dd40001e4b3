// Pilot data in a real browser (Debian's Chromium): an invented, seeded pilot
// file goes in through the file input, its columns are mapped, the estimates
// appear, "Use these values" fills the plan (fields, provenance notes,
// results), a bad file explains itself and leaves the plan alone, a 100,000-row
// file is read and estimated without freezing the page, nothing leaves the
// machine, and axe finds no violations with the panel open.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import AxeBuilder from '@axe-core/playwright';
import { writeFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { parseDelimitedText } from '../../src/pilot/parseDelimitedText';
import { pilotPlanUpdate } from '../../src/pilot/pilotPlanUpdate';
import { inventedPilot } from '../state/pilotTestData';
import { fmtSigned } from '../../src/ui/format';
import { analysePlannedProcedure } from '../../src/sim/analysePlannedProcedure';
import { openFreshPlanner, shownNumber, trackForeignRequests, waitForPlannedFigures, watchedLongTasks, watchLongTasks } from './plannerHelpers';

const SHOTS = 'test-results/screens';
const PILOT = inventedPilot({ seed: 2026, programme: 80, comparison: 120, items: 6, retest: true, posttest: true });

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

async function openPanel(page: Page) {
  await page.getByRole('button', { name: /Estimate from pilot data/ }).click();
  await expect(page.getByRole('button', { name: /Choose a pilot file/ })).toBeVisible();
}

async function giveFile(page: Page, name: string, text: string) {
  await page.getByLabel('Pilot data file (CSV or TSV)').setInputFiles({ name, mimeType: 'text/csv', buffer: Buffer.from(text) });
}

test('import an invented pilot file, map its columns, use the estimates: the plan, its notes and the results follow', async ({ page }) => {
  const foreign = trackForeignRequests(page);
  await openPanel(page);
  await giveFile(page, 'wave1-invented.csv', PILOT.text);
  await expect(page.getByTestId('pilot-file-facts')).toContainText('wave1-invented.csv: 200 rows of data, 10 columns');

  // Map the columns as a researcher would (the guesses are checked, then set explicitly).
  await page.getByLabel('Group column').selectOption('group');
  await page.getByLabel('Programme group is').selectOption('programme');
  await page.getByRole('radio', { name: 'Item columns' }).check();
  for (const c of ['id', 'retest', 'posttest']) await expect(page.getByRole('checkbox', { name: c, exact: true })).not.toBeChecked();
  for (let j = 1; j <= 6; j++) await page.getByRole('checkbox', { name: `item${j}`, exact: true }).check();
  await page.getByLabel('Pretest score = the items’').selectOption('sum');
  await page.getByLabel('Retest column (optional)').selectOption('retest');
  await page.getByLabel('Posttest column (optional)').selectOption('posttest');
  const biasBefore = await page.getByTestId('verdict-bias').innerText();
  await page.getByRole('button', { name: 'Estimate', exact: true }).click();

  const estimates = page.getByTestId('pilot-estimates');
  await expect(estimates).toBeVisible();
  // n known by construction: 80 and 120 invented people.
  await expect(page.getByTestId('pilot-group-table').getByRole('row', { name: /^People used/ })).toContainText('80');
  await expect(page.getByTestId('pilot-group-table').getByRole('row', { name: /^People used/ })).toContainText('120');
  await expect(page.getByTestId('pilot-alpha')).toContainText('95% CI');
  await expect(page.getByTestId('pilot-status')).toContainText('Nothing is in the plan until you choose “Use these values”.');
  await expect(page.getByTestId('verdict-bias')).toHaveText(biasBefore);
  // With a retest mapped, test–retest is suggested for the plan (with why); the researcher picks alpha here.
  const choice = page.getByTestId('pilot-reliability-choice');
  await expect(choice.getByRole('radio', { name: /^test–retest correlation within groups.*\(suggested\)/ })).toBeChecked();
  await expect(choice).toContainText('day-to-day ups and downs');
  await expect(page.getByTestId('pilot-prepost-by-group')).toContainText('The plan uses the comparison group');
  await page.getByTestId('pilot-panel').screenshot({ path: `${SHOTS}/pilot-estimates.png` });
  await choice.getByRole('radio', { name: /^Cronbach's alpha within groups/ }).check();

  await page.getByRole('button', { name: 'Use these values' }).click();
  await expect(page.getByTestId('pilot-apply-report')).toBeVisible();
  // The corrected ANCOVA's assumed reliability is asked about, not changed.
  const offers = page.getByTestId('pilot-offers');
  await expect(offers).toContainText('The corrected ANCOVA still assumes a reliability of');
  await offers.screenshot({ path: `${SHOTS}/pilot-ancova-question.png` });

  // The same file, estimated and written in Node by the same pure functions:
  // the page must show those values (6 significant digits in the boxes).
  const mapping = {
    group: 'group',
    programmeValue: 'programme',
    pretest: { kind: 'items' as const, columns: ['item1', 'item2', 'item3', 'item4', 'item5', 'item6'], combine: 'sum' as const },
    retest: 'retest',
    posttest: 'posttest',
  };
  const est = estimatePilot(parseDelimitedText(PILOT.text), mapping, 'wave1-invented.csv');
  const expected = pilotPlanUpdate(demoPlan(), est).plan;
  const box = (name: RegExp) => page.getByRole('textbox', { name });
  const near = async (name: RegExp, value: number) => {
    const shown = Number(await box(name).inputValue());
    // Relative 5e-6: half a unit in the 6th significant digit.
    expect(Math.abs(shown - value), String(name)).toBeLessThanOrEqual(5e-6 * Math.abs(value));
  };
  await near(/^Pretest mean\s*, programme group/, expected.groups.programme.pretestMean);
  await near(/^Pretest SD\s*, comparison group/, expected.groups.comparison.pretestSD);
  await near(/^Reliability/, expected.pretest.reliability!);
  await near(/^Posttest SD/, expected.outcome.posttestSD);
  await near(/^Pre–post correlation/, expected.outcome.prePostCorrelation);

  // The provenance note appears under the field.
  await expect(page.locator('[data-field="pretest.reliability"] [data-testid="field-source"]')).toHaveText(
    expected.provenance!['pretest.reliability']!.note,
  );
  await expect(page.locator('[data-field="pretest.reliability"] [data-testid="field-source"]')).toContainText(/^from pilot file wave1-invented\.csv, Cronbach's alpha/);

  // Results follow: the verdict's bias is that of the new plan's planned procedure (the quick
  // simulation, the same function in Node); its formula is the closed form (Thorndike 1942 /
  // Lord 1960, via analysePlan in Node). 2-decimal display, tolerance 0.01.
  await expect(page.getByTestId('verdict-bias')).not.toHaveText(biasBefore);
  const plannedNew = analysePlannedProcedure(expected).analyses.matchedDifference!;
  await expect(page.getByTestId('verdict-basis')).toContainText(
    `gives ${fmtSigned(analysePlan(expected).analyses.matchedDifference!.expectedEstimate)}`,
    { timeout: 15_000 },
  );
  await waitForPlannedFigures(page);
  const bias = shownNumber(await page.getByTestId('verdict-bias').innerText());
  expect(Math.abs(bias - plannedNew.bias)).toBeLessThanOrEqual(0.01);
  await page.screenshot({ path: `${SHOTS}/pilot-applied.png`, fullPage: true });

  // Axe with the panel open, the estimates and the report on screen.
  const axe = await new AxeBuilder({ page }).analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.help} (${v.nodes.map((n) => n.target.join(' ')).join(' ; ')})`)).toEqual([]);

  // Reload: the plan keeps its pilot notes (autosave); the rows are gone.
  await page.reload();
  await expect(page.locator('[data-field="pretest.reliability"] [data-testid="field-source"]')).toContainText('wave1-invented.csv');
  await expect(page.getByTestId('pilot-estimates')).toHaveCount(0);
  expect(foreign).toEqual([]);
});

test('a non-numeric cell is named by column and row, and the plan is unchanged', async ({ page }) => {
  await openPanel(page);
  const bad = inventedPilot({ seed: 7, programme: 40, comparison: 40, items: 6, posttest: true, badCell: { row: 31, column: 'item5', text: 'n/k' } });
  const valuesBefore = await page.locator('.plan-form input[type="text"]').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value));
  const biasBefore = await page.getByTestId('verdict-bias').innerText();
  await giveFile(page, 'bad-invented.csv', bad.text);
  await expect(page.getByRole('checkbox', { name: 'item5 (has text)' })).toBeChecked();
  await page.getByRole('button', { name: 'Estimate', exact: true }).click();
  const alert = page.getByTestId('pilot-problem');
  // Data row 31 is line 33 of the file (a comment line and the header come first).
  await expect(alert).toHaveText('No estimates; your plan is unchanged. Column "item5" must hold numbers, but row 33 holds "n/k". Leave a cell empty (or write NA) where a value is missing.');
  await expect(alert).toHaveAttribute('role', 'alert');
  await expect(page.getByTestId('pilot-estimates')).toHaveCount(0);
  await page.getByTestId('pilot-panel').screenshot({ path: `${SHOTS}/pilot-bad-cell.png` });
  expect(await page.locator('.plan-form input[type="text"]').evaluateAll((els) => els.map((e) => (e as HTMLInputElement).value))).toEqual(valuesBefore);
  await expect(page.getByTestId('verdict-bias')).toHaveText(biasBefore);
});

test('100,000 rows are read and estimated off the main thread (no long task over 50 ms)', async ({ page }, testInfo) => {
  const big = inventedPilot({ seed: 99, programme: 40_000, comparison: 60_000, items: 6, retest: true, posttest: true });
  // Given as a file on disk: a file given as bytes would be rebuilt by the test harness inside the page,
  // on its main thread, which is not what a user's file picker does.
  const bigPath = testInfo.outputPath('big-invented.csv');
  writeFileSync(bigPath, big.text);
  await openPanel(page);
  const startedAt = await watchLongTasks(page, 'pilot-status', 'estimated', { marks: true });
  await page.getByLabel('Pilot data file (CSV or TSV)').setInputFiles(bigPath);
  await expect(page.getByTestId('pilot-file-facts')).toContainText('100,000 rows of data', { timeout: 60_000 });
  await page.getByRole('button', { name: 'Estimate', exact: true }).click();
  await expect(page.getByTestId('pilot-status')).toHaveAttribute('data-status', 'estimated', { timeout: 60_000 });
  const { during, doneAt, marks } = await watchedLongTasks(page, startedAt);
  expect(doneAt).not.toBeNull();
  console.log(
    `100,000 rows: ${Math.round(doneAt! - startedAt)} ms from choosing the file to the estimates (from ${Math.round(startedAt)}: ${marks.join(', ')}); long tasks: ${JSON.stringify(during)}`,
  );
  expect(during.filter((t) => t.duration > 50)).toEqual([]);
  await expect(page.getByTestId('pilot-group-table').getByRole('row', { name: /^People used/ })).toContainText('40,000');
  await expect(page.getByTestId('pilot-group-table').getByRole('row', { name: /^People used/ })).toContainText('60,000');
});
