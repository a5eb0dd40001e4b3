import type { RunTimeEstimate } from '../estimateRunSeconds';

/**
 * A run-time estimate (estimateRunSeconds: a timed pilot of the first
 * replications on one worker) turned into one for `workers` workers sharing
 * the rest of the run: the pilot's own time plus the remaining replications at
 * the pilot's pace divided among the workers. It assumes the workers run as
 * fast as the one that was timed (so it is optimistic on a machine that is
 * busy with other work); the method sentence says so.
 *
 * @param estimate the one-worker estimate.
 * @param workers workers sharing the run, whole number ≥ 1 (1 returns the estimate unchanged).
 * @returns the estimate with `seconds` and `method` for the pool.
 * @throws never.
 * @example
 *   // pilot 0.5 s of 40 replications, 960 left at 10 ms each, 4 workers: 0.5 + 9.6 / 4 = 2.9 s
 *   parallelRunEstimate({ seconds: 10.1, secondsPerReplication: 0.01, pilotReplications: 40, pilotSeconds: 0.5, replications: 1000, method: '…' }, 4).seconds // 2.9
 */
export function parallelRunEstimate(estimate: RunTimeEstimate, workers: number): RunTimeEstimate {
  if (!(workers > 1)) return estimate;
  const rest = Math.max(0, estimate.replications - estimate.pilotReplications);
  return {
    ...estimate,
    seconds: estimate.pilotSeconds + (rest * estimate.secondsPerReplication) / workers,
    method: `${estimate.method}, shared among ${workers} workers running side by side`,
  };
}
