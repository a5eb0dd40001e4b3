import { exportReplicationBlock, importReplicationBlock, type ReplicationBlock, type ReplicationStores } from './replicationBlock';
import type { SimulationResult, SimulationRun } from './types';

/**
 * The stepping interface both Monte Carlo engines return: replications run in
 * any chunks (each replication from its own random stream, so chunking and
 * re-running change nothing), and the summary only once every replication has
 * run. The engine supplies the per-replication work and the summary.
 *
 * @param total number of replications (whole number ≥ 1; already validated).
 * @param seed the run's seed (reported back only).
 * @param runner runs replication i (0 ≤ i < total), storing its results at index i.
 * @param summarise builds the result over the first `count` replications (count = total once all have run).
 * @param stores the engine's per-replication stores and example replication, so ranges
 *   of replications run elsewhere (another worker) can be exported and imported
 *   (exportBlock / importBlock; see replicationBlock.ts and docs/simulation.md,
 *   "The worker pool"). Without it blocks carry no records (tests of the stepping alone).
 * @returns a SimulationRun over runner and summarise.
 * @throws never itself; runChunk throws an Error for a range outside 0..total, and
 *   finish one naming how many replications have run when some have not.
 * @example
 *   const run = steppedSimulationRun(4, 1, { run: () => {} }, summarise);
 *   run.runChunk(0, 2); run.completed // 2; run.finish() throws "Only 2 of 4 replications have run; …"
 *   run.finishPartial() // summarise(2) with partial: true, replicationsPlanned: 4
 */
export function steppedSimulationRun(
  total: number,
  seed: number,
  runner: { run(i: number): void },
  summarise: (count: number) => SimulationResult,
  stores: ReplicationStores | null = null,
): SimulationRun {
  const done = new Uint8Array(total);
  let completed = 0;

  const runChunk = (from: number, to: number): void => {
    checkRange(from, to);
    for (let i = from; i < to; i++) {
      runner.run(i);
      if (!done[i]) {
        done[i] = 1;
        completed++;
      }
    }
  };

  const finish = (): SimulationResult => {
    if (completed < total) {
      throw new Error(`Only ${completed} of ${total} replications have run; cannot summarise yet.`);
    }
    return summarise(total);
  };

  const finishPartial = (): SimulationResult => {
    let prefix = 0;
    while (prefix < total && done[prefix]) prefix++;
    if (prefix === total) return summarise(total);
    if (prefix < 2) {
      throw new Error(`Only ${prefix} of ${total} replications finished before the run was stopped; at least 2 are needed for a summary.`);
    }
    return { ...summarise(prefix), partial: true, replicationsPlanned: total };
  };

  const checkRange = (from: number, to: number): void => {
    if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > total || from > to) {
      throw new Error(`Replication range ${from}..${to} is outside 0..${total}.`);
    }
  };

  const exportBlock = (from: number, to: number): ReplicationBlock => {
    checkRange(from, to);
    for (let i = from; i < to; i++) {
      if (!done[i]) throw new Error(`Replication ${i} has not run, so replications ${from}..${to} cannot be handed on yet.`);
    }
    return exportReplicationBlock(stores, total, seed, from, to);
  };

  const importBlock = (block: ReplicationBlock): void => {
    importReplicationBlock(stores, total, seed, block);
    for (let i = block.from; i < block.to; i++) {
      if (!done[i]) {
        done[i] = 1;
        completed++;
      }
    }
  };

  return {
    total,
    seed,
    get completed() {
      return completed;
    },
    runChunk,
    finish,
    finishPartial,
    exportBlock,
    importBlock,
  };
}
