import type { Plan } from '../core/plan';
import type { RunTimeEstimate } from './estimateRunSeconds';
import type { SimulationResult } from './types';

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
  /** Stop a run; its result is never sent. */
  | { type: 'cancel'; runId: number };

/** Messages the worker sends back. */
export type FromWorker =
  /** Sent at least every 5% of the replications or every 100 ms, whichever comes first. */
  | { type: 'progress'; runId: number; done: number; total: number }
  /** The run-time estimate from the timed pilot (sent once, early in every run). */
  | { type: 'estimate'; runId: number; estimate: RunTimeEstimate }
  /** The run stopped after its pilot: the estimate exceeds the run's maxSeconds. */
  | { type: 'too-long'; runId: number; estimate: RunTimeEstimate }
  | { type: 'result'; runId: number; result: SimulationResult }
  /** A researcher-readable reason the run failed (bad plan, impossible inputs). */
  | { type: 'error'; runId: number; message: string }
  /** Acknowledges a cancel (or a run superseded by a newer one). */
  | { type: 'cancelled'; runId: number };
