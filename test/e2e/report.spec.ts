// The PDF summary from the real page: click the button, save the download,
// read it back with pdfjs-dist (an independent PDF reader), and render its
// pages to PNG with poppler's pdftoppm into artifacts/ for a person to look at.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, readdirSync, rmSync } from 'node:fs';
import path from 'node:path';
import { expect, test } from '@playwright/test';
import { parsePlanText } from '../../src/io/planFile';
import { planTextFromReportText } from '../../src/report/planJsonBlock';
import { readPdfText } from '../report/readPdfText';
import { waitForPlannedFigures } from './plannerHelpers';

const ARTIFACTS = path.resolve('artifacts');

test('the PDF summary downloaded from the page carries the plan, the figures on screen, the cautions and the plan file', async ({ page }) => {
  test.setTimeout(120_000);
  await page.goto('/');
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  await waitForPlannedFigures(page);
  const onScreenBias = (await page.getByTestId('verdict-bias').innerText()).replace(/\s*points$/, '').trim();
  // User text with markup must reach the PDF as text.
  const title = 'Invented <script>alert(1)</script> & "balance" pilot';
  await page.getByRole('textbox', { name: /^Plan title/ }).fill(title);

  // Simulate first, so the PDF has the simulated figures too.
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });

  await page.getByRole('button', { name: /^Exports/ }).click();
  await expect(page.getByTestId('export-caution')).toContainText('not a substitute for a statistician');
  const pdfButton = page.getByRole('button', { name: 'Download PDF summary' });
  await expect(pdfButton).toBeEnabled();
  const [download] = await Promise.all([page.waitForEvent('download'), pdfButton.click()]);
  expect(download.suggestedFilename()).toMatch(/-summary\.pdf$/);
  mkdirSync(ARTIFACTS, { recursive: true });
  const file = path.join(ARTIFACTS, 'e2e-summary.pdf');
  await download.saveAs(file);
  await expect(page.getByTestId('export-status')).toContainText('PDF summary downloaded.');

  const bytes = new Uint8Array(readFileSync(file));
  const text = await readPdfText(bytes);
  const all = text.body.join(' ').replace(/\s+/g, ' ');
  expect(text.body[0]).toBe('Meanward planning summary');
  expect(all).toContain('Caution: A planning aid under stated assumptions');
  // The bias the page shows is the bias the PDF states (same core result, same formatter).
  expect(all).toContain(`a regression-toward-the-mean artefact of ${onScreenBias} points`);
  expect(all).toContain('Simulated bias');
  expect(all).not.toContain('No simulation has been run');
  for (const ref of ['Thorndike, R. L. (1942)', 'Campbell, D. T., & Erlebacher, A. (1970)', 'Lord, F. M. (1960)', 'Porter, A. C. (1967)']) {
    expect(all).toContain(ref);
  }
  text.footers.forEach((f, i) => expect(f.join(' ')).toContain(`Page ${i + 1} of ${text.pages}`));
  // The plan file printed in the PDF is the plan on the page.
  const check = parsePlanText(planTextFromReportText(text.body.join('\n')) ?? '');
  expect(check.ok).toBe(true);
  if (check.ok) expect(check.plan.title).toBe(title);
  expect(all).toContain(title);

  // Pages as PNG for a person to look at (poppler-utils); skipped where pdftoppm is missing.
  for (const f of readdirSync(ARTIFACTS)) if (/^e2e-summary-\d+\.png$/.test(f)) rmSync(path.join(ARTIFACTS, f));
  if (existsSync('/usr/bin/pdftoppm')) {
    const r = spawnSync('/usr/bin/pdftoppm', ['-png', '-r', '70', file, path.join(ARTIFACTS, 'e2e-summary')]);
    expect(r.status).toBe(0);
    expect(readdirSync(ARTIFACTS).filter((f) => /^e2e-summary-\d+\.png$/.test(f))).toHaveLength(text.pages);
  }
});

test('the estimates CSV and chart images download from the page', async ({ page }) => {
  test.setTimeout(120_000);
  await page.goto('/');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await page.getByRole('button', { name: /^Exports/ }).click();
  mkdirSync(ARTIFACTS, { recursive: true });

  const [csv] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Estimates CSV' }).click()]);
  const csvText = readFileSync(await csv.path(), 'utf8');
  const lines = csvText.trim().split('\r\n');
  expect(lines[0]).toBe('replication,seed,matched_difference,ancova_observed_pretest,gain_score,reliability_corrected_ancova,plan_title');
  const replications = Number((await page.getByTestId('sim-status').innerText()).match(/([\d,]+) replications/)?.[1]?.replace(/,/g, ''));
  expect(lines).toHaveLength(replications + 1);

  const [svg] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Balance after matching chart as SVG' }).click()]);
  const svgText = readFileSync(await svg.path(), 'utf8');
  expect(svgText.startsWith('<?xml version="1.0" encoding="UTF-8"?>\n<svg')).toBe(true);

  const [png] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name: 'Estimates by analysis chart as PNG' }).click()]);
  const file = path.join(ARTIFACTS, 'e2e-chart-estimates.png');
  await png.saveAs(file);
  const bytes = readFileSync(file);
  // PNG signature and IHDR (W3C PNG specification, sections 5.2 and 11.2.2): 89 50 4E 47 0D 0A 1A 0A,
  // then width and height as 4-byte big-endian integers at offsets 16 and 20.
  expect([...bytes.subarray(0, 8)]).toEqual([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
  const svgWidth = Number(svgText.match(/<svg[^>]*\swidth="([\d.]+)"/)?.[1]);
  expect(svgWidth).toBeGreaterThan(0);
  // Drawn at twice the chart's size.
  expect(bytes.readUInt32BE(16)).toBe(2 * 720);
});

test('exports say why they are unavailable while the plan has a problem', async ({ page }) => {
  await page.goto('/');
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  await page.getByRole('button', { name: /^Exports/ }).click();
  const pdfButton = page.getByRole('button', { name: 'Download PDF summary' });
  await expect(pdfButton).toBeEnabled();
  // Type an impossible reliability into the form.
  const reliability = page.getByRole('spinbutton', { name: /^Reliability/ }).or(page.getByRole('textbox', { name: /^Reliability/ })).first();
  await reliability.fill('1.4');
  await expect(pdfButton).toBeDisabled();
  await expect(page.getByText(/Exports are unavailable while the plan has/)).toBeVisible();
  // What the user typed is kept.
  await expect(reliability).toHaveValue('1.4');
});
