import type { Plan } from '../../core/plan';
import type { ReplicationBlock } from '../replicationBlock';
import type { SimulationResult } from '../types';

/**
 * Messages the command line's thread pool (nodeSimulationPool.ts) sends to a
 * simulation thread (simulationThread.ts):
 * - 'range': run replications [from, to) of the run `key` (the whole run's
 *   replications and seed) and send their block back; a thread keeps the run
 *   object of its latest key, so a run's later ranges reuse it;
 * - 'job': run a whole simulation (one design-explorer cell) and send its result.
 */
export type ToThread =
  | { type: 'range'; id: number; key: number; plan: Plan; replications: number; seed: number; from: number; to: number }
  | { type: 'job'; id: number; plan: Plan; replications: number; seed: number };

/** Messages a simulation thread sends back (done and total count the task's own replications). */
export type FromThread =
  | { type: 'progress'; id: number; done: number; total: number }
  | { type: 'block'; id: number; block: ReplicationBlock }
  | { type: 'result'; id: number; result: SimulationResult }
  /** A researcher-readable reason the task failed (the engine's message). */
  | { type: 'error'; id: number; message: string };
