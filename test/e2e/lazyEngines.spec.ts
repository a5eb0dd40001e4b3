// The engines for covariates, clusters and selection rules are not on the first screen: the page
// fetches them (src/state/pageEngines.ts) when a plan needs one. In a real browser (Debian's
// Chromium), a watcher installed before the page's own scripts records every state of the verdict;
// no state may show the demo's figures unmarked while the form holds another plan, and a shared
// link to a plan with clusters renders its own figures from the first paint.
import '../../src/core/allEngines';
import { expect, test, type Page } from '@playwright/test';
import { analysePlan } from '../../src/core/analysePlan';
import { headlineAnalysisId } from '../../src/core/design/studyDesign';
import { demoPlan } from '../../src/io/demoPlan';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { encodePlanForLink } from '../../src/io/shareLink';
import { fmtSigned } from '../../src/ui/format';
import { waitForPlannedFigures } from './plannerHelpers';

interface VerdictState {
  after: boolean;
  pending: boolean;
  bias: string | null;
  clusters: boolean;
}

/** Record the verdict after every change of the page, from before React's first render. */
async function watchVerdict(page: Page): Promise<void> {
  await page.addInitScript(() => {
    const w = window as unknown as { verdictLog: unknown[]; verdictMark: boolean };
    w.verdictLog = [];
    w.verdictMark = false;
    const record = () => {
      const v = document.querySelector('[data-testid="verdict"]');
      if (!v) return;
      w.verdictLog.push({
        after: w.verdictMark,
        pending: v.hasAttribute('data-pending'),
        bias: document.querySelector('[data-testid="verdict-bias"]')?.textContent ?? null,
        clusters: document.querySelector('[data-testid="cluster-counts"] dl') !== null,
      });
    };
    new MutationObserver(record).observe(document, { subtree: true, childList: true, attributes: true, characterData: true });
  });
}

const log = (page: Page) => page.evaluate(() => (window as unknown as { verdictLog: VerdictState[] }).verdictLog);

// The demo's headline artefact as the verdict shows it: beta(1 − rho)Delta = −2 points (Thorndike 1942; closed form, computed).
const demoBias = `${fmtSigned(analysePlan(demoPlan()).analyses[headlineAnalysisId(demoPlan())]!.regressionArtefact)} points`;

test('choosing the covariate example: the demo figures are never shown unmarked under it, then its own figures', async ({ page }) => {
  await watchVerdict(page);
  await page.goto('/');
  await page.evaluate(() => {
    localStorage.clear();
    sessionStorage.clear();
  });
  await page.goto('/');
  await expect(page.getByTestId('verdict-bias')).toBeVisible();
  // The demo's figure as shown once its quick simulation is in (it replaces the formula's).
  await waitForPlannedFigures(page);
  const demoShown = [demoBias, await page.getByTestId('verdict-bias').innerText()];
  const engines: string[] = [];
  page.on('request', (r) => {
    if (/allEngines-[\w-]+\.js$/.test(r.url())) engines.push(r.url());
  });
  await page.evaluate(() => ((window as unknown as { verdictMark: boolean }).verdictMark = true));
  await page.getByLabel('Invented examples').selectOption('after-school-maths');
  await expect(page.getByTestId('verdict')).not.toHaveAttribute('data-pending');
  for (const shown of demoShown) await expect(page.getByTestId('verdict-bias')).not.toHaveText(shown);
  expect(engines).toHaveLength(1); // fetched on demand, once
  const after = (await log(page)).filter((s) => s.after);
  expect(after.length).toBeGreaterThan(0);
  expect(after.filter((s) => s.bias !== null && demoShown.includes(s.bias) && !s.pending)).toEqual([]);
});

test('a shared link to a plan with clusters: its own figures from the first paint, never the demo\'s', async ({ page }) => {
  await watchVerdict(page);
  await page.goto('/');
  await page.evaluate(() => {
    localStorage.clear();
    sessionStorage.clear();
  });
  await page.goto('about:blank'); // a new load of the page, not a change of its address's fragment
  await page.goto(`/${encodePlanForLink(SCHOOLS_MATCHED_ON_MEANS)}`);
  await expect(page.getByTestId('cluster-counts').locator('dl')).toBeVisible();
  const states = await log(page);
  expect(states.length).toBeGreaterThan(0);
  // Every state the verdict was ever in belongs to the schools plan (rendered after its engine
  // arrived): never the demo's figure, never the working state.
  expect(states.filter((s) => s.bias === demoBias)).toEqual([]);
  expect(states.filter((s) => s.pending)).toEqual([]);
  // The link stays in the address until the plan is edited.
  expect(page.url()).toContain('#plan=');
});
