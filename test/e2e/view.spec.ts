// What a researcher sees and reaches: the whole page by keyboard alone (demo, the invented
// covariate example, after a simulation); a phone (390 × 844), a laptop (1280 × 800) and print,
// with screenshots kept in test-results/screens/ for a person to look at.
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync } from 'node:fs';
import { expect, test, type Page } from '@playwright/test';
import { clippedChartLabels, openFreshPlanner } from './plannerHelpers';

const SHOTS = 'test-results/screens';

/**
 * A name for every control Tab should reach, in page order: visible, enabled, focusable
 * elements (radio groups once: Tab stops on one radio per group). Names survive chart redraws.
 */
async function reachableControls(page: Page): Promise<string[]> {
  return page.evaluate(() => {
    const sel = 'a[href], button, input, select, textarea, summary, [tabindex]';
    const names: string[] = [];
    for (const el of Array.from(document.querySelectorAll<HTMLElement>(sel))) {
      if (el.getAttribute('tabindex') === '-1' || (el as HTMLButtonElement).disabled || el.closest('[inert]')) continue;
      if (el.getClientRects().length === 0 || getComputedStyle(el).visibility === 'hidden') continue;
      if (el.closest('details:not([open])') && el.tagName !== 'SUMMARY') continue;
      const name = (window as unknown as { __controlName: (e: Element) => string }).__controlName(el);
      if (!names.includes(name)) names.push(name);
    }
    return names;
  });
}

/** Install the naming function used by reachableControls and the Tab walk. */
async function installNamer(page: Page): Promise<void> {
  await page.evaluate(() => {
    (window as unknown as { __controlName: (e: Element) => string }).__controlName = (el: Element) => {
      if (el instanceof HTMLInputElement && el.type === 'radio') return `radio group ${el.name}`;
      const label =
        el.getAttribute('aria-label') ??
        (el.id ? document.querySelector(`label[for="${CSS.escape(el.id)}"]`)?.textContent : null) ??
        el.closest('label')?.textContent ??
        el.getAttribute('data-testid') ??
        el.textContent ??
        '';
      const chart = el.closest('figure[data-chart]')?.getAttribute('data-chart') ?? '';
      const index = chart ? Array.from(el.closest('figure')!.querySelectorAll(el.tagName)).indexOf(el) : '';
      return `${el.tagName.toLowerCase()}${chart ? `@${chart}#${index}` : ''}: ${label.replace(/\s+/g, ' ').trim().slice(0, 80)}`;
    };
  });
}

/**
 * Press Tab from the top of the page until focus leaves the page; every control must be
 * reached, and focus may land on the page body only after the last one.
 */
async function tabThroughPage(page: Page, label: string): Promise<void> {
  await installNamer(page);
  // Let pending chart redraws settle, then start from the top.
  await page.waitForTimeout(300);
  const expected = await reachableControls(page);
  // Start at the first control (the skip link), as a first Tab from the address bar would.
  await page.locator('.skip-link').focus();
  const visited: string[] = [expected[0]!];
  expect(visited[0]).toBe('a: Skip to the results');
  for (let i = 0; i < expected.length + 40; i++) {
    await page.keyboard.press('Tab');
    const now = await page.evaluate(() => {
      const a = document.activeElement;
      return !a || a === document.body ? null : (window as unknown as { __controlName: (e: Element) => string }).__controlName(a);
    });
    if (now === null) break;
    visited.push(now);
  }
  const missed = expected.filter((n) => !visited.includes(n));
  expect(missed, `${label}: controls never reached by Tab (focus fell to the page after "${visited.at(-1)}")`).toEqual([]);
  expect(visited.length, `${label}: at least one Tab stop per control`).toBeGreaterThanOrEqual(expected.length);
}

test.beforeEach(async ({ page }) => {
  await openFreshPlanner(page);
});

test('the whole page can be reached by keyboard: the demo, the covariate example, and after a simulation', async ({ page }) => {
  test.setTimeout(180_000);
  await tabThroughPage(page, 'demo');

  // Load the invented covariate example with the keyboard alone.
  await page.getByLabel('Invented examples').focus();
  await page.getByLabel('Invented examples').selectOption('after-school-maths');
  await expect(page.locator('[data-covariate-card]')).toHaveCount(4);
  await expect(page.locator('figure[data-chart="covariateBalance"] svg')).toHaveCount(1);
  await tabThroughPage(page, 'covariate example');

  // Enter on "Run the simulation": focus stays on the button through the run.
  await page.getByRole('button', { name: 'Reset to demo' }).click();
  await page.getByRole('textbox', { name: /^Replications/ }).fill('400');
  const runButton = page.getByRole('button', { name: /^Run the simulation/ });
  await runButton.focus();
  await page.keyboard.press('Enter');
  await expect(page.getByTestId('sim-status')).toHaveAttribute('data-status', 'done', { timeout: 90_000 });
  await expect(runButton).toBeFocused();
  await tabThroughPage(page, 'after a simulation');
});

test('a legend entry keeps the keyboard focus while the charts redraw its emphasis', async ({ page }) => {
  const legend = page.getByRole('button', { name: 'Emphasise Matched difference in all charts' });
  await expect(legend.first()).toBeVisible();
  const focusedName = () => page.evaluate(() => document.activeElement?.getAttribute('aria-label') ?? document.activeElement?.tagName);
  // Focus emphasises the analysis (a redraw), Enter toggles it off (another redraw): each redraw
  // replaces the element, and the same logical control has the focus afterwards.
  await legend.last().focus();
  // Emphasised in both charts with legend controls (estimates and sensitivity).
  await expect(page.locator('svg [aria-pressed="true"][data-analysis="matchedDifference"]')).toHaveCount(2);
  expect(await focusedName()).toBe('Emphasise Matched difference in all charts');
  await page.keyboard.press('Enter');
  await expect(page.locator('svg [aria-pressed="true"]')).toHaveCount(0);
  expect(await focusedName()).toBe('Emphasise Matched difference in all charts');
  await page.keyboard.press('Tab');
  await expect.poll(focusedName).toBe('Emphasise ANCOVA in all charts');
});

async function checkLayout(page: Page, name: string, width: number): Promise<void> {
  // Charts draw for their width in their own tasks: wait until every one is drawn at the width shown.
  await expect.poll(() => page.locator('figure[data-chart] svg title').count(), { timeout: 15_000 }).toBeGreaterThanOrEqual(4);
  await page.waitForTimeout(600);
  // No sideways page scroll (tables may scroll inside their own box).
  expect(await page.evaluate(() => document.documentElement.scrollWidth), `${name}: page width`).toBeLessThanOrEqual(width);
  for (const box of await page.locator('figure[data-chart] svg').evaluateAll((els) => els.map((e) => e.getBoundingClientRect().right))) {
    expect(box, `${name}: a chart runs off the right edge`).toBeLessThanOrEqual(width);
  }
  expect(await clippedChartLabels(page), `${name}: chart labels outside their chart`).toEqual([]);
  await page.screenshot({ path: `${SHOTS}/${name}.png`, fullPage: true });
}

for (const [device, width, height] of [
  ['phone', 390, 844],
  ['laptop', 1280, 800],
] as const) {
  test(`on a ${device} (${width} × ${height}): no sideways scroll, charts fit, labels inside; demo and covariate example`, async ({ page }) => {
    test.setTimeout(120_000);
    await page.setViewportSize({ width, height });
    await checkLayout(page, `${device}-demo`, width);
    await page.locator('figure[data-chart="pretest"]').screenshot({ path: `${SHOTS}/${device}-demo-pretest.png` });
    await page.getByLabel('Invented examples').selectOption('after-school-maths');
    await expect(page.locator('figure[data-chart="covariateBalance"] svg')).toHaveCount(1);
    await checkLayout(page, `${device}-covariates`, width);
    await page.locator('figure[data-chart="covariateBalance"]').screenshot({ path: `${SHOTS}/${device}-covariate-balance.png` });
  });
}

test('print: one chart per width, no controls, names in full; pages kept as PNG', async ({ page }) => {
  test.setTimeout(120_000);
  await page.setViewportSize({ width: 1280, height: 800 });
  await page.getByLabel('Invented examples').selectOption('after-school-maths');
  await expect(page.locator('figure[data-chart="covariateBalance"] svg')).toHaveCount(1);
  await page.waitForTimeout(600);
  await page.emulateMedia({ media: 'print' });
  await expect(page.locator('button:visible')).toHaveCount(0);
  await expect(page.locator('input[type="radio"]:visible')).toHaveCount(0);
  // Charts stacked, each the full width of its section.
  const boxes = await page.locator('figure[data-chart]').evaluateAll((els) => els.map((e) => e.getBoundingClientRect()).map((r) => ({ x: r.x, y: r.y, w: r.width })));
  const sectionWidth = await page.locator('.charts').evaluate((e) => e.getBoundingClientRect().width);
  expect(boxes).toHaveLength(4);
  for (let i = 1; i < boxes.length; i++) expect(boxes[i]!.y).toBeGreaterThan(boxes[i - 1]!.y);
  for (const b of boxes) expect(b.w).toBeGreaterThan(0.85 * sectionWidth);
  // Covariate names and values print in full: no text box narrower than its value.
  const cut = await page.locator('input[type="text"]:visible').evaluateAll((els) =>
    (els as HTMLInputElement[]).filter((e) => e.scrollWidth > e.clientWidth + 1).map((e) => `${e.name}: ${e.value}`),
  );
  expect(cut).toEqual([]);
  mkdirSync(SHOTS, { recursive: true });
  const pdf = `${SHOTS}/print-covariates.pdf`;
  await page.pdf({ path: pdf, format: 'A4', printBackground: true });
  if (existsSync('/usr/bin/pdftoppm')) {
    const r = spawnSync('/usr/bin/pdftoppm', ['-png', '-r', '60', pdf, `${SHOTS}/print-covariates`]);
    expect(r.status).toBe(0);
  }
});
