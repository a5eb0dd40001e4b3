// The built page under its Content-Security-Policy (meta tag; vite.config.ts): using the planner,
// running a simulation, exporting PNG, SVG and PDF, and reading a pilot file raise no violation
// (no inline script, no eval, no blocked image, worker or style) and no console error.
import { readFileSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { openFreshPlanner, retype } from './plannerHelpers';

/** Record securitypolicyviolation events (from page load on) and console errors. */
async function watchPolicy(page: Page): Promise<{ violations: () => Promise<string[]>; errors: string[] }> {
  const errors: string[] = [];
  page.on('console', (m) => {
    if (m.type() === 'error') errors.push(m.text());
  });
  page.on('pageerror', (e) => errors.push(e.message));
  await page.addInitScript(() => {
    const w = window as unknown as { __cspViolations: string[] };
    w.__cspViolations = [];
    document.addEventListener('securitypolicyviolation', (e) => {
      w.__cspViolations.push(`${e.violatedDirective} blocked ${e.blockedURI || '(inline)'} at ${e.sourceFile}:${e.lineNumber}`);
    });
  });
  return {
    violations: () => page.evaluate(() => (window as unknown as { __cspViolations: string[] }).__cspViolations),
    errors,
  };
}

test('no Content-Security-Policy violation or console error while planning, simulating, exporting and reading a pilot file', async ({ page }) => {
  test.setTimeout(150_000);
  const watch = await watchPolicy(page);
  await openFreshPlanner(page);
  // The policy is in the served page.
  const policy = await page.locator('meta[http-equiv="Content-Security-Policy"]').getAttribute('content');
  expect(policy).toContain("script-src 'self'");
  expect(policy).not.toContain('unsafe-eval');
  expect(policy).not.toContain('unsafe-inline');

  // Plan: edit a field, open the covariate example, back to the demo, simulate.
  await retype(page, /^Reliability/, '0.8');
  await page.getByLabel('Invented examples').selectOption('after-school-maths');
  await expect(page.locator('[data-covariate-card]')).toHaveCount(4);
  await page.getByRole('button', { name: 'Reset to demo' }).click();
  await retype(page, /^Replications/, '400');
  await page.getByRole('button', { name: /^Run the simulation/ }).click();
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });

  // Exports: PNG, SVG, PDF.
  await page.getByRole('button', { name: /^Exports/ }).click();
  for (const name of ['Estimates by analysis chart as PNG', 'Balance after matching chart as SVG', 'Download PDF summary']) {
    const [download] = await Promise.all([page.waitForEvent('download'), page.getByRole('button', { name }).click()]);
    expect((await download.path()) ?? '').not.toBe('');
    await expect(page.getByTestId('export-status')).toContainText('downloaded', { timeout: 60_000 });
  }

  // A pilot file read in its worker.
  await page.getByRole('button', { name: /Estimate from pilot data/ }).click();
  await page.getByLabel('Pilot data file (CSV or TSV)').setInputFiles({
    name: 'invented-pilot-cohort.csv',
    mimeType: 'text/csv',
    buffer: readFileSync('public/examples/pilot/invented-pilot-cohort.csv'),
  });
  await expect(page.getByTestId('pilot-file-facts')).toContainText('rows of data');

  expect(await watch.violations()).toEqual([]);
  expect(watch.errors).toEqual([]);
});
