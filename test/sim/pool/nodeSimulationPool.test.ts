import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import { describe, expect, it } from 'vitest';
import type { Plan } from '../../../src/core/plan';
import { EXAMPLE_PLANS } from '../../../src/io/examplePlans';
import { simulatePlan } from '../../../src/sim/simulatePlan';
import { NodeSimulationPool, runBatchOnThreads, runPlanOnThreads, threadEntryUrl } from '../../../src/sim/pool/nodeSimulationPool';
import { differingPaths } from './sameBits';

// Real node:worker_threads (the thread loads the TypeScript source through tsx). The check is bit
// identity with a one-worker, in-process run (simulatePlan); replication i draws from stream (seed, i).
const example = (id: string): Plan => structuredClone(EXAMPLE_PLANS.find((e) => e.id === id)!.plan);

describe('the command line\'s thread pool', () => {
  it('finds the thread entry next to itself (the TypeScript source when no built .mjs is there)', () => {
    expect(threadEntryUrl().pathname).toMatch(/\/src\/sim\/pool\/simulationThread\.ts$/);
  });

  it('2 threads give the one-worker result bit for bit, with progress up to the total', async () => {
    const plan = example('demo-falls-prevention');
    plan.simulation = { replications: 80, seed: 99 };
    const seen: number[] = [];
    const threaded = await runPlanOnThreads(plan, { workers: 2, onProgress: (done) => seen.push(done) });
    const single = simulatePlan(plan);
    expect(differingPaths(threaded, single)).toEqual([]);
    expect(seen.at(-1)).toBe(80);
    // Progress over the pool never goes back (finished ranges plus the running ones' progress).
    for (let i = 1; i < seen.length; i++) expect(seen[i]!).toBeGreaterThanOrEqual(seen[i - 1]!);
  }, 30_000);

  it('runs a batch: each job once, each result equal to its own one-worker run; a bad job fails alone', async () => {
    const a = example('demo-falls-prevention');
    const b = example('screened-reading-support');
    const bad = example('demo-falls-prevention');
    const jobs = [
      { plan: a, replications: 20, seed: 1 },
      { plan: b, replications: 12, seed: 2 },
      { plan: bad, replications: 1, seed: 3 }, // fewer than 2 replications: the engine refuses
      { plan: a, replications: 20, seed: 4 },
    ];
    const results = new Map<number, unknown>();
    const errors = new Map<number, string>();
    let last = 0;
    await runBatchOnThreads(jobs, {
      workers: 2,
      onResult: (i, r) => {
        expect(results.has(i)).toBe(false);
        results.set(i, r);
      },
      onError: (i, m) => errors.set(i, m),
      onProgress: (done, total) => {
        expect(total).toBe(53);
        last = done;
      },
    });
    expect([...results.keys()].sort()).toEqual([0, 1, 3]);
    expect([...errors.keys()]).toEqual([2]);
    expect(errors.get(2)).toMatch(/replications/i);
    for (const i of [0, 1, 3]) {
      const j = jobs[i]!;
      expect(differingPaths(results.get(i), simulatePlan(j.plan, { replications: j.replications, seed: j.seed }))).toEqual([]);
    }
    expect(last).toBe(52); // the failed job's one replication never ran
  }, 30_000);

  it('a thread that dies fails the run with a plain message, and is replaced on the next run', async () => {
    // A stand-in thread that ends itself as soon as it is given work (as a crash would).
    const dir = mkdtempSync(join(tmpdir(), 'meanward-thread-'));
    const entry = join(dir, 'dies.mjs');
    writeFileSync(entry, "import { parentPort } from 'node:worker_threads';\nparentPort.on('message', () => process.exit(3));\n");
    const pool = new NodeSimulationPool(2, pathToFileURL(entry));
    const plan = example('demo-falls-prevention');
    try {
      await expect(pool.runPlan(plan, { replications: 40 })).rejects.toThrow(
        'The simulation stopped unexpectedly: one of its worker threads ended without finishing. Run it again; if it stops again, try --workers 1.',
      );
      await expect(pool.runPlan(plan, { replications: 40 })).rejects.toThrow('stopped unexpectedly');
    } finally {
      await pool.close();
    }
  }, 30_000);

  it('names a bad thread count', () => {
    expect(() => new NodeSimulationPool(0)).toThrow('The number of worker threads must be a whole number from 1 to 64; got 0.');
  });
});
