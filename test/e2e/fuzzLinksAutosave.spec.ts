// Seeded, bounded fuzz in a real browser (Debian's Chromium): 320 share-link
// fragments (valid, cut short, mutated, wrong JSON, huge numbers, control
// characters, script payloads, malformed "#plan" prefixes) set one after the
// other in one page, and over 100 stored autosaves (damaged or odd), two per
// reload (this tab's draft and the browser's last draft). For every case: no uncaught page error, the planner's heading and
// form still shown, a plain notice whenever the input could not be read (and
// then the plan on screen unchanged), and no request off the origin.
// Expected outcomes come from the same readers in Node (decodePlanFromLink,
// restoreDrafts), so a case the browser handles differently fails.
// Every design's closed forms, for the figures this spec computes itself (src/core/engineRegistry.ts).
import '../../src/core/allEngines';
import { expect, test, type Page } from '@playwright/test';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { decodePlanFromLink, encodePlanForLink } from '../../src/io/shareLink';
import { AUTOSAVE_KEY, isShareFragment, restoreDrafts, TAB_DRAFT_KEY, UNREADABLE_KEY } from '../../src/state/persistenceSlice';
import { planToDraft } from '../../src/state/planDraft';
import { openFreshPlanner, trackForeignRequests } from './plannerHelpers';
import { mulberry32 } from '../core/independentNormals';

/** mulberry32 (common practice: a small seeded 32-bit generator), so every run tries the same cases. */
const rng = mulberry32;

const SCRIPTS = [
  '<script>fetch("http://198.51.100.7/x")</script>',
  '<img src="http://198.51.100.7/x.png" onerror="fetch(\'http://198.51.100.7/y\')">',
  'javascript:alert(1)',
  '"><svg onload=alert(1)>',
  '\u202e\u0000\u0007\u001b[31m',
];
const ODD_CHARS = ['%', '%ZZ', '<', '>', '"', "'", ' ', '\u0001', '\u007f', '\u00e9', '\u{1F600}', '+', '/', '=', '#', '&', '\\', '\n'];

const b64url = (text: string) => Buffer.from(text, 'utf8').toString('base64url');

/** 320 distinct fragments, all beginning "#plan" (so each is meant to be a plan link). */
function linkCases(seed: number): string[] {
  const r = rng(seed);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)]!;
  const plans: Plan[] = [demoPlan(), ...EXAMPLE_PLANS.map((e) => e.plan)];
  const valid = () => {
    const p = structuredClone(pick(plans));
    if (r() < 0.5) p.title = pick(SCRIPTS);
    if (r() < 0.3) p.groups.programme.label = pick(SCRIPTS);
    return encodePlanForLink(p);
  };
  const wrongJson = () =>
    `#plan=${b64url(
      pick([
        '[]',
        'null',
        '"plan"',
        '1e999',
        '{"format":"meanward-plan","version":99}',
        '{"format":"meanward-plan"',
        JSON.stringify({ ...demoPlan(), groups: { ...demoPlan().groups, programme: { ...demoPlan().groups.programme, poolSize: 10 ** (r() * 320) } } }),
        JSON.stringify({ ...demoPlan(), outcome: { ...demoPlan().outcome, posttestSD: -1e300 } }),
        JSON.stringify({ ...demoPlan(), simulation: { replications: 1e12, seed: -1 } }),
        JSON.stringify({ ...demoPlan(), title: 'x'.repeat(20_000) }),
        JSON.stringify({ ...demoPlan(), pretest: { reliability: '0.8' } }),
        JSON.stringify({ ...demoPlan(), __proto__: { polluted: true }, constructor: { prototype: { x: 1 } } }),
      ]),
    )}`;
  const kinds: (() => string)[] = [
    valid,
    // cut short anywhere
    () => {
      const v = valid();
      return v.slice(0, 6 + Math.floor(r() * (v.length - 7)));
    },
    // one to five characters replaced, inserted or removed
    () => {
      let v = valid().split('');
      for (let k = 1 + Math.floor(r() * 5); k > 0; k--) {
        const at = 6 + Math.floor(r() * (v.length - 6));
        const op = r();
        if (op < 0.4) v[at] = pick(ODD_CHARS);
        else if (op < 0.7) v.splice(at, 0, pick(ODD_CHARS));
        else v.splice(at, 1);
      }
      return v.join('');
    },
    wrongJson,
    // malformed prefixes and raw payloads
    () => pick(['#plan', '#PLAN=', '#plan:', '#plan%3D', '#plan=%', '#plan==', '#plan=&', '#plan-b', '#plan ']) + b64url(String(r())).slice(0, Math.floor(r() * 12)),
    () => `#plan=${pick(SCRIPTS)}${Math.floor(r() * 1e6)}`,
    // random base64url of random length (up to 40 kB once in a while)
    () => {
      const n = r() < 0.05 ? 40_000 : Math.floor(r() * 400);
      const abc = 'ABCDEFGHIJKLMNOPQRSTUVWXYZabcdefghijklmnopqrstuvwxyz0123456789-_';
      let s = '#plan=';
      for (let i = 0; i < n; i++) s += abc[Math.floor(r() * abc.length)];
      return s;
    },
    // control characters in the payload
    () => `#plan=${b64url('{"title":"').slice(0, 8)}${String.fromCharCode(Math.floor(r() * 32))}${b64url(String(r()))}`,
  ];
  // Distinct fragments (setting the same hash twice is no navigation); kinds with few
  // variants (wrong JSON) stop adding once used up, the others fill in.
  const seen = new Set<string>();
  const out: string[] = [];
  for (let attempt = 0; out.length < 320; attempt++) {
    if (attempt > 20_000) throw new Error('the link generator ran out of distinct cases');
    const f = kinds[attempt % kinds.length]!();
    if (!seen.has(f)) {
      seen.add(f);
      out.push(f);
    }
  }
  return out;
}

/**
 * Stored autosave texts, in pairs (this tab's draft, the browser's last draft)
 * so one reload tries two: most damaged, some odd but readable. `tabDamaged`
 * makes the tab's text damaged, so the browser's is read as well.
 */
function autosaveCases(seed: number, pairs: number): [string, string][] {
  const r = rng(seed);
  const pick = <T,>(xs: readonly T[]): T => xs[Math.floor(r() * xs.length)]!;
  const good = () => {
    const d = planToDraft(pick([demoPlan(), ...EXAMPLE_PLANS.map((e) => e.plan)]));
    if (r() < 0.4) d.title = pick(SCRIPTS);
    if (r() < 0.3) d.outcome.prePostCorrelation = pick(['1e999', '-0', '0.', 'abc', '\u0000', '9'.repeat(400)]);
    return JSON.stringify({ version: 1, draft: d });
  };
  const damaged: (() => string)[] = [
    () => {
      const g = good();
      return g.slice(0, 1 + Math.floor(r() * (g.length - 2)));
    },
    () => {
      const g = good().split('');
      for (let k = 1 + Math.floor(r() * 4); k > 0; k--) g[Math.floor(r() * g.length)] = pick(ODD_CHARS);
      return g.join('');
    },
    () => {
      const o = JSON.parse(good()) as { version: number; draft: Record<string, unknown> };
      const key = pick(['title', 'groups', 'pretest', 'outcome', 'matching', 'analysis', 'simulation', 'covariates', 'covariateCorrelations']);
      o.draft[key] = pick([null, 3, 'x', [], {}, true, 1e308]);
      if (r() < 0.2) o.version = pick([0, 2, '1', null] as never[]);
      return JSON.stringify(o);
    },
    () => pick(['null', '[]', '1', '"text"', '{}', '{"version":1}', 'undefined', '\u0000\u0001\u0002', '<script>alert(1)</script>', '\ufeff{"version":1}']),
  ];
  const any = [...damaged, good];
  return Array.from({ length: pairs }, (_, i) => [i % 26 === 25 ? good() : pick(damaged)(), pick(any)()]);
}

function watchPageErrors(page: Page): string[] {
  const errors: string[] = [];
  page.on('pageerror', (e) => errors.push(e.message));
  return errors;
}

test('320 seeded share-link fragments: each explained or opened, the page never breaks, nothing leaves the origin', async ({ page }) => {
  test.setTimeout(120_000);
  await openFreshPlanner(page);
  const errors = watchPageErrors(page);
  const foreign = trackForeignRequests(page);
  const cases = linkCases(20_261_204);
  const results = await page.evaluate(async (fragments) => {
    const visible = (el: Element | null) => !!el && (el as HTMLElement).getBoundingClientRect().height > 0;
    const snapshot = () =>
      Array.from(document.querySelectorAll<HTMLInputElement | HTMLSelectElement>('form[aria-label="Study plan"] input, form[aria-label="Study plan"] select'))
        .map((el) => (el instanceof HTMLInputElement && el.type === 'checkbox' ? String(el.checked) : el.value))
        .join('\u0001');
    const out: { hash: string; kind: string | null; text: string; shown: boolean; unchanged: boolean }[] = [];
    for (const fragment of fragments) {
      document.querySelector<HTMLButtonElement>('[data-testid="notice-dismiss"]')?.click();
      await new Promise((r) => setTimeout(r, 0));
      const before = snapshot();
      location.hash = fragment;
      const hash = location.hash;
      const t0 = performance.now();
      while (!document.querySelector('[data-testid="notice"]') && performance.now() - t0 < 3000) await new Promise((r) => setTimeout(r, 4));
      await new Promise((r) => requestAnimationFrame(() => r(null)));
      const n = document.querySelector('[data-testid="notice"]');
      out.push({
        hash,
        kind: n?.getAttribute('data-kind') ?? null,
        text: n?.querySelector('p')?.textContent ?? '',
        shown: visible(document.querySelector('h1')) && visible(document.querySelector('form[aria-label="Study plan"]')),
        unchanged: snapshot() === before,
      });
    }
    return out;
  }, cases);

  expect(results).toHaveLength(320);
  let opened = 0;
  for (const [i, r] of results.entries()) {
    const label = `case ${i}: ${cases[i]!.slice(0, 80)}`;
    expect(r.shown, label).toBe(true);
    // The address the browser holds is what the planner read; the Node reader says what should happen.
    expect(isShareFragment(r.hash), label).toBe(true);
    const expected = decodePlanFromLink(r.hash);
    if (expected.ok) {
      opened++;
      expect(r.kind, label).toBe('info');
      expect(r.text, label).toBe('Opened the plan from the shared link.');
    } else {
      expect(r.kind, label).toBe('error');
      expect(r.text, label).toMatch(/^The shared link could not be read, so your current plan is unchanged\. \S/);
      expect(r.text, label).not.toMatch(/undefined|NaN|\[object|TypeError|SyntaxError/);
      expect(r.text.length, label).toBeLessThan(700);
      expect(r.unchanged, label).toBe(true);
    }
  }
  // Both outcomes were exercised (common practice: a fuzz run that never opens a plan tests half the code).
  expect(opened).toBeGreaterThan(20);
  expect(320 - opened).toBeGreaterThan(200);
  expect(errors).toEqual([]);
  expect(foreign).toEqual([]);
});

test('stored autosaves, 52 reloads with two each (>= 100 read): a damaged one is reported and kept, a readable one restored, the page never breaks', async ({ page }) => {
  test.setTimeout(150_000);
  await openFreshPlanner(page);
  const errors = watchPageErrors(page);
  const foreign = trackForeignRequests(page);
  const cases = autosaveCases(4_193, 52);
  const demoTitle = demoPlan().title;
  let read = 0;
  let unreadable = 0;
  for (const [i, [tabText, browserText]] of cases.entries()) {
    const label = `reload ${i}: tab ${JSON.stringify(tabText.slice(0, 60))}, browser ${JSON.stringify(browserText.slice(0, 60))}`;
    await page.evaluate(
      ([tab, browser, autosaveKey, tabKey, keptKey]) => {
        localStorage.removeItem(keptKey!);
        sessionStorage.setItem(tabKey!, tab!);
        localStorage.setItem(autosaveKey!, browser!);
      },
      [tabText, browserText, AUTOSAVE_KEY, TAB_DRAFT_KEY, UNREADABLE_KEY],
    );
    await page.reload({ waitUntil: 'domcontentloaded' });
    await expect(page.getByRole('heading', { level: 1, name: 'Meanward' }), label).toBeVisible();
    await expect(page.getByRole('form', { name: 'Study plan' }), label).toBeVisible();
    // What should happen, from the same reader in Node over the same two texts.
    const store = (key: string, text: string) => ({ getItem: (k: string) => (k === key ? text : null), setItem: () => undefined, removeItem: () => undefined });
    const expected = restoreDrafts({ session: store(TAB_DRAFT_KEY, tabText), storage: store(AUTOSAVE_KEY, browserText) });
    read += expected.from === 'tab' ? 1 : 2;
    unreadable += expected.unreadable.length;
    await expect(page.getByRole('textbox', { name: 'Plan title' }), label).toHaveValue(expected.draft ? expected.draft.title : demoTitle);
    if (expected.unreadable.length === 0) {
      await expect(page.getByTestId('unreadable-draft-notice'), label).toHaveCount(0);
    } else {
      await expect(page.getByTestId('unreadable-draft-notice'), label).toContainText('could not be read');
      const kept = await page.evaluate((k) => localStorage.getItem(k), UNREADABLE_KEY);
      expect(JSON.parse(kept ?? 'null'), label).toEqual({ version: 1, drafts: expected.unreadable });
    }
  }
  expect(read).toBeGreaterThanOrEqual(100);
  expect(unreadable).toBeGreaterThanOrEqual(60); // most texts are damaged, by construction
  expect(errors).toEqual([]);
  expect(foreign).toEqual([]);
});
