import { existsSync } from 'node:fs';
import { availableParallelism } from 'node:os';
import { createRequire } from 'node:module';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { Worker } from 'node:worker_threads';
import type { Plan } from '../../core/plan';
import { estimateRunSeconds, type RunTimeEstimate } from '../estimateRunSeconds';
import { createPlanSimulation } from '../multivariate/createPlanSimulation';
import type { SimulationResult, SimulationRun } from '../types';
import { defaultPoolSize, MAX_POOL_WORKERS } from './defaultPoolSize';
import { parallelRunEstimate } from './parallelRunEstimate';
import type { FromThread, ToThread } from './threadProtocol';

/**
 * Where the simulation thread's code is: a built `simulationThread.mjs` next to
 * the running module when there is one (the command line's bundle, dist-cli/,
 * emits it beside its entry), else the TypeScript source next to this file
 * (the command line run through tsx, and the tests).
 * @example threadEntryUrl().href // 'file:///…/src/sim/pool/simulationThread.ts' when run from source
 */
export function threadEntryUrl(): URL {
  const built = new URL('./simulationThread.mjs', import.meta.url);
  if (built.protocol === 'file:' && existsSync(fileURLToPath(built))) return built;
  return new URL('./simulationThread.ts', import.meta.url);
}

/** The default number of threads for the command line: cores − 1, at least 1 (defaultPoolSize). */
export function defaultThreadCount(): number {
  return defaultPoolSize(availableParallelism());
}

/** Start one thread on the entry: a built .mjs/.js directly, a .ts file through tsx's loader. */
function startThread(entry: URL): Worker {
  if (/\.m?js$/.test(entry.pathname)) return new Worker(entry);
  const code = `import(${JSON.stringify(tsxApiUrl())}).then((m) => m.tsImport(${JSON.stringify(entry.href)}, ${JSON.stringify(entry.href)}))`;
  return new Worker(code, { eval: true });
}

/** The URL of tsx's ES-module API (its tsImport loads a .ts file with its imports). */
function tsxApiUrl(): string {
  try {
    return import.meta.resolve('tsx/esm/api');
  } catch {
    // Where import.meta.resolve is missing (some test runners): the require path of the same
    // export, with its ES-module twin beside it.
    const cjs = createRequire(import.meta.url).resolve('tsx/esm/api');
    const mjs = cjs.replace(/\.cjs$/, '.mjs');
    return pathToFileURL(existsSync(mjs) ? mjs : cjs).href;
  }
}

/** The plain message for a thread that ended without a word. */
const THREAD_DIED = 'The simulation stopped unexpectedly: one of its worker threads ended without finishing. Run it again; if it stops again, try --workers 1.';

interface Task {
  msg: ToThread;
  /** false: dropped when a thread would take it (the run it belongs to has stopped). */
  wanted(): boolean;
  progress(done: number): void;
  finished(msg: FromThread): void;
  failed(message: string): void;
}

interface Slot {
  worker: Worker;
  task: Task | null;
}

/**
 * A pool of simulation threads for the command line (node:worker_threads),
 * the Node side of the worker pool (docs/simulation.md, "The worker pool"):
 * runPlan splits one run into contiguous ranges of replications handed out in
 * order to whichever thread is free, and merges their blocks in one run object
 * here (SimulationRun.importBlock), so the result is bit for bit that of one
 * thread; runBatch runs whole simulations (grid cells), each on one thread.
 * Threads start on first use; close() ends them. A thread that fails with the
 * engine's message fails its run (or its job) with that message; one that dies
 * fails it with a plain message and is replaced.
 *
 * @example
 *   const pool = new NodeSimulationPool(3);
 *   try { const result = await pool.runPlan(plan, {}); } finally { await pool.close(); }
 */
export class NodeSimulationPool {
  private readonly slots: (Slot | null)[];
  private readonly queue: Task[] = [];
  private nextId = 1;

  /**
   * @param size threads, whole number 1..64.
   * @param entry the thread's code (threadEntryUrl()).
   * @throws Error naming the value when size is out of range.
   */
  constructor(
    readonly size: number,
    private readonly entry: URL = threadEntryUrl(),
  ) {
    if (!Number.isInteger(size) || size < 1 || size > MAX_POOL_WORKERS) {
      throw new Error(`The number of worker threads must be a whole number from 1 to ${MAX_POOL_WORKERS}; got ${String(size)}.`);
    }
    this.slots = Array.from({ length: size }, () => null);
  }

  /**
   * Simulate a plan on the pool's threads: bit for bit the result of one thread (or of simulatePlan).
   * With `pilot` (or onEstimate, or maxSeconds) the first replications are timed here first
   * (estimateRunSeconds) and onEstimate gets the estimate for the pool (parallelRunEstimate).
   * With maxSeconds no new range is handed out after that many seconds, and the result
   * summarises the replications done from the first on (SimulationRun.finishPartial, marked partial).
   * @throws Error with the engine's message, or a plain one when a thread died.
   */
  async runPlan(
    plan: Plan,
    options: {
      replications?: number;
      seed?: number;
      onProgress?: (done: number, total: number) => void;
      onEstimate?: (estimate: RunTimeEstimate) => void;
      pilot?: boolean;
      maxSeconds?: number;
      now?: () => number;
    },
  ): Promise<SimulationResult> {
    const now = options.now ?? (() => performance.now());
    const start = now();
    const run: SimulationRun = createPlanSimulation(plan, { replications: options.replications, seed: options.seed });
    const total = run.total;
    const settings = { replications: total, seed: run.seed };
    if (options.pilot || options.onEstimate || options.maxSeconds !== undefined) {
      const estimate = estimateRunSeconds(run, now);
      options.onEstimate?.(parallelRunEstimate(estimate, this.size));
    }
    const from = run.completed;
    // Ranges of about a quarter of each thread's share, handed out in order (so a run stopped at
    // --max-seconds has done its first replications), never fewer than 1.
    const size = Math.max(1, Math.ceil((total - from) / (this.size * 4)));
    const key = this.nextId++;
    const inFlight = new Map<number, number>();
    let stopped = false;
    let failure: string | null = null;
    const report = (): void => {
      let done = run.completed;
      for (const d of inFlight.values()) done += d;
      options.onProgress?.(done, total);
    };
    report();
    await new Promise<void>((resolve) => {
      let open = 0;
      const settleOne = (): void => {
        open--;
        if (open === 0) resolve();
      };
      const timeUp = (): boolean => options.maxSeconds !== undefined && run.completed >= 2 && (now() - start) / 1000 >= options.maxSeconds;
      for (let a = from; a < total; a += size) {
        const b = Math.min(total, a + size);
        const id = this.nextId++;
        open++;
        this.queue.push({
          msg: { type: 'range', id, key, plan, ...settings, from: a, to: b },
          wanted: () => {
            if (!stopped && failure === null && timeUp()) stopped = true;
            if (stopped || failure !== null) {
              settleOne();
              return false;
            }
            return true;
          },
          progress: (done) => {
            inFlight.set(id, done);
            report();
          },
          finished: (msg) => {
            inFlight.delete(id);
            if (msg.type === 'block') run.importBlock(msg.block);
            report();
            settleOne();
          },
          failed: (message) => {
            inFlight.delete(id);
            failure ??= message;
            settleOne();
          },
        });
      }
      if (open === 0) resolve();
      this.pump();
    });
    if (failure !== null) throw new Error(failure);
    return run.completed < total ? run.finishPartial() : run.finish();
  }

  /**
   * Run many whole simulations (grid cells), each on one thread, queued over the pool;
   * onResult / onError as each finishes; onProgress(done, total) over all jobs' replications.
   * Resolves when every job has finished or failed (never rejects for a job's failure).
   */
  runBatch(
    jobs: readonly { plan: Plan; replications: number; seed: number }[],
    handlers: {
      onResult(index: number, result: SimulationResult): void;
      onError(index: number, message: string): void;
      onProgress?(done: number, total: number): void;
    },
  ): Promise<void> {
    const total = jobs.reduce((s, j) => s + j.replications, 0);
    const done = new Array<number>(jobs.length).fill(0);
    const report = (): void => handlers.onProgress?.(done.reduce((s, d) => s + d, 0), total);
    return new Promise<void>((resolve) => {
      let open = jobs.length;
      const settleOne = (): void => {
        open--;
        if (open === 0) resolve();
      };
      jobs.forEach((job, index) => {
        this.queue.push({
          msg: { type: 'job', id: this.nextId++, plan: job.plan, replications: job.replications, seed: job.seed },
          wanted: () => true,
          progress: (d) => {
            done[index] = d;
            report();
          },
          finished: (msg) => {
            done[index] = job.replications;
            report();
            if (msg.type === 'result') handlers.onResult(index, msg.result);
            settleOne();
          },
          failed: (message) => {
            handlers.onError(index, message);
            settleOne();
          },
        });
      });
      if (jobs.length === 0) resolve();
      this.pump();
    });
  }

  /** End every thread (queued tasks are dropped). */
  async close(): Promise<void> {
    this.queue.length = 0;
    const workers = this.slots.filter((s): s is Slot => s !== null).map((s) => s.worker);
    this.slots.fill(null);
    await Promise.all(workers.map((w) => w.terminate()));
  }

  /** Hand queued tasks to free threads (starting threads as needed). */
  private pump(): void {
    for (let s = 0; s < this.slots.length && this.queue.length > 0; s++) {
      const slot = this.slots[s] ?? null;
      if (slot?.task) continue;
      let task: Task | undefined;
      while ((task = this.queue.shift()) !== undefined && !task.wanted());
      if (!task) return;
      const live = slot ?? this.start(s);
      live.task = task;
      live.worker.ref();
      live.worker.postMessage(task.msg);
    }
  }

  private start(s: number): Slot {
    const worker = startThread(this.entry);
    const slot: Slot = { worker, task: null };
    this.slots[s] = slot;
    worker.on('message', (msg: FromThread) => {
      const task = slot.task;
      if (!task || msg.id !== task.msg.id) return;
      if (msg.type === 'progress') {
        task.progress(msg.done);
        return;
      }
      slot.task = null;
      worker.unref();
      if (msg.type === 'error') task.failed(msg.message);
      else task.finished(msg);
      this.pump();
    });
    const died = (): void => {
      if (this.slots[s] !== slot) return;
      this.slots[s] = null; // replaced on next use
      const task = slot.task;
      slot.task = null;
      void worker.terminate();
      task?.failed(THREAD_DIED);
      this.pump();
    };
    worker.on('error', died);
    worker.on('exit', died);
    // A thread waiting for work must not keep the command line running (ref'd while it has a task).
    worker.unref();
    return slot;
  }
}

/**
 * Simulate a plan on `workers` threads (the command line's `--workers N`) and end them:
 * bit for bit the result of a one-worker run. See NodeSimulationPool.runPlan for the options.
 * @throws Error for a bad worker count, with the engine's message, or a plain one when a thread died.
 * @example const result = await runPlanOnThreads(plan, { workers: 2 });
 */
export async function runPlanOnThreads(
  plan: Plan,
  options: { workers: number } & Parameters<NodeSimulationPool['runPlan']>[1],
): Promise<SimulationResult> {
  const pool = new NodeSimulationPool(options.workers);
  try {
    return await pool.runPlan(plan, options);
  } finally {
    await pool.close();
  }
}

/**
 * Run many whole simulations (the design explorer's grid cells) on `workers` threads and end
 * them: onResult / onError per job as each finishes, onProgress(done, total) over all replications.
 * @throws Error for a bad worker count (a job's failure goes to onError).
 * @example await runBatchOnThreads(cells, { workers: 3, onResult: (i, r) => …, onError: (i, m) => … });
 */
export async function runBatchOnThreads(
  jobs: readonly { plan: Plan; replications: number; seed: number }[],
  options: {
    workers: number;
    onResult(index: number, result: SimulationResult): void;
    onError(index: number, message: string): void;
    onProgress?(done: number, total: number): void;
  },
): Promise<void> {
  const pool = new NodeSimulationPool(options.workers);
  try {
    await pool.runBatch(jobs, options);
  } finally {
    await pool.close();
  }
}
