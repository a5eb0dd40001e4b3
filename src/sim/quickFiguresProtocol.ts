import type { Plan } from '../core/plan';
import type { PlannedProcedureEstimates } from '../core/plannedProcedure';

/** Message the main thread sends to the quick-figures worker. */
export type ToQuickWorker = { type: 'estimate'; id: number; plan: Plan };

/** Messages the quick-figures worker sends back. */
export type FromQuickWorker =
  | { type: 'estimates'; id: number; estimates: PlannedProcedureEstimates }
  /** A researcher-readable reason the quick run failed. */
  | { type: 'error'; id: number; message: string };
