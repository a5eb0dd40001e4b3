import { createContext, useContext } from 'react';
import { useStore } from 'zustand';
import { createStore, type StoreApi } from 'zustand/vanilla';
import type { Plan } from '../core/plan';
import type { MeanwardDeps } from './deps';
import { createCovariateSlice, type CovariateSlice } from './covariateSlice';
import { createDraftSlice, type DraftSlice } from './draftSlice';
import { createHighlightSlice, type HighlightSlice } from './highlightSlice';
import { createPersistenceSlice, restoreDrafts, type PersistenceSlice } from './persistenceSlice';
import { createPilotSlice, type PilotDeps, type PilotSlice } from './pilotState';
import { planToDraft } from './planDraft';
import { createSimulationSlice, type SimulationSlice } from './simulationSlice';
import { createVariantsSlice, type VariantsSlice } from './variantsSlice';
import { createExplorerSlice, type ExplorerSlice } from './explorerState';

/** The whole planner state: one slice per file, combined here. */
export type MeanwardState = DraftSlice & SimulationSlice & HighlightSlice & PersistenceSlice & CovariateSlice & PilotSlice & VariantsSlice & ExplorerSlice;
export type MeanwardStore = StoreApi<MeanwardState>;

export interface CreateStoreOptions {
  deps: MeanwardDeps;
  /** The plan used when nothing was autosaved, and by "reset". */
  demo: () => Plan;
  /** Restore the autosaved draft when there is one (default true). */
  restore?: boolean;
  /** Pilot-data reader and functions (default: the worker reader, src/pilot, the tab's sessionStorage). */
  pilot?: Partial<PilotDeps>;
}

/**
 * A fresh planner store. Restores this tab's autosaved draft, else the
 * browser's shared last draft, else starts from the demo plan (an unreadable
 * autosave is kept and reported, see restoreDrafts); autosaves the draft after
 * every change and keeps the simulation's "stale" mark in step with the plan.
 * The quick figures are asked for only when a new plan is adopted (not on
 * every keystroke: see DraftSlice.typeField).
 */
export function createMeanwardStore({ deps, demo, restore = true, pilot }: CreateStoreOptions): MeanwardStore {
  const restored = restore ? restoreDrafts(deps) : { draft: null, from: null, unreadable: [] };
  const initial = restored.draft ?? planToDraft(demo());
  const store = createStore<MeanwardState>()((...a) => ({
    ...createDraftSlice(deps, initial, demo())(...a),
    ...createSimulationSlice(deps)(...a),
    ...createHighlightSlice(...a),
    ...createPersistenceSlice(deps, demo, restored)(...a),
    ...createCovariateSlice(...a),
    ...createPilotSlice(pilot)(...a),
    ...createVariantsSlice(deps)(...a),
    ...createExplorerSlice(deps)(...a),
  }));
  store.subscribe((state, prev) => {
    if (state.draft !== prev.draft) state.autosave();
    if (state.validPlan !== prev.validPlan || state.problems !== prev.problems) state.refreshSimulationStale();
    if (state.validPlan !== prev.validPlan) requestPlannedFigures(store, deps);
    if (state.validPlan !== prev.validPlan) state.followValidPlan(state.validPlan);
  });
  requestPlannedFigures(store, deps);
  return store;
}

/**
 * Ask for the quick figures of the planned procedure for the current valid
 * plan; when they arrive and the plan is still the current one, the analytic
 * results are recomputed with them (analysePlan(plan, estimates)). Until then,
 * and when no runner is given, the closed forms stay shown, labelled as such.
 */
function requestPlannedFigures(store: MeanwardStore, deps: MeanwardDeps): void {
  const runner = deps.plannedProcedure;
  const { validPlan: plan, analytic } = store.getState();
  if (!runner || !analytic) return;
  void runner.estimate(plan).then((estimates) => {
    const now = store.getState();
    if (!estimates || now.validPlan !== plan || now.analytic === null) return;
    try {
      store.setState({ analytic: deps.analysePlan(plan, estimates) });
    } catch {
      // The closed forms stay shown; the quick figures add nothing a researcher could act on here.
    }
  });
}

/** The store the components read; the app provides its own, tests a fresh one. */
export const MeanwardStoreContext = createContext<MeanwardStore | null>(null);

let appStore: MeanwardStore | null = null;
let appStoreFactory: (() => MeanwardStore) | null = null;

/** Tell the app how to build its store (main.tsx does this once, before rendering). */
export function setAppStoreFactory(factory: () => MeanwardStore): void {
  appStoreFactory = factory;
}

/** The app-wide store, built on first use. */
export function getAppStore(): MeanwardStore {
  if (!appStore) {
    if (!appStoreFactory) throw new Error('The planner store was used before it was set up (call setAppStoreFactory first).');
    appStore = appStoreFactory();
  }
  return appStore;
}

/** React hook: read a slice of the planner state (from the nearest provider, else the app store). */
export function useMeanwardStore<T>(selector: (s: MeanwardState) => T): T {
  const fromContext = useContext(MeanwardStoreContext);
  return useStore(fromContext ?? getAppStore(), selector);
}

/** React hook: the store object itself (for imperative reads in event handlers). */
export function useMeanwardStoreApi(): MeanwardStore {
  return useContext(MeanwardStoreContext) ?? getAppStore();
}
