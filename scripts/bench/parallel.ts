/*
 * Benchmark of the worker pool (part of npm run bench; src/sim/pool/nodeSimulationPool.ts).
 * Fields:
 *   parallelEfficiency          wall-clock speedup of a run on 2 worker threads over the same
 *                               run on 1 worker thread, ÷ 2 (target ≥ 0.8). The run is the demo
 *                               plan at enough replications to take about 2 s on one worker
 *                               (calibrated on the warm one-thread pool, 2,000–100,000); both
 *                               pools are started and warmed up before timing, the two are
 *                               timed in alternating rounds, and the figure is the median of
 *                               the rounds' ratios.
 *   parallelEfficiencyAllCores  { workers, efficiency }: the same with one thread per core
 *                               (os.availableParallelism()), speedup over 1 thread ÷ workers
 *                               (no target: reported for the machine at hand).
 *   parallelIdentical           whether the 2-thread result equals the 1-thread one bit for bit
 *                               (its JSON text; target true).
 * Wall-clock time is the right measure here, unlike the engine's CPU-time ratios: the point of
 * the pool is to finish sooner by using more cores, and CPU time adds the cores' work up. So this
 * figure is sensitive to other programs on the machine: run it on a quiet one.
 */
import { availableParallelism } from 'node:os';
import { demoPlan } from '../../src/io/demoPlan';
import { NodeSimulationPool } from '../../src/sim/pool/nodeSimulationPool';

const ROUNDS = 5;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}
const round = (x: number, d = 3): number => Math.round(x * 10 ** d) / 10 ** d;

/** The worker pool's benchmark fields (see the header). */
export async function parallelBench(): Promise<{
  parallelEfficiency: number;
  parallelEfficiencyAllCores: { workers: number; efficiency: number };
  parallelIdentical: boolean;
  parallelDetail: {
    plan: string;
    replications: number;
    roundRange: [number, number];
    medianSeconds: { oneWorker: number; twoWorkers: number };
    measure: string;
    target: string;
    met: boolean;
  };
}> {
  const plan = demoPlan();
  const cores = availableParallelism();
  const sizes = [...new Set([1, 2, Math.max(1, cores)])];
  const pools = new Map(sizes.map((n) => [n, new NodeSimulationPool(n)]));
  try {
    // Start every thread and warm its engine.
    for (const pool of pools.values()) await pool.runPlan(plan, { replications: 400 * pool.size });
    // Calibrate on the warm one-thread pool: about 2 s of work on one worker.
    // (The faster of two probes: the first may still pay for compiling.)
    const probe = 1000;
    let probeMs = Infinity;
    for (let k = 0; k < 2; k++) {
      const c0 = performance.now();
      await (pools.get(1) as NodeSimulationPool).runPlan(plan, { replications: probe });
      probeMs = Math.min(probeMs, performance.now() - c0);
    }
    const reps = Math.max(2000, Math.min(100_000, Math.round((probe * 2000) / probeMs)));
    const timeOnce = async (n: number): Promise<{ ms: number; json: string }> => {
      const start = performance.now();
      const result = await (pools.get(n) as NodeSimulationPool).runPlan(plan, { replications: reps });
      return { ms: performance.now() - start, json: JSON.stringify(result) };
    };
    const ratios: number[] = [];
    const ones: number[] = [];
    const twos: number[] = [];
    const allRatios: number[] = [];
    let identical = true;
    for (let r = 0; r < ROUNDS; r++) {
      const one = await timeOnce(1);
      const two = await timeOnce(2);
      if (r === 0) identical = one.json === two.json;
      ones.push(one.ms);
      twos.push(two.ms);
      ratios.push(one.ms / two.ms / 2);
      if (cores > 2) allRatios.push(one.ms / (await timeOnce(cores)).ms / cores);
    }
    const efficiency = median(ratios);
    const allCores = cores > 2 ? median(allRatios) : cores === 2 ? efficiency : 1;
    return {
      parallelEfficiency: round(efficiency),
      parallelEfficiencyAllCores: { workers: Math.max(1, cores), efficiency: round(allCores) },
      parallelIdentical: identical,
      parallelDetail: {
        plan: 'demo plan on node:worker_threads (NodeSimulationPool), warm threads',
        replications: reps,
        roundRange: [round(Math.min(...ratios)), round(Math.max(...ratios))],
        medianSeconds: { oneWorker: round(median(ones) / 1000, 2), twoWorkers: round(median(twos) / 1000, 2) },
        measure: `wall-clock time, median of ${ROUNDS} alternating rounds`,
        target: '>= 0.8',
        met: efficiency >= 0.8 && identical,
      },
    };
  } finally {
    for (const pool of pools.values()) await pool.close();
  }
}

// Run on its own: npx tsx scripts/bench/parallel.ts
if (import.meta.url === `file://${process.argv[1]}`) {
  console.log(JSON.stringify(await parallelBench()));
}
