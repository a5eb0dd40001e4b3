import type { SimulationRun } from './types';

/**
 * The longest run the planner starts in the browser without asking: 10 minutes, estimated.
 * Longer runs need the researcher's go-ahead (or the command line, which can stop at a time
 * limit with `--max-seconds` and summarise what it has).
 */
export const BROWSER_RUN_LIMIT_SECONDS = 600;

/** How long a run will take, from a short timed pilot of the run itself (estimateRunSeconds). */
export interface RunTimeEstimate {
  /** Estimated seconds for the whole run: the pilot's time plus the rest at the pilot's pace. */
  seconds: number;
  /** Estimated seconds per replication: the pace of the pilot's latest chunk (about its second half). */
  secondsPerReplication: number;
  /** Replications timed (they are the run's first ones and count towards it). */
  pilotReplications: number;
  /** Seconds the pilot took. */
  pilotSeconds: number;
  /** Replications the run is to do in all. */
  replications: number;
  /** One sentence saying how the estimate was made (shown beside it). */
  method: string;
}

/** Limits of the pilot: it stops at whichever comes first (with at least one replication). */
export interface PilotLimits {
  /** Milliseconds of pilot work to aim for (default 500). */
  targetMs?: number;
  /** Most replications to time (default 40). */
  maxReplications?: number;
  /**
   * Time at least 8 replications (so the warm-up can be left out of the pace) unless the pilot has
   * already taken this many milliseconds (default 4,000).
   */
  warmUpCapMs?: number;
}

/**
 * Estimate a run's time from a timed pilot: run its first replications (1, then 1, 2, 4, …
 * at a time) until about `targetMs` of work or `maxReplications` are done (and at least 8,
 * unless the pilot has already taken `warmUpCapMs`), and scale the
 * pace to the planned count. Replication i always draws from its own stream, so the pilot's
 * replications are simply the run's first ones: they count towards it and change no number.
 * Time per replication is nearly constant within a plan (the pools and every step have fixed
 * sizes), so the scaled pace is a fair guide; the first replications also pay for compiling
 * the engine and for the first garbage collections of large pools, so the pace is taken from
 * the latest chunk alone, about the second half of the pilot (common practice for timing:
 * discard the warm-up). Measured on a shared machine (pools of 100,000, 1:5): a browser pilot
 * of 4 replications with the first in the pace overstated the run 2–4-fold; 8 with the latest
 * chunk's pace, 1.5–2-fold in a worker that had run before. Expect the estimate within a factor of about 1.5 on a
 * machine that is not otherwise busy (measured: test/sim/estimateRunSeconds.test.ts checks
 * the arithmetic with a fake clock; docs/simulation.md, "How long a run takes").
 *
 * @param run a fresh run (createPlanSimulation), none of its replications done yet.
 * @param now a clock in milliseconds (performance.now or a fake).
 * @param limits pilot size limits (targetMs > 0, maxReplications ≥ 1).
 * @returns the estimate; run.completed = its pilotReplications afterwards.
 * @throws Error when the run already has replications done or a limit is out of range
 *   (and whatever the engine throws for the plan).
 * @example
 *   // a fake clock advancing 50 ms per replication, 1,000 planned, target 500 ms:
 *   // 1 + 1 + 2 + 4 + 8 = 16 timed (800 ms), pace 400 / 8 = 50 ms → seconds = 0.8 + 984 × 0.05 = 50
 */
export function estimateRunSeconds(run: SimulationRun, now: () => number, limits: PilotLimits = {}): RunTimeEstimate {
  const targetMs = limits.targetMs ?? 500;
  const maxReps = limits.maxReplications ?? 40;
  const warmUpCapMs = limits.warmUpCapMs ?? 4000;
  if (!(targetMs > 0) || !Number.isFinite(targetMs)) throw new Error(`The pilot's time target must be a positive number of milliseconds; got ${String(targetMs)}.`);
  if (!Number.isInteger(maxReps) || maxReps < 1) throw new Error(`The pilot's replication limit must be a whole number of at least 1; got ${String(maxReps)}.`);
  if (run.completed !== 0) throw new Error(`The run time can only be estimated before a run starts; ${run.completed} replications have already run.`);
  const total = run.total;
  const limit = Math.min(total, maxReps);
  const start = now();
  run.runChunk(0, 1);
  let done = 1;
  let step = 1;
  let lastMs = now() - start; // time of the latest chunk
  let lastReps = 1;
  for (;;) {
    const elapsed = now() - start;
    if (done >= limit || (elapsed >= targetMs && (done >= 8 || elapsed >= warmUpCapMs))) break;
    const to = Math.min(limit, done + step);
    const t0 = now();
    run.runChunk(done, to);
    lastMs = now() - t0;
    lastReps = to - done;
    done = to;
    step *= 2;
  }
  const pilotMs = Math.max(0, now() - start);
  // The pace of the latest chunk (about half the pilot): the engine is compiled and warm by then.
  const perRep = Math.max(0, lastMs) / lastReps / 1000;
  const seconds = pilotMs / 1000 + (total - done) * perRep;
  return {
    seconds,
    secondsPerReplication: perRep,
    pilotReplications: done,
    pilotSeconds: pilotMs / 1000,
    replications: total,
    method: `timed the first ${grouped(done)} of ${grouped(total)} replications on this device and scaled their pace to the rest`,
  };
}

/** A whole number with thousands separators ("100,000"), for the method sentence. */
function grouped(n: number): string {
  return n.toLocaleString('en-GB');
}
