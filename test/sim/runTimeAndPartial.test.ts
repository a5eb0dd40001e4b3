import { describe, expect, it } from 'vitest';
import { demoPlan } from '../../src/io/demoPlan';
import { estimateRunSeconds } from '../../src/sim/estimateRunSeconds';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import { runSimulationInSteps } from '../../src/sim/runSimulationInSteps';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationRun } from '../../src/sim/types';
import { inventedCovariatePlan } from '../inventedCovariatePlan';

/** A clock that advances `msPerReplication` for every replication the run has done (no real timing). */
function fakeClock(run: SimulationRun, msPerReplication: number, firstExtraMs = 0): () => number {
  return () => run.completed * msPerReplication + (run.completed > 0 ? firstExtraMs : 0);
}

describe('estimateRunSeconds: a timed pilot of the run itself', () => {
  it('scales the pilot pace to the planned replications (hand-worked arithmetic, exact to 1e-12)', () => {
    const plan = demoPlan();
    const run = createPlanSimulation(plan, { replications: 1000 });
    const est = estimateRunSeconds(run, fakeClock(run, 50));
    // Chunks of 1, 1, 2, 4, 8 replications: 16 timed, 800 ms ≥ the 500 ms target; pace of the last
    // chunk 400 / 8 = 50 ms; 0.8 s + 984 × 0.05 s = 50 s (hand-worked).
    expect(est.pilotReplications).toBe(16);
    expect(run.completed).toBe(16);
    expect(est.pilotSeconds).toBeCloseTo(0.8, 12);
    expect(est.secondsPerReplication).toBeCloseTo(0.05, 12);
    expect(est.seconds).toBeCloseTo(50, 12);
    expect(est.replications).toBe(1000);
    expect(est.method).toBe('timed the first 16 of 1,000 replications on this device and scaled their pace to the rest');
  });

  it('leaves the slow first replication (warm-up) out of the pace, and stops at the replication limit', () => {
    const run = createPlanSimulation(demoPlan(), { replications: 500 });
    // 1 ms per replication plus 200 ms once: never reaches 500 ms before the 40-replication limit.
    const est = estimateRunSeconds(run, fakeClock(run, 1, 200));
    expect(est.pilotReplications).toBe(40);
    expect(est.secondsPerReplication).toBeCloseTo(0.001, 12); // last chunk 32 → 40: 8 ms / 8, hand-worked
    expect(est.seconds).toBeCloseTo(0.24 + 460 * 0.001, 12);
  });

  it('times at least 8 replications when the first is slow, unless the pilot has passed 4 s (warm-up cap)', () => {
    const slow = createPlanSimulation(demoPlan(), { replications: 100 });
    // First replication 1,000 ms (over the 500 ms target), then 20 ms each: chunks of 1, 1, 2, 4 →
    // 8 timed, pace of the last chunk 80 / 4 = 20 ms (hand-worked).
    const est = estimateRunSeconds(slow, fakeClock(slow, 20, 980));
    expect(est.pilotReplications).toBe(8);
    expect(est.secondsPerReplication).toBeCloseTo(0.02, 12);
    const slower = createPlanSimulation(demoPlan(), { replications: 100 });
    // 3,000 ms per replication: after 2 the pilot has passed the 4,000 ms cap; pace 3 s;
    // 6 s + 98 × 3 s = 300 s (hand-worked).
    const est2 = estimateRunSeconds(slower, fakeClock(slower, 3000));
    expect(est2.pilotReplications).toBe(2);
    expect(est2.seconds).toBeCloseTo(300, 12);
    expect(est2.method).toBe('timed the first 2 of 100 replications on this device and scaled their pace to the rest');
  });

  it('rejects a run already under way and bad limits with clear messages', () => {
    const run = createPlanSimulation(demoPlan(), { replications: 10 });
    expect(() => estimateRunSeconds(run, () => 0, { targetMs: 0 })).toThrow("The pilot's time target must be a positive number of milliseconds; got 0.");
    expect(() => estimateRunSeconds(run, () => 0, { maxReplications: 0.5 })).toThrow("The pilot's replication limit must be a whole number of at least 1; got 0.5.");
    run.runChunk(0, 2);
    expect(() => estimateRunSeconds(run, () => 0)).toThrow('The run time can only be estimated before a run starts; 2 replications have already run.');
  });

  it('changes no number: a run with a pilot gives the same result as simulatePlan, bit for bit (both engines)', async () => {
    for (const plan of [demoPlan(), inventedCovariatePlan()]) {
      const estimates: number[] = [];
      const stepped = await runSimulationInSteps(
        plan,
        { replications: 30, seed: 5 },
        {
          progress: () => undefined,
          yieldTick: () => Promise.resolve(),
          cancelled: () => false,
          now: (() => {
            let t = 0;
            return () => (t += 7);
          })(),
          estimate: (e) => {
            estimates.push(e.pilotReplications);
            return true;
          },
        },
      );
      expect(estimates).toHaveLength(1);
      expect(stepped).toEqual(simulatePlan(plan, { replications: 30, seed: 5 }));
    }
  });

  it('stops after the pilot when the host refuses the estimate', async () => {
    const result = await runSimulationInSteps(
      demoPlan(),
      { replications: 200, seed: 1 },
      { progress: () => undefined, yieldTick: () => Promise.resolve(), cancelled: () => false, now: () => 0, estimate: () => false },
    );
    expect(result).toBeNull();
  });
});

describe('finishPartial: a run stopped early is summarised over the replications done', () => {
  it('equals a run planned with that many replications, bit for bit, marked partial (both engines)', () => {
    for (const plan of [demoPlan(), inventedCovariatePlan()]) {
      const run = createPlanSimulation(plan, { replications: 40, seed: 3 });
      run.runChunk(0, 17);
      const partial = run.finishPartial();
      const { partial: flag, replicationsPlanned, ...rest } = partial;
      expect(flag).toBe(true);
      expect(replicationsPlanned).toBe(40);
      expect(rest.replications).toBe(17);
      expect(rest).toEqual(simulatePlan(plan, { replications: 17, seed: 3 }));
    }
  });

  it('is the ordinary result when every replication has run, and needs at least 2 done', () => {
    const plan = demoPlan();
    const run = createPlanSimulation(plan, { replications: 5, seed: 2 });
    run.runChunk(0, 1);
    expect(() => run.finishPartial()).toThrow('Only 1 of 5 replications finished before the run was stopped; at least 2 are needed for a summary.');
    run.runChunk(1, 5);
    const full = run.finishPartial();
    expect(full.partial).toBeUndefined();
    expect(full).toEqual(simulatePlan(plan, { replications: 5, seed: 2 }));
  });
});
