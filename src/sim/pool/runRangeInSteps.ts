import type { Plan } from '../../core/plan';
import { estimateRunSeconds, type RunTimeEstimate } from '../estimateRunSeconds';
import { createPlanSimulation } from '../multivariate/createPlanSimulation';
import type { ReplicationBlock } from '../replicationBlock';
import type { StepHost } from '../runSimulationInSteps';
import type { SimulationOptions } from '../types';

/**
 * runSimulationInSteps for one range of a run, as a pool's worker does it: run
 * replications [from, to) of the run planned with `options` in chunks of about
 * 20 ms, yielding between chunks so a cancel gets through, reporting progress
 * (done within the range, of its size) at least every 5% of the range or every
 * 100 ms, and return the range's block (SimulationRun.exportBlock). With
 * `pilot` and a host that takes an estimate, the run's first replications are
 * timed first (estimateRunSeconds: they count towards the range) and the
 * one-worker estimate handed to the host, which may refuse it.
 *
 * @param plan a validated plan. @param options the whole run's replications and seed.
 * @param from first replication, to one past the last (0 ≤ from ≤ to ≤ total; pilot only with from = 0).
 * @param host progress, yield, cancel flag, clock and (with pilot) the estimate sink.
 * @returns the block, or null when cancelled or the estimate was refused.
 * @throws Error with a researcher-readable message for invalid settings or inputs (from the engines).
 * @example await runRangeInSteps(plan, { replications: 1000, seed: 1 }, 500, 1000, host) // block of 500..1000
 */
export async function runRangeInSteps(
  plan: Plan,
  options: SimulationOptions,
  from: number,
  to: number,
  host: StepHost,
  pilot = false,
): Promise<ReplicationBlock | null> {
  const run = createPlanSimulation(plan, options);
  if (!Number.isInteger(from) || !Number.isInteger(to) || from < 0 || to > run.total || from > to) {
    throw new Error(`Replication range ${from}..${to} is outside 0..${run.total}.`);
  }
  const size = to - from;
  const fivePercent = Math.max(1, Math.floor(size / 20));
  let chunk = Math.min(fivePercent, 10);
  host.progress(0, size);
  let at = from;
  if (pilot && from === 0 && host.estimate) {
    const estimate: RunTimeEstimate = estimateRunSeconds(run, () => host.now());
    if (!host.estimate(estimate)) return null;
    // The pilot may have run past a short range: those replications are simply not exported.
    at = Math.min(to, run.completed);
    host.progress(at - from, size);
    await host.yieldTick();
  }
  let lastReport = host.now();
  let lastReportedDone = at - from;
  while (at < to) {
    if (host.cancelled()) return null;
    const end = Math.min(to, at + chunk, from + lastReportedDone + fivePercent);
    const t0 = host.now();
    run.runChunk(at, end);
    const t1 = host.now();
    const perRep = (t1 - t0) / (end - at);
    at = end;
    if (perRep > 0) chunk = Math.max(1, Math.min(fivePercent, Math.round(20 / perRep)));
    if (at - from - lastReportedDone >= fivePercent || t1 - lastReport >= 100 || at === to) {
      host.progress(at - from, size);
      lastReport = t1;
      lastReportedDone = at - from;
    }
    await host.yieldTick();
  }
  if (host.cancelled()) return null;
  return run.exportBlock(from, to);
}
