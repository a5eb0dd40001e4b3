import type { Plan } from '../core/plan';
import type { SimulationOptions } from './createSimulation';
import { createPlanSimulation } from './multivariate/createPlanSimulation';
import { estimateRunSeconds, type RunTimeEstimate } from './estimateRunSeconds';
import type { SimulationResult } from './types';

/** What the stepping driver needs from its host (the worker, or a test). */
export interface StepHost {
  /** Report progress (done, total). */
  progress(done: number, total: number): void;
  /** Give other messages (e.g. cancel) a chance to arrive; resolves soon. */
  yieldTick(): Promise<void>;
  /** Whether the run should stop (checked between chunks). */
  cancelled(): boolean;
  /** Clock in ms (injected so the driver has no hidden timing). */
  now(): number;
  /**
   * Optional: given the run-time estimate from a timed pilot of the run's first replications
   * (estimateRunSeconds), return false to stop before the rest (the driver then returns null).
   * Without it no pilot is timed.
   */
  estimate?(estimate: RunTimeEstimate): boolean;
}

/**
 * Run a simulation asynchronously in small chunks, yielding between chunks so
 * cancel messages get through, and reporting progress at least every 5% of
 * the replications or every 100 ms. When the host asks for an estimate, the
 * first replications are a timed pilot (estimateRunSeconds) whose estimate the
 * host may refuse. Chunks are sized adaptively (about 20 ms
 * of work each); chunking never changes the numbers, since replication i
 * always uses stream (seed, i).
 *
 * @param plan a validated plan.
 * @param options replications and seed (default: plan.simulation).
 * @param host progress sink, yield function, cancel flag and clock.
 * @returns the result, or null when cancelled.
 * @throws Error with a researcher-readable message for invalid settings.
 * @example await runSimulationInSteps(demoPlan(), { replications: 100 }, host) // same numbers as simulatePlan
 */
export async function runSimulationInSteps(
  plan: Plan,
  options: SimulationOptions,
  host: StepHost,
): Promise<SimulationResult | null> {
  const run = createPlanSimulation(plan, options);
  const total = run.total;
  const fivePercent = Math.max(1, Math.floor(total / 20));
  let chunk = Math.min(fivePercent, 10);
  let lastReport = host.now();
  let lastReportedDone = 0;
  host.progress(0, total);
  let from = 0;
  if (host.estimate) {
    const estimate = estimateRunSeconds(run, () => host.now());
    if (!host.estimate(estimate)) return null;
    from = run.completed;
    host.progress(from, total);
    lastReport = host.now();
    lastReportedDone = from;
    await host.yieldTick();
  }
  while (from < total) {
    if (host.cancelled()) return null;
    // Never run past the next 5% mark without reporting.
    const to = Math.min(total, from + chunk, lastReportedDone + fivePercent);
    const t0 = host.now();
    run.runChunk(from, to);
    const t1 = host.now();
    const ran = to - from;
    from = to;
    // Aim for ~20 ms per chunk, never more than 5% of the run.
    const perRep = (t1 - t0) / ran;
    if (perRep > 0) chunk = Math.max(1, Math.min(fivePercent, Math.round(20 / perRep)));
    if (from - lastReportedDone >= fivePercent || t1 - lastReport >= 100 || from === total) {
      host.progress(from, total);
      lastReport = t1;
      lastReportedDone = from;
    }
    await host.yieldTick();
  }
  if (host.cancelled()) return null;
  return run.finish();
}
