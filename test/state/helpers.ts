import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { defaultDeps } from '../../src/state/defaultDeps';
import type { DraftStorage, SimulationRunner } from '../../src/state/deps';
import { createMeanwardStore } from '../../src/state/store';
import type { SimulationResult } from '../../src/sim/types';

/** A Map-backed stand-in for localStorage. */
export function memoryStorage(): DraftStorage & { data: Map<string, string> } {
  const data = new Map<string, string>();
  return {
    data,
    getItem: (k) => data.get(k) ?? null,
    setItem: (k, v) => void data.set(k, v),
    removeItem: (k) => void data.delete(k),
  };
}

/**
 * A simulation runner under the test's control: each run waits until the
 * test resolves or rejects it, and records the progress callback.
 */
export function controlledRunner() {
  const runs: {
    plan: Plan;
    progress: (p: number) => void;
    resolve: (r: SimulationResult) => void;
    reject: (e: Error) => void;
    options: Parameters<SimulationRunner['run']>[2];
  }[] = [];
  let cancels = 0;
  const runner: SimulationRunner = {
    run: (plan, progress, options) =>
      new Promise<SimulationResult>((resolve, reject) => {
        runs.push({ plan, progress, resolve, reject, options });
      }),
    cancel: () => {
      cancels++;
      const last = runs[runs.length - 1];
      last?.reject(new Error('cancelled'));
    },
  };
  return { runner, runs, cancels: () => cancels };
}

/** A store over the real core and io, with injected storage and simulation. */
export function makeStore(opts: { storage?: DraftStorage | null; simulation?: SimulationRunner | null } = {}) {
  const deps = { ...defaultDeps(opts.simulation ?? null), storage: opts.storage ?? null };
  return createMeanwardStore({ deps, demo: demoPlan });
}
