import type { Plan } from '../../core/plan';
import { createPlanSimulation } from '../multivariate/createPlanSimulation';
import type { ReplicationBlock } from '../replicationBlock';
import type { SimulationOptions, SimulationResult, SimulationRun } from '../types';

/**
 * Run replications [from, to) of a plan's simulation (the run planned with
 * `options`: the same replications and seed as the whole run) and hand back
 * their per-replication state as a block (SimulationRun.exportBlock), for a
 * coordinator to merge with mergeReplicationBlocks. What a pool's worker does
 * with one range (src/sim/worker.ts, src/sim/pool/simulationThread.ts).
 *
 * @param plan a validated plan.
 * @param options replications and seed of the whole run (defaults: plan.simulation).
 * @param from first replication (inclusive), to one past the last; 0 ≤ from ≤ to ≤ total.
 * @param step optional: run in chunks, calling step(done, size) after each (progress; it may throw to stop).
 * @param run optional: the run object to use (a pilot may already have run some of the range).
 * @returns the block of [from, to).
 * @throws Error with a researcher-readable message for invalid settings or inputs (from the engines).
 * @example runReplicationRange(demoPlan(), { replications: 100 }, 50, 100).arrays[0].length // 50
 */
export function runReplicationRange(
  plan: Plan,
  options: SimulationOptions,
  from: number,
  to: number,
  step?: (done: number, size: number) => void,
  run: SimulationRun = createPlanSimulation(plan, options),
): ReplicationBlock {
  const size = to - from;
  const chunk = Math.max(1, Math.min(1000, Math.ceil(size / 20)));
  for (let i = from; i < to; i += chunk) {
    run.runChunk(i, Math.min(to, i + chunk));
    step?.(Math.min(to, i + chunk) - from, size);
  }
  return run.exportBlock(from, to);
}

/**
 * Merge the blocks of a run's ranges (covering every replication) into one run
 * of the same plan and options and summarise it: bit for bit the result of
 * running every replication in one place (each replication's state is copied,
 * never recomputed, and the summary runs over them in replication order).
 *
 * @param plan the plan the blocks were run for.
 * @param options the whole run's replications and seed.
 * @param blocks the blocks, in any order.
 * @returns the SimulationResult.
 * @throws Error when the blocks do not cover every replication or belong to another run.
 * @example mergeReplicationBlocks(plan, opts, [runReplicationRange(plan, opts, 0, 50), runReplicationRange(plan, opts, 50, 100)])
 */
export function mergeReplicationBlocks(plan: Plan, options: SimulationOptions, blocks: readonly ReplicationBlock[]): SimulationResult {
  const run = createPlanSimulation(plan, options);
  for (const b of blocks) run.importBlock(b);
  return run.finish();
}
