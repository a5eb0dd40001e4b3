import { describe, expect, it } from 'vitest';
import { createSimulation } from '../../src/sim/createSimulation';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { runSimulationInSteps } from '../../src/sim/runSimulationInSteps';
import { demoPlan } from '../../src/io/demoPlan';
import { testPlan } from './planFixtures';

// Bit-identical results regardless of chunking: replication i always uses stream (seed, i)
// (common practice for parallel Monte Carlo: one stream per replication). Exact equality.
describe('determinism across chunkings', () => {
  const plans = [
    testPlan({ nP: 40, nC: 200, replications: 60, seed: 5, matching: { method: 'random-within-caliper', ratio: 3 } }),
    testPlan({ nP: 40, nC: 200, replications: 60, seed: 5, matching: { ratio: 2, replacement: true, order: 'lowest-first' } }),
  ];

  for (const plan of plans) {
    it(`same seed, different chunks → identical (${plan.matching.method}, ratio ${plan.matching.ratio})`, () => {
      const whole = simulatePlan(plan, { chunkSize: 1000 });
      const ones = simulatePlan(plan, { chunkSize: 1 });
      const sevens = simulatePlan(plan, { chunkSize: 7 });
      expect(ones).toEqual(whole);
      expect(sevens).toEqual(whole);
      // Out of order, with a repeated chunk: still identical.
      const run = createSimulation(plan);
      run.runChunk(30, 60);
      run.runChunk(0, 10);
      run.runChunk(10, 30);
      run.runChunk(5, 15);
      expect(run.finish()).toEqual(whole);
    });
  }

  it('the stepping driver used by the worker gives the same result as simulatePlan', async () => {
    const plan = plans[0]!;
    let clock = 0;
    const progress: number[] = [];
    const r = await runSimulationInSteps(plan, {}, {
      progress: (done) => progress.push(done),
      yieldTick: () => Promise.resolve(),
      cancelled: () => false,
      now: () => (clock += 3), // fake clock: each reading 3 ms later
    });
    expect(r).toEqual(simulatePlan(plan));
    expect(progress[0]).toBe(0);
    expect(progress.at(-1)).toBe(60);
    // At least every 5% of the replications (3 of 60).
    for (let i = 1; i < progress.length; i++) expect((progress[i] as number) - (progress[i - 1] as number)).toBeLessThanOrEqual(3);
  });

  it('the stepping driver stops when cancelled', async () => {
    let steps = 0;
    const r = await runSimulationInSteps(plans[0]!, {}, {
      progress: () => undefined,
      yieldTick: () => Promise.resolve(),
      cancelled: () => ++steps > 2,
      now: () => 0,
    });
    expect(r).toBeNull();
  });

  it('different seeds give different estimates', () => {
    const a = simulatePlan(plans[0]!, { seed: 1 });
    const b = simulatePlan(plans[0]!, { seed: 2 });
    expect(a.estimates.ancova!).not.toEqual(b.estimates.ancova!);
    expect(a.estimates.matchedDifference![0]).not.toBe(b.estimates.matchedDifference![0]);
  });

  it('defaults replications and seed to the plan, and keeps the first replication as the example', () => {
    const plan = demoPlan();
    const r = simulatePlan(plan, { replications: 20 });
    expect(r.seed).toBe(plan.simulation.seed);
    expect(r.replications).toBe(20);
    // Example replication: every programme member is either matched or discarded.
    expect(r.example.pairs.length + r.example.discarded.length).toBe(plan.groups.programme.poolSize);
    for (const p of r.example.pairs) {
      expect(p.comparison.length).toBe(1);
      // Nearest within the caliper of 0.2 pooled SD (about 2 points here; sample SDs vary a little).
      expect(Math.abs((p.comparison[0]?.observed ?? NaN) - p.programme.observed)).toBeLessThan(0.2 * 10 * 1.2);
    }
    expect(r.estimates.matchedDifference!.length).toBe(20);
  });
});
