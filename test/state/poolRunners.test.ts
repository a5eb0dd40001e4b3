import { describe, expect, it } from 'vitest';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { SimulationPool } from '../../src/sim/pool/simulationPool';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { createGridRunner, createSimulationRunner } from '../../src/state/simulationRunner';
import { inProcessWorkers } from '../sim/pool/inProcessWorkers';
import { differingPaths } from '../sim/pool/sameBits';

// The store's runners over the worker pool (stand-in workers running the real handler in-process).
// Results are checked for bit identity with a one-worker run (simulatePlan).
const demo = () => structuredClone(EXAMPLE_PLANS[0]!.plan);

describe('the app\'s runners over the worker pool', () => {
  it('a single run gives the one-worker result, progress as a share ending at 1', async () => {
    const pool = new SimulationPool({ size: 2, factory: inProcessWorkers().factory });
    const runner = createSimulationRunner(() => Promise.resolve(pool));
    const plan = demo();
    plan.simulation = { replications: 120, seed: 8 };
    const shares: number[] = [];
    const result = await runner.run(plan, (s) => shares.push(s));
    expect(differingPaths(result, simulatePlan(plan))).toEqual([]);
    expect(shares.at(-1)).toBe(1);
  });

  it('the grid runner delivers every cell once, as it finishes, and cancel stops the rest', async () => {
    const pool = new SimulationPool({ size: 2, factory: inProcessWorkers().factory });
    const grid = createGridRunner(() => Promise.resolve(pool));
    const jobs = [3, 4, 5].map((seed) => ({ plan: demo(), replications: 10, seed }));
    const cells = new Map<number, SimulationResult>();
    const shares: number[] = [];
    const { done } = grid.runGrid(jobs, {
      onCellResult: (i, r) => {
        expect(cells.has(i)).toBe(false);
        cells.set(i, r);
      },
      onCellError: (i, m) => {
        throw new Error(`cell ${i} failed: ${m}`);
      },
      onProgress: (s) => shares.push(s),
    });
    await done;
    expect([...cells.keys()].sort()).toEqual([0, 1, 2]);
    for (const [i, r] of cells) expect(differingPaths(r, simulatePlan(jobs[i]!.plan, { replications: 10, seed: jobs[i]!.seed }))).toEqual([]);
    expect(shares.at(-1)).toBe(1);

    const held = new SimulationPool({ size: 2, factory: inProcessWorkers({ hold: true }).factory });
    let calls = 0;
    const second = createGridRunner(() => Promise.resolve(held)).runGrid(jobs, { onCellResult: () => calls++, onCellError: () => calls++, onProgress: () => calls++ });
    await Promise.resolve();
    second.cancel();
    await second.done;
    expect(calls).toBe(0);
  });
});
