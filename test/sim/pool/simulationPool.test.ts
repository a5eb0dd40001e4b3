import { describe, expect, it } from 'vitest';
import type { Plan } from '../../../src/core/plan';
import { EXAMPLE_PLANS } from '../../../src/io/examplePlans';
import { defaultPoolSize, SimulationPool } from '../../../src/sim/pool/simulationPool';
import { SimulationError } from '../../../src/sim/simulationClient';
import { simulatePlan } from '../../../src/sim/simulatePlan';
import { inProcessWorkers } from './inProcessWorkers';
import { differingPaths } from './sameBits';

// The browser's worker pool with stand-in workers that run the real worker handler in-process.
// The check for results is bit identity with a one-worker run (simulatePlan): replication i always
// draws from its own stream (seed, i), so splitting and merging must change no number.
const example = (id: string): Plan => structuredClone(EXAMPLE_PLANS.find((e) => e.id === id)!.plan);

describe('SimulationPool: one run split across workers', () => {
  it('gives the one-worker result bit for bit on 1, 2 and 3 workers (one-pretest and propensity plans)', async () => {
    const cases = [
      { plan: example('demo-falls-prevention'), replications: 200 },
      { plan: example('after-school-maths'), replications: 100 },
    ];
    for (const c of cases) {
      const whole = simulatePlan(c.plan, { replications: c.replications });
      for (const size of [1, 2, 3]) {
        const w = inProcessWorkers();
        const pool = new SimulationPool({ size, factory: w.factory });
        const progress: number[] = [];
        const result = await pool.run(c.plan, (done) => progress.push(done), { replications: c.replications });
        expect(differingPaths(result, whole)).toEqual([]);
        const ranges = w.types().filter((t) => t === 'range').length;
        // Ranges of at least 50 replications: 200 → up to 3 (when 3 workers), 100 → 2.
        expect(ranges).toBe(size === 1 ? 0 : Math.min(size, Math.floor(c.replications / 50)));
        expect(w.types().filter((t) => t === 'merge').length).toBe(size === 1 ? 0 : 1);
        // Progress covers the pool: it never goes back and ends at the total.
        for (let i = 1; i < progress.length; i++) expect(progress[i]!).toBeGreaterThanOrEqual(progress[i - 1]!);
        expect(progress.at(-1)).toBe(c.replications);
        expect(pool.busy).toBe(false);
      }
    }
  }, 30_000);

  it('passes on the pilot estimate shared among the workers, and stops a run that would be too long', async () => {
    let t = 0;
    const w = inProcessWorkers({ now: () => (t += 1000) }); // a fake clock: 1 s per reading
    const pool = new SimulationPool({ size: 2, factory: w.factory });
    const estimates: string[] = [];
    const err = await pool
      .run(example('demo-falls-prevention'), undefined, { replications: 400, maxSeconds: 60, onEstimate: (e) => estimates.push(e.method) })
      .catch((e: unknown) => e);
    expect(err).toBeInstanceOf(SimulationError);
    expect((err as SimulationError).reason).toBe('too-long');
    expect((err as SimulationError).estimate!.seconds).toBeGreaterThan(60);
    expect(estimates[0]).toMatch(/shared among 2 workers running side by side$/);
    // The other range was stopped too.
    expect(w.types()).toContain('cancel');
  });

  it('cancel stops every worker of the run; a newer run supersedes the older', async () => {
    const w = inProcessWorkers({ hold: true });
    const pool = new SimulationPool({ size: 3, factory: w.factory });
    const first = pool.run(example('demo-falls-prevention'), undefined, { replications: 300 });
    expect(w.types()).toEqual(['range', 'range', 'range']);
    pool.cancel();
    await expect(first).rejects.toMatchObject({ reason: 'cancelled', message: 'The simulation was cancelled.' });
    const cancels = w.sent.filter((s) => s.msg.type === 'cancel').map((s) => s.worker).sort();
    expect(cancels).toEqual([0, 1, 2]);
    const second = pool.run(example('demo-falls-prevention'), undefined, { replications: 300 });
    const third = pool.run(example('demo-falls-prevention'), undefined, { replications: 300 });
    await expect(second).rejects.toMatchObject({ reason: 'cancelled' });
    pool.dispose();
    await expect(third).rejects.toMatchObject({ reason: 'cancelled' });
  });

  it('one failing worker fails the run with the plain message, stops the others, and is replaced next time', async () => {
    const w = inProcessWorkers({ hold: true });
    const pool = new SimulationPool({ size: 2, factory: w.factory });
    const run = pool.run(example('demo-falls-prevention'), undefined, { replications: 200 });
    w.workers[1]!.onerror?.({ message: 'out of memory' } as ErrorEvent);
    await expect(run).rejects.toMatchObject({ reason: 'failed', message: 'The simulation stopped unexpectedly: out of memory.' });
    expect(w.terminated()).toBe(1);
    expect(w.sent.filter((s) => s.msg.type === 'cancel').map((s) => s.worker)).toEqual([0]);
    void pool.run(example('demo-falls-prevention'), undefined, { replications: 200 }).catch(() => undefined);
    expect(w.workers).toHaveLength(3); // a fresh worker in the dead one's place
    pool.dispose();
  });

  it('a silent worker fails the run as stalled (silence limits as SimulationClient)', async () => {
    const w = inProcessWorkers({ hold: true });
    const timers: (() => void)[] = [];
    const pool = new SimulationPool({ size: 2, factory: w.factory, limits: { startMs: 5000, setTimer: (fn) => timers.push(fn), clearTimer: () => undefined } });
    const run = pool.run(example('demo-falls-prevention'), undefined, { replications: 200 });
    timers[0]!();
    await expect(run).rejects.toMatchObject({ reason: 'stalled' });
    await expect(run).rejects.toThrow('nothing was heard from it for 5 s');
  });

  it('passes the engine’s message through when the plan cannot be simulated', async () => {
    const w = inProcessWorkers();
    const pool = new SimulationPool({ size: 2, factory: w.factory });
    await expect(pool.run(example('demo-falls-prevention'), undefined, { replications: 1 })).rejects.toMatchObject({ reason: 'failed', message: expect.stringMatching(/replications/i) });
  });
});

describe('SimulationPool.runBatch: whole runs queued over the pool', () => {
  const jobs = [
    { plan: example('demo-falls-prevention'), replications: 30, seed: 1 },
    { plan: example('screened-reading-support'), replications: 12, seed: 2 },
    { plan: example('demo-falls-prevention'), replications: 1, seed: 3 }, // the engine refuses fewer than 2
    { plan: example('no-gap-back-care'), replications: 20, seed: 4 },
    { plan: example('demo-falls-prevention'), replications: 25, seed: 5 },
  ];

  it('delivers each job once, each result bit for bit its own one-worker run; a bad job fails alone', async () => {
    const w = inProcessWorkers();
    const pool = new SimulationPool({ size: 2, factory: w.factory });
    const results = new Map<number, unknown>();
    const errors = new Map<number, string>();
    const progress: number[] = [];
    const batch = pool.runBatch(jobs, {
      onResult: (i, r) => {
        expect(results.has(i) || errors.has(i)).toBe(false);
        results.set(i, r);
      },
      onError: (i, m) => {
        expect(results.has(i) || errors.has(i)).toBe(false);
        errors.set(i, m);
      },
      onProgress: (done, total) => {
        expect(total).toBe(88);
        progress.push(done);
      },
    });
    await batch.done;
    expect([...results.keys()].sort()).toEqual([0, 1, 3, 4]);
    expect([...errors.keys()]).toEqual([2]);
    for (const i of [0, 1, 3, 4]) {
      const j = jobs[i]!;
      expect(differingPaths(results.get(i), simulatePlan(j.plan, { replications: j.replications, seed: j.seed }))).toEqual([]);
    }
    expect(progress.at(-1)).toBe(87);
    expect(new Set(w.sent.map((s) => s.worker))).toEqual(new Set([0, 1])); // both workers used
  }, 30_000);

  it('cancel stops all queued and running jobs of the batch, with no callbacks after it; a single run goes ahead of queued jobs', async () => {
    const w = inProcessWorkers({ hold: true });
    const pool = new SimulationPool({ size: 2, factory: w.factory });
    let calls = 0;
    const batch = pool.runBatch(jobs, { onResult: () => calls++, onError: () => calls++, onProgress: () => calls++ });
    expect(w.types()).toEqual(['run', 'run']); // two running, three queued
    const single = pool.run(example('demo-falls-prevention'), undefined, { replications: 200 });
    batch.cancel();
    await batch.done;
    // Both running jobs were stopped on their workers, and the freed workers went to the single run's
    // ranges (no queued job was started).
    expect(w.types()).toEqual(['run', 'run', 'cancel', 'cancel', 'range', 'range']);
    expect(calls).toBe(0);
    pool.cancel();
    await expect(single).rejects.toMatchObject({ reason: 'cancelled' });
  });
});

describe('defaultPoolSize (cores less one for the page, at least one)', () => {
  it('sizes the pool', () => {
    expect(defaultPoolSize(8)).toBe(7);
    expect(defaultPoolSize(2)).toBe(1);
    expect(defaultPoolSize(1)).toBe(1);
    expect(defaultPoolSize(undefined)).toBe(1);
    expect(defaultPoolSize(Number.NaN)).toBe(1);
    expect(defaultPoolSize(256)).toBe(64);
  });
});
