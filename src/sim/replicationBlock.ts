import type { SimulationResult } from './types';

/** A per-replication store's typed array (estimates, SEs, flags, balance figures …). */
export type ReplicationArray = Float64Array | Uint8Array;

/**
 * One per-replication store of an engine: replication i owns the entries
 * array[i·stride … (i + 1)·stride − 1] (stride 1 for one number per
 * replication; the several-covariate engine's balance flags keep one per
 * variable, stride = number of variables).
 */
export interface ReplicationStore {
  readonly array: ReplicationArray;
  readonly stride: number;
}

/**
 * What an engine registers with steppedSimulationRun so a range of its
 * replications can be moved to another run object of the same plan, seed and
 * total (SimulationRun.exportBlock / importBlock): every per-replication store,
 * in a fixed order, and the example replication (captured when replication
 * `exampleIndex` runs).
 */
export interface ReplicationStores {
  readonly arrays: readonly ReplicationStore[];
  /** The replication whose matched sets the result shows as its example (0 in every engine). */
  readonly exampleIndex: number;
  getExample(): SimulationResult['example'] | null;
  setExample(example: SimulationResult['example']): void;
}

/**
 * The per-replication state of replications [from, to) of one run, as plain
 * typed arrays (one per registered store, in the engine's order, each holding
 * (to − from) · stride entries) that postMessage can transfer
 * (replicationBlockTransfers). `example` is present when the range holds the
 * example replication. `total` and `seed` are the run's, checked on import.
 */
export interface ReplicationBlock {
  readonly from: number;
  readonly to: number;
  readonly total: number;
  readonly seed: number;
  readonly arrays: ReplicationArray[];
  readonly example: SimulationResult['example'] | null;
}

/**
 * The buffers of a block's arrays, for postMessage's transfer list (each
 * array owns its buffer: exportBlock copies with slice).
 * @example worker.postMessage({ type: 'block', block }, replicationBlockTransfers(block))
 */
export function replicationBlockTransfers(block: ReplicationBlock): ArrayBuffer[] {
  return block.arrays.map((a) => a.buffer as ArrayBuffer);
}

/**
 * Copy replications [from, to) out of the stores (see ReplicationBlock).
 * @throws never (the caller checks the range).
 */
export function exportReplicationBlock(stores: ReplicationStores | null, total: number, seed: number, from: number, to: number): ReplicationBlock {
  const arrays = (stores?.arrays ?? []).map(({ array, stride }) => array.slice(from * stride, to * stride));
  const holdsExample = stores !== null && from <= stores.exampleIndex && stores.exampleIndex < to;
  const example = holdsExample ? stores.getExample() : null;
  return { from, to, total, seed, arrays, example };
}

/**
 * Copy a block into the stores of a run of the same plan, seed and total.
 * @throws Error naming the mismatch when the block belongs to another run
 *   (total, seed, number or lengths of arrays) or its range is outside 0..total.
 */
export function importReplicationBlock(stores: ReplicationStores | null, total: number, seed: number, block: ReplicationBlock): void {
  const { from, to } = block;
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > total || from > to) {
    throw new Error(`Replication range ${from}..${to} is outside 0..${total}.`);
  }
  if (block.total !== total || block.seed !== seed) {
    throw new Error(`A block of replications from a run of ${block.total} replications with seed ${block.seed} cannot join a run of ${total} with seed ${seed}.`);
  }
  const own = stores?.arrays ?? [];
  if (block.arrays.length !== own.length) {
    throw new Error(`A block of replications holds ${block.arrays.length} records where this run keeps ${own.length}: it comes from another kind of plan.`);
  }
  own.forEach(({ array, stride }, s) => {
    const part = block.arrays[s] as ReplicationArray;
    if (part.length !== (to - from) * stride || part.constructor !== array.constructor) {
      throw new Error(`A block of replications has a record of the wrong size (${part.length} entries for ${to - from} replications): it comes from another kind of plan.`);
    }
    array.set(part as never, from * stride);
  });
  if (stores && block.example !== null && from <= stores.exampleIndex && stores.exampleIndex < to) stores.setExample(block.example);
}

/**
 * An engine runner's per-replication stores and its example replication (index 0), for
 * steppedSimulationRun's exportBlock / importBlock; shared by the three engines.
 */
export function runnerStores(runner: { example: SimulationResult['example'] | null }, arrays: ReplicationStore[]): ReplicationStores {
  return {
    arrays,
    exampleIndex: 0,
    getExample: () => runner.example,
    setExample: (example) => {
      runner.example = example;
    },
  };
}
