// The page loads the engines for covariates, clusters and selection rules on demand
// (src/state/pageEngines.ts through MeanwardDeps.loadEngines). Until one arrives the store shows
// its working state — the last plan's figures, marked as about to change — never a figure or a
// validation message computed without it; once it arrives the plan gets exactly the analysis it
// gets with every engine registered from the start.
import { afterEach, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { registerAllEngines } from '../../src/core/allEngines';
import { ENGINE_NAMES, type EngineName, unregisterEngineForTests } from '../../src/core/engineRegistry';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS, SCHOOLS_MATCHED_ON_MEANS, SCREENED_READING_SUPPORT } from '../../src/io/examplePlans';
import { serializePlan } from '../../src/io/planFile';
import { encodePlanForLink } from '../../src/io/shareLink';
import { defaultDeps } from '../../src/state/defaultDeps';
import { ENGINES_FAILED } from '../../src/state/draftSlice';
import { planToDraft } from '../../src/state/planDraft';
import { TAB_DRAFT_KEY } from '../../src/state/persistenceSlice';
import { createMeanwardStore } from '../../src/state/store';
import { memoryStorage } from './helpers';

afterEach(() => registerAllEngines());

/** Every engine taken out, and a loader the test resolves (registering them) or rejects. */
function lazyEngines() {
  for (const name of ENGINE_NAMES) unregisterEngineForTests(name);
  const asked: EngineName[][] = [];
  let settle: { resolve: () => void; reject: (e: Error) => void } | null = null;
  let pending: Promise<void> | null = null;
  const loadEngines = (names: readonly EngineName[]) => {
    asked.push([...names]);
    pending ??= new Promise<void>((resolve, reject) => {
      settle = { resolve, reject };
    });
    return pending;
  };
  return {
    loadEngines,
    asked,
    /** The chunk arrives: register the engines, then let the store's callbacks run. */
    arrive: async () => {
      registerAllEngines();
      settle!.resolve();
      await pending;
      await Promise.resolve();
    },
    fail: async () => {
      settle!.reject(new Error('offline'));
      await pending!.catch(() => undefined);
      await Promise.resolve();
    },
  };
}

function storeWith(loader: ReturnType<typeof lazyEngines>, session = memoryStorage()) {
  const deps = { ...defaultDeps(null), storage: null, session, loadEngines: loader.loadEngines };
  return createMeanwardStore({ deps, demo: demoPlan });
}

/** The figures with every engine registered, as the golden file and the CLI see them. */
function expectedAnalysis(plan: Plan) {
  registerAllEngines();
  const check = analysePlan(plan);
  for (const name of ENGINE_NAMES) unregisterEngineForTests(name);
  return check;
}

describe('engines loaded on demand by the page', () => {
  it('an example with covariates: the working state until the engine arrives, then the same analysis as before', async () => {
    const expected = expectedAnalysis(AFTER_SCHOOL_MATHS);
    const loader = lazyEngines();
    const store = storeWith(loader);
    const demo = store.getState();
    expect(loader.asked).toEqual([]); // the demo needs no engine
    store.getState().loadExample('after-school-maths');
    const waiting = store.getState();
    expect(loader.asked).toEqual([['covariates']]);
    // The form shows the example as typed, but no figure or message is computed without its engine:
    // the demo's results stay, marked as about to change.
    expect(waiting.draft.covariates.length).toBeGreaterThan(0);
    expect(waiting.draftPending).toBe(true);
    expect(waiting.problems).toEqual([]);
    expect(waiting.validPlan).toBe(demo.validPlan);
    expect(waiting.analytic).toBe(demo.analytic);
    await loader.arrive();
    const s = store.getState();
    expect(s.draftPending).toBe(false);
    expect(s.problems).toEqual([]);
    expect(s.validPlan.covariates).toEqual(AFTER_SCHOOL_MATHS.covariates);
    expect(s.analytic).toEqual(expected);
  });

  it('a restored draft with clusters: asked for at start-up, analysed exactly as before once it arrives', async () => {
    const expected = expectedAnalysis(SCHOOLS_MATCHED_ON_MEANS);
    const loader = lazyEngines();
    const session = memoryStorage();
    session.setItem(TAB_DRAFT_KEY, JSON.stringify({ version: 1, draft: planToDraft(SCHOOLS_MATCHED_ON_MEANS) }));
    const store = storeWith(loader, session);
    expect(loader.asked).toEqual([['clusters']]);
    expect(store.getState().draftPending).toBe(true);
    expect(store.getState().problems).toEqual([]);
    expect(store.getState().analytic?.clusters).toBeUndefined(); // no cluster figure before the engine
    await loader.arrive();
    const s = store.getState();
    expect(s.draftPending).toBe(false);
    expect(s.analytic).toEqual(expected);
    // λ = m·ICC / (1 + (m − 1)·ICC) = 25·0.2 / (1 + 24·0.2) = 0.862 for a new cohort of 25 per school
    // (Spearman–Brown on the ICC; Bliese 2000's ICC(2), from memory).
    expect(s.analytic!.clusters!.clusterMeanReliability.comparison).toBeCloseTo(5 / 5.8, 9);
  });

  it('a plan file and a shared link needing an engine open once it arrives; until then the current plan stays', async () => {
    const expected = expectedAnalysis(SCREENED_READING_SUPPORT);
    const loader = lazyEngines();
    const store = storeWith(loader);
    const before = store.getState();
    // A selection rule's checks are on the first screen: a file with a rule is checked at once and
    // waits only for its closed forms.
    expect(store.getState().openPlanText(serializePlan(SCREENED_READING_SUPPORT), 'screened.json')).toBe(true);
    expect(loader.asked).toEqual([['selection']]);
    expect(store.getState().validPlan).toBe(before.validPlan);
    expect(store.getState().draftPending).toBe(true);
    // A cluster plan's checks need the cluster engine: the link is not even read until it arrives.
    expect(store.getState().openShareFragment(encodePlanForLink(SCHOOLS_MATCHED_ON_MEANS))).toBe(false);
    expect(loader.asked).toEqual([['selection'], ['clusters']]);
    expect(store.getState().notice?.kind).not.toBe('error');
    await loader.arrive();
    const s = store.getState();
    expect(s.validPlan.clusters).toEqual(SCHOOLS_MATCHED_ON_MEANS.clusters);
    expect(s.analytic).toEqual(expectedAnalysis(SCHOOLS_MATCHED_ON_MEANS));
    expect(s.notice?.text).toBe('Opened the plan from the shared link.');
    // Undo brings the file's plan back, now analysed as before.
    registerAllEngines();
    s.undoReplace();
    expect(store.getState().analytic).toEqual(expected);
  });

  it('a load that fails leaves the draft as typed with one plain message, and no figure for it', async () => {
    const loader = lazyEngines();
    const store = storeWith(loader);
    const demo = store.getState();
    store.getState().setField('matching.distance', 'propensity');
    expect(store.getState().draftPending).toBe(true);
    await loader.fail();
    const s = store.getState();
    expect(s.problems).toEqual([{ field: '', message: ENGINES_FAILED }]);
    expect(s.draft.matching.distance).toBe('propensity');
    expect(s.validPlan).toBe(demo.validPlan);
    expect(s.analyticStale).toBe(true);
  });

  it('without a loader (tests, CLI) a missing engine is an error naming it, never a quiet fallback', () => {
    unregisterEngineForTests('covariates');
    const deps = { ...defaultDeps(null), storage: null, session: null, loadEngines: undefined };
    const store = createMeanwardStore({ deps, demo: demoPlan });
    expect(() => store.getState().loadExample('after-school-maths')).toThrow(/"covariates" engine/);
  });
});
