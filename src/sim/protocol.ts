import type { Plan } from '../core/plan';
import type { RunTimeEstimate } from './estimateRunSeconds';
import type { SimulationResult } from './types';
import type { ReplicationBlock } from './replicationBlock';

/** Messages the main thread sends to the simulation worker. */
export type ToWorker =
  /** Start a run; a newer run supersedes (cancels) any older one. */
  | {
      type: 'run';
      runId: number;
      plan: Plan;
      replications?: number;
      seed?: number;
      /** Stop after the timed pilot, with 'too-long', when the estimate exceeds this many seconds. */
      maxSeconds?: number;
    }
  /**
   * The worker pool (src/sim/pool/simulationPool.ts): run replications [from, to) of the run planned
   * with `replications` and `seed`, and send their block back ('block'). With `pilot` (only for a
   * range starting at 0) the first replications are timed first and the one-worker estimate is
   * sent ('estimate'); the pool decides whether the run is too long. Supersedes an older run like 'run'.
   */
  | { type: 'range'; runId: number; plan: Plan; replications: number; seed: number; from: number; to: number; pilot?: boolean }
  /** The worker pool: merge the blocks of every range of a run and summarise it ('result'). */
  | { type: 'merge'; runId: number; plan: Plan; replications: number; seed: number; blocks: ReplicationBlock[] }
  /** Stop a run; its result is never sent. */
  | { type: 'cancel'; runId: number };

/** Messages the worker sends back. */
export type FromWorker =
  /** Sent at least every 5% of the replications or every 100 ms, whichever comes first (for a 'range': its own replications done of its size). */
  | { type: 'progress'; runId: number; done: number; total: number }
  /** The run-time estimate from the timed pilot (sent once, early in every run). */
  | { type: 'estimate'; runId: number; estimate: RunTimeEstimate }
  /** The run stopped after its pilot: the estimate exceeds the run's maxSeconds. */
  | { type: 'too-long'; runId: number; estimate: RunTimeEstimate }
  | { type: 'result'; runId: number; result: SimulationResult }
  /** A 'range' done: its replications' per-replication state (buffers transferred). */
  | { type: 'block'; runId: number; block: ReplicationBlock }
  /** A researcher-readable reason the run failed (bad plan, impossible inputs). */
  | { type: 'error'; runId: number; message: string }
  /** Acknowledges a cancel (or a run superseded by a newer one). */
  | { type: 'cancelled'; runId: number };
