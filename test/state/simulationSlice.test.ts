import { describe, expect, it } from 'vitest';
import type { Plan } from '../../src/core/plan';
import type { SimulationResult } from '../../src/sim/types';
import { controlledRunner, LONG_RUN_ESTIMATE, makeStore } from './helpers';

/** Only the fields the store reads; the figures themselves are not under test here. */
function resultFor(plan: Plan): SimulationResult {
  return { plan, seed: plan.simulation.seed, replications: plan.simulation.replications, tau: 2.5 } as unknown as SimulationResult;
}

const flush = () => new Promise((r) => setTimeout(r, 0));

describe('simulation slice: run, progress, cancel, stale', () => {
  it('goes running → done, reporting progress, and keeps the result', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const done = store.getState().runSimulation();
    expect(store.getState().simulation.status).toBe('running');
    c.runs[0]!.progress(0.4);
    expect(store.getState().simulation.progress).toBeCloseTo(0.4, 12);
    c.runs[0]!.resolve(resultFor(c.runs[0]!.plan));
    await done;
    const sim = store.getState().simulation;
    expect(sim.status).toBe('done');
    expect(sim.progress).toBe(1);
    expect(sim.result?.plan).toEqual(store.getState().validPlan);
    expect(sim.stale).toBe(false);
  });

  it('ignores a non-finite progress value rather than showing it', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    void store.getState().runSimulation();
    c.runs[0]!.progress(Number.NaN);
    expect(store.getState().simulation.progress).toBe(0);
  });

  it('marks the result stale when the plan changes, and fresh again when changed back', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const done = store.getState().runSimulation();
    c.runs[0]!.resolve(resultFor(c.runs[0]!.plan));
    await done;
    store.getState().setField('matching.caliper', '0.1');
    expect(store.getState().simulation.stale).toBe(true);
    store.getState().setField('matching.caliper', '0.2');
    expect(store.getState().simulation.stale).toBe(false);
    // An invalid draft also makes the result stale (it no longer describes what is on screen).
    store.getState().setField('pretest.reliability', '1.4');
    expect(store.getState().simulation.stale).toBe(true);
  });

  it('cancel stops the run, keeps the previous result and ignores a late answer', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const first = store.getState().runSimulation();
    c.runs[0]!.resolve(resultFor(c.runs[0]!.plan));
    await first;
    const previous = store.getState().simulation.result;
    const second = store.getState().runSimulation();
    store.getState().cancelSimulation();
    await second;
    await flush();
    const sim = store.getState().simulation;
    expect(c.cancels()).toBe(1);
    expect(sim.status).toBe('cancelled');
    expect(sim.result).toBe(previous);
  });

  it('reports an engine failure as a readable error', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const done = store.getState().runSimulation();
    c.runs[0]!.reject(new Error('Replications must be a whole number between 100 and 100000; got 5.'));
    await done;
    const sim = store.getState().simulation;
    expect(sim.status).toBe('error');
    expect(sim.error).toBe('The simulation stopped with an error: Replications must be a whole number between 100 and 100000; got 5.');
  });

  it('refuses to run an invalid plan and says why', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    store.getState().setField('pretest.reliability', '1.4');
    await store.getState().runSimulation();
    expect(c.runs).toHaveLength(0);
    expect(store.getState().simulation.status).toBe('error');
    expect(store.getState().simulation.error).toMatch(/a problem to fix/);
  });

  it('without a simulation engine says so instead of failing silently', async () => {
    const store = makeStore({ simulation: null });
    await store.getState().runSimulation();
    expect(store.getState().simulation.error).toMatch(/not available/);
  });
});

describe('highlight slice', () => {
  it('is shared: one analysis at a time, or none', () => {
    const store = makeStore();
    expect(store.getState().highlight).toBeNull();
    store.getState().setHighlight('gainScore');
    expect(store.getState().highlight).toBe('gainScore');
    store.getState().setHighlight(null);
    expect(store.getState().highlight).toBeNull();
  });
});

describe('simulation slice: run-time estimate, long runs and a silent worker', () => {
  const estimate = LONG_RUN_ESTIMATE;
  const withReason = (message: string, reason: string, est?: typeof estimate) => Object.assign(new Error(message), { reason, estimate: est });

  it('asks the runner to stop past the browser limit (600 s), shows the estimate, and waits for the go-ahead', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const first = store.getState().runSimulation();
    expect(c.runs[0]!.options?.maxSeconds).toBe(600);
    c.runs[0]!.options?.onEstimate?.(estimate);
    expect(store.getState().simulation.estimate).toEqual(estimate);
    c.runs[0]!.reject(withReason('too long', 'too-long', estimate));
    await first;
    expect(store.getState().simulation.status).toBe('too-long');
    expect(store.getState().simulation.estimate?.seconds).toBe(1500);
    // The go-ahead runs without a limit.
    const second = store.getState().runSimulation({ confirmed: true });
    expect(c.runs[1]!.options?.maxSeconds).toBeUndefined();
    c.runs[1]!.resolve(resultFor(c.runs[1]!.plan));
    await second;
    expect(store.getState().simulation.status).toBe('done');
  });

  it('"Not now" leaves the prompt as cancelled', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const first = store.getState().runSimulation();
    c.runs[0]!.reject(withReason('too long', 'too-long', estimate));
    await first;
    store.getState().cancelSimulation();
    expect(store.getState().simulation.status).toBe('cancelled');
  });

  it('says in plain words when the background process went silent, marked stalled (not "running" for ever)', async () => {
    const c = controlledRunner();
    const store = makeStore({ simulation: c.runner });
    const run = store.getState().runSimulation();
    c.runs[0]!.progress(0.01);
    c.runs[0]!.reject(withReason('The simulation stopped responding: nothing was heard from it for 30 s.', 'stalled'));
    await run;
    const sim = store.getState().simulation;
    expect(sim.status).toBe('error');
    expect(sim.errorKind).toBe('stalled');
    expect(sim.error).toBe('The simulation stopped responding: nothing was heard from it for 30 s.');
  });
});
