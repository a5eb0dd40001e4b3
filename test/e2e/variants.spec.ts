// Candidate plans side by side, by keyboard only: "try this" on two remedies
// makes three variants; the table shows comparePlans' figures for each (the
// artefacts also checked by hand against closed forms); the PDF downloaded
// from the page carries the comparison (read back with pdfjs-dist);
// screenshots at 1280x800 and 390 px; axe finds no violations.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { mkdirSync, readFileSync } from 'node:fs';
import path from 'node:path';
import AxeBuilder from '@axe-core/playwright';
import { expect, test } from '@playwright/test';
import { applyRemedy } from '../../src/core/applyRemedy';
import { comparePlans } from '../../src/core/comparePlans';
import { demoPlan } from '../../src/io/demoPlan';
import { fmtPct, fmtSigned } from '../../src/ui/format';
import { readPdfText } from '../report/readPdfText';
import { focusedName, openFreshPlanner, tabTo } from './plannerHelpers';

const SHOTS = 'test-results/screens';

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('three variants compared by keyboard, in the table, the chart and the PDF; no axe violations', async ({ page }) => {
  test.setTimeout(120_000);
  await page.setViewportSize({ width: 1280, height: 800 });
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  // Keyboard only: Tab to each "Try this" button and press Enter.
  await page.keyboard.press('Tab');
  await tabTo(page, 'Try this: Average 4 parallel pretests');
  await page.keyboard.press('Enter');
  await tabTo(page, 'Try this: Compare gain scores');
  expect(await focusedName(page)).toContain('gain scores');
  await page.keyboard.press('Enter');

  const table = page.getByTestId('plan-comparison');
  await expect(table.locator('tbody tr')).toHaveCount(3);
  // The same rows core gives for the demo and the two remedies.
  const plan = demoPlan();
  const forms = applyRemedy(plan, 'more-reliable-pretest');
  const gain = applyRemedy(plan, 'gain-score');
  if (!forms.ok || !gain.ok) throw new Error('remedy not applicable');
  const rows = comparePlans([
    { name: 'As planned', plan },
    { name: 'forms', plan: forms.plan },
    { name: 'gain', plan: gain.plan, analysisId: gain.analysisId },
  ]);
  // By hand (demo, invented): beta(1 − rho)Delta = 0.8·0.25·(−10) = −2.00 (Cochran & Rubin 1973, from memory);
  // four forms, rho = 12/13 (Spearman 1910; Brown 1910): −0.62; gain score (beta − 1)Delta = +2.00 (Lord 1967).
  expect(rows.map((r) => fmtSigned(r.artefact))).toEqual([fmtSigned(-2), fmtSigned(-8 / 13), fmtSigned(2)]);
  for (const [i, r] of rows.entries()) {
    const cells = table.locator('tbody tr').nth(i).locator('td');
    await expect(cells.nth(1)).toHaveText(fmtSigned(r.artefact));
    await expect(cells.nth(3)).toContainText(fmtPct(r.falsePositiveRate));
    await expect(cells.nth(4)).toContainText(fmtPct(r.power, 0));
  }
  await expect(page.locator('.comparison-chart svg rect').first()).toBeAttached();

  mkdirSync(SHOTS, { recursive: true });
  await page.locator('section.variants').scrollIntoViewIfNeeded();
  await page.locator('section.variants').screenshot({ path: `${SHOTS}/variants-1280x800.png` });
  const axe = await new AxeBuilder({ page }).include('section.variants').include('section.remedies').analyze();
  expect(axe.violations.map((v) => `${v.id}: ${v.nodes.map((n) => n.target.join(' ')).join(', ')}`)).toEqual([]);

  // Rename by keyboard; a blank name is refused and the old one kept.
  const first = page.getByRole('textbox', { name: 'Name of the variant' }).first();
  await first.focus();
  await page.keyboard.press('Control+A');
  await page.keyboard.type('Invented: as planned');
  await page.keyboard.press('Enter');
  await expect(table.locator('tbody tr').first().locator('th')).toHaveText('Invented: as planned');

  // The PDF with the comparison.
  await page.getByRole('button', { name: /^Exports/ }).click();
  await expect(page.getByRole('checkbox', { name: /Include the comparison of the 3 candidate plans/ })).toBeChecked();
  const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Download PDF summary' }).click()]);
  const file = path.resolve('test-results', 'variants-summary.pdf');
  await download.saveAs(file);
  const text = await readPdfText(new Uint8Array(readFileSync(file)));
  const all = text.body.join(' ').replace(/\s+/g, ' ');
  expect(all).toContain('Candidate plans compared');
  expect(all).toContain('Invented: as planned');
  for (const r of rows) expect(all).toContain(fmtSigned(r.artefact));

  await page.setViewportSize({ width: 390, height: 844 });
  await page.locator('section.variants').scrollIntoViewIfNeeded();
  await page.locator('section.variants').screenshot({ path: `${SHOTS}/variants-390.png` });
  const overflow = await page.evaluate(() => document.documentElement.scrollWidth > window.innerWidth + 1);
  expect(overflow).toBe(false);
});
