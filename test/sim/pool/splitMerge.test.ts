import { describe, expect, it } from 'vitest';
import type { Plan } from '../../../src/core/plan';
import { EXAMPLE_PLANS } from '../../../src/io/examplePlans';
import { createPlanSimulation } from '../../../src/sim/multivariate/createPlanSimulation';
import { mergeReplicationBlocks, runReplicationRange } from '../../../src/sim/pool/runReplicationRange';
import { splitReplications } from '../../../src/sim/pool/splitReplications';
import { replicationBlockTransfers } from '../../../src/sim/replicationBlock';
import { differingPaths } from './sameBits';

// The check throughout is bit identity: a run split into contiguous ranges on separate run objects
// (as separate workers would hold them), merged by importing the blocks, must give exactly the
// SimulationResult of one run object doing every replication (every number compared with Object.is).
// Replication i always draws from its own stream (seed, i), so any split must give the same numbers.

const example = (id: string): Plan => {
  const found = EXAMPLE_PLANS.find((e) => e.id === id);
  if (!found) throw new Error(`no example ${id}`);
  return structuredClone(found.plan);
};
const mahalanobis = (): Plan => {
  const p = example('after-school-maths');
  p.matching = { ...p.matching, distance: 'mahalanobis', caliper: 0.5, ratio: 2, replacement: true };
  return p;
};

/** One engine per case (createPlanSimulation's dispatch), each with few replications to stay quick. */
const CASES: { name: string; plan: () => Plan; replications: number }[] = [
  { name: 'one-pretest engine (demo)', plan: () => example('demo-falls-prevention'), replications: 61 },
  { name: 'several-covariate engine, propensity score', plan: () => example('after-school-maths'), replications: 13 },
  { name: 'several-covariate engine, Mahalanobis distance', plan: mahalanobis, replications: 13 },
  { name: 'pools engine, selection rule on a screener', plan: () => example('screened-reading-support'), replications: 17 },
  { name: 'pools engine, one group picked for high readings', plan: () => example('clinic-high-readings'), replications: 11 },
  { name: 'pools engine, clusters', plan: () => example('schools-matched-on-means'), replications: 9 },
];

describe('splitting a run across workers and merging it is bit-identical to one worker', () => {
  for (const c of CASES) {
    it(c.name, () => {
      const plan = c.plan();
      const options = { replications: c.replications, seed: plan.simulation.seed };
      const one = createPlanSimulation(plan, options);
      one.runChunk(0, c.replications);
      const whole = one.finish();
      for (const workers of [2, 3]) {
        // Each range on its own run object, as on its own worker; blocks copied as postMessage would.
        const blocks = splitReplications(c.replications, workers).map((r) => structuredClone(runReplicationRange(plan, options, r.from, r.to)));
        expect(blocks).toHaveLength(workers);
        // Merge in reverse order: the order blocks arrive in must not matter.
        const merged = mergeReplicationBlocks(plan, options, [...blocks].reverse());
        expect(differingPaths(merged, whole)).toEqual([]);
        expect(merged).toEqual(whole);
      }
      // The example replication (index 0) comes along with the block that holds it (a one-group
      // study matches nobody, so its example is empty).
      if (whole.analyses.matchedDifference) expect(whole.example.pairs.length).toBeGreaterThan(0);
    });
  }

  it('a block is plain typed arrays that can be transferred, and it refuses to join another run', () => {
    const plan = example('demo-falls-prevention');
    const block = runReplicationRange(plan, { replications: 20, seed: 3 }, 10, 20);
    const buffers = replicationBlockTransfers(block);
    expect(buffers.length).toBe(block.arrays.length);
    expect(new Set(buffers).size).toBe(buffers.length); // each array owns its buffer (sliced copies)
    expect(block.example).toBeNull(); // replication 0 is not in 10..20
    const other = createPlanSimulation(plan, { replications: 20, seed: 4 });
    expect(() => other.importBlock(block)).toThrow('seed 3 cannot join a run of 20 with seed 4');
    const covariates = createPlanSimulation(example('after-school-maths'), { replications: 20, seed: 3 });
    expect(() => covariates.importBlock(block)).toThrow('it comes from another kind of plan');
    const unrun = createPlanSimulation(plan, { replications: 20, seed: 3 });
    expect(() => unrun.exportBlock(0, 5)).toThrow('Replication 0 has not run');
  });
});

describe('splitReplications (contiguous ranges: the block distribution, common practice)', () => {
  it('covers 0..total once, sizes differ by at most one, larger first', () => {
    expect(splitReplications(10, 3)).toEqual([{ from: 0, to: 4 }, { from: 4, to: 7 }, { from: 7, to: 10 }]);
    expect(splitReplications(2000, 7).map((r) => r.to - r.from)).toEqual([286, 286, 286, 286, 286, 285, 285]);
  });
  it('uses fewer ranges for small runs', () => {
    expect(splitReplications(5, 8)).toHaveLength(5);
    expect(splitReplications(100, 8, 40)).toEqual([{ from: 0, to: 50 }, { from: 50, to: 100 }]);
    expect(splitReplications(30, 8, 40)).toEqual([{ from: 0, to: 30 }]);
  });
  it('names a bad argument', () => {
    expect(() => splitReplications(10, 0)).toThrow('The parts for splitting replications must be a whole number of at least 1; got 0.');
  });
});
