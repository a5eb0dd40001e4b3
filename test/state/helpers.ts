import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { defaultDeps } from '../../src/state/defaultDeps';
import type { DraftStorage, GridRunner, SimulationRunner } from '../../src/state/deps';
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

/**
 * A manual clock for the store's "typing has paused" timer: `advance(ms)` runs
 * every callback due by then; `pending()` counts those not yet run or cancelled.
 */
export function manualClock() {
  let now = 0;
  const timers: { at: number; fn: () => void; live: boolean }[] = [];
  const schedule = (fn: () => void, ms: number) => {
    const t = { at: now + ms, fn, live: true };
    timers.push(t);
    return () => void (t.live = false);
  };
  const advance = (ms: number) => {
    now += ms;
    for (const t of timers) {
      if (t.live && t.at <= now) {
        t.live = false;
        t.fn();
      }
    }
  };
  return { schedule, advance, pending: () => timers.filter((t) => t.live).length };
}

/**
 * A store over the real core and io, with injected storage (shared "last
 * draft"), tab storage and simulation; both storages default to none, so
 * tests never see each other's autosaves.
 */
export function makeStore(
  opts: {
    storage?: DraftStorage | null;
    session?: DraftStorage | null;
    simulation?: SimulationRunner | null;
    grid?: GridRunner | null;
    schedule?: (fn: () => void, ms: number) => () => void;
  } = {},
) {
  const deps = {
    ...defaultDeps(opts.simulation ?? null),
    storage: opts.storage ?? null,
    session: opts.session ?? null,
    ...(opts.schedule ? { schedule: opts.schedule } : {}),
    ...(opts.grid !== undefined ? { grid: opts.grid } : {}),
  };
  return createMeanwardStore({ deps, demo: demoPlan });
}

/** An invented run-time estimate past the browser's 10-minute limit (1,500 s for 2,000 replications). */
export const LONG_RUN_ESTIMATE = {
  seconds: 1500,
  secondsPerReplication: 0.75,
  pilotReplications: 4,
  pilotSeconds: 3,
  replications: 2000,
  method: 'timed the first 4 of 2000 replications on this device and scaled their pace to the rest',
};
