import type { Plan } from '../../core/plan';
import type { RunTimeEstimate } from '../estimateRunSeconds';
import type { FromWorker, ToWorker } from '../protocol';
import { replicationBlockTransfers, type ReplicationBlock } from '../replicationBlock';
import { SimulationError, type SilenceLimits, type WorkerFactory } from '../simulationClient';
import type { SimulationResult } from '../types';
import { defaultPoolSize, MAX_POOL_WORKERS } from './defaultPoolSize';
import { parallelRunEstimate } from './parallelRunEstimate';
import { splitReplications } from './splitReplications';

export { defaultPoolSize } from './defaultPoolSize';

/** Fewest replications a single run gives one worker (smaller runs use fewer workers). */
export const MIN_REPLICATIONS_PER_WORKER = 50;

const defaultFactory: WorkerFactory = () =>
  new Worker(new URL('../worker.ts', import.meta.url), { type: 'module' }) as unknown as ReturnType<WorkerFactory>;

type PoolWorker = ReturnType<WorkerFactory>;

/** One message for one worker, and what to do with what comes back. */
interface Task {
  msg: ToWorker & { runId: number };
  transfer: ArrayBuffer[];
  /** Messages of this task (progress, estimate, the end); stale ones never arrive here. */
  handle(msg: FromWorker): 'continue' | 'done';
  /** The worker died, went silent or could not be reached. */
  fail(error: SimulationError): void;
}

interface Slot {
  worker: PoolWorker | null;
  task: Task | null;
  silenceMs: number;
  timer: unknown;
}

/** One job of a batch: a whole simulation (a design-explorer cell). */
export interface BatchJob {
  plan: Plan;
  replications: number;
  seed: number;
}

/** Callbacks of runBatch; none is called after the batch is cancelled. */
export interface BatchHandlers {
  onResult(index: number, result: SimulationResult): void;
  onError(index: number, message: string): void;
  /** Replications done over all jobs, and all jobs' replications. */
  onProgress?(done: number, total: number): void;
}

/**
 * The browser's worker pool (docs/simulation.md, "The worker pool"): N Web
 * Workers, N = defaultPoolSize(navigator.hardwareConcurrency) = cores − 1 (at
 * least 1), created on first use, shared by single runs and batches.
 *
 * - run(plan) has SimulationClient.run's contract. It splits the replications
 *   into contiguous ranges (splitReplications, at least
 *   MIN_REPLICATIONS_PER_WORKER each, so small runs use fewer workers), runs
 *   each on a worker ('range'), and has one worker merge the blocks ('merge'),
 *   so the result is bit for bit that of one worker. The range from 0 times a
 *   pilot; its estimate, shared among the ranges (parallelRunEstimate), goes to
 *   onEstimate and is checked against maxSeconds ('too-long'). A run with one
 *   range is an ordinary 'run' message, exactly as SimulationClient sends it.
 *   A newer run supersedes the older one ('cancelled').
 * - runBatch(jobs) runs whole simulations, each on one worker, queued over the
 *   pool, with a result or error per job as each finishes.
 * - Sharing: a single run's ranges (and its merge) go ahead of queued batch
 *   jobs; jobs already running finish first, so a run started during a grid
 *   waits at most for the cells in hand.
 * - Progress and cancel cover every worker a run or batch uses. A worker that
 *   crashes, sends what the page cannot read or stays silent past the silence
 *   limits (as SimulationClient) fails its run with SimulationClient's plain
 *   messages ('failed', 'stalled'), or its batch job through onError, and is
 *   replaced on next use.
 *
 * @example
 *   const pool = new SimulationPool();
 *   const result = await pool.run(plan, (done, total) => setProgress(done / total));
 */
export class SimulationPool {
  readonly size: number;
  private readonly slots: Slot[];
  private readonly queue: Task[] = [];
  private nextRunId = 1;
  private current: { cancel(): void } | null = null;
  private readonly startMs: number;
  private readonly runningMs: number;
  private readonly setTimer: (fn: () => void, ms: number) => unknown;
  private readonly clearTimer: (handle: unknown) => void;
  private readonly factory: WorkerFactory;

  /**
   * @param options size: workers (whole number 1..64; default defaultPoolSize(navigator.hardwareConcurrency));
   *   factory: creates a worker (tests pass a stand-in); limits: silence limits as SimulationClient's.
   * @throws Error naming the value when size is out of range.
   */
  constructor(options: { size?: number; factory?: WorkerFactory; limits?: SilenceLimits } = {}) {
    const size = options.size ?? defaultPoolSize(typeof navigator === 'undefined' ? undefined : navigator.hardwareConcurrency);
    if (!Number.isInteger(size) || size < 1 || size > MAX_POOL_WORKERS) {
      throw new Error(`The number of simulation workers must be a whole number from 1 to ${MAX_POOL_WORKERS}; got ${String(size)}.`);
    }
    this.size = size;
    this.factory = options.factory ?? defaultFactory;
    const limits = options.limits ?? {};
    this.startMs = limits.startMs ?? 120_000;
    this.runningMs = limits.runningMs ?? 30_000;
    this.setTimer = limits.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
    this.clearTimer = limits.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
    this.slots = Array.from({ length: size }, () => ({ worker: null, task: null, silenceMs: this.startMs, timer: null }));
  }

  /**
   * Simulate `plan` on the pool (SimulationClient.run's contract).
   * @param plan a validated plan (replications and seed from plan.simulation unless given).
   * @param onProgress (done, total) over every worker of the run.
   * @param options replications / seed overrides; maxSeconds: reject 'too-long' when the pilot's
   *   estimate for the pool exceeds it; onEstimate: receives that estimate (once, early).
   * @returns the SimulationResult, bit for bit that of one worker.
   * @throws SimulationError ('failed' with the engine's message or a plain one; 'cancelled'; 'stalled'; 'too-long').
   */
  run(
    plan: Plan,
    onProgress?: (done: number, total: number) => void,
    options: { replications?: number; seed?: number; maxSeconds?: number; onEstimate?: (estimate: RunTimeEstimate) => void } = {},
  ): Promise<SimulationResult> {
    this.cancel();
    if (this.factory === defaultFactory && typeof Worker === 'undefined') {
      return Promise.reject(new SimulationError('This browser cannot run the simulation in the background (no Web Worker support).', 'failed'));
    }
    const replications = options.replications ?? plan.simulation.replications;
    const seed = options.seed ?? plan.simulation.seed;
    const splittable = Number.isInteger(replications) && replications >= 2 * MIN_REPLICATIONS_PER_WORKER;
    const ranges = splittable ? splitReplications(replications, this.size, MIN_REPLICATIONS_PER_WORKER) : [];
    return new Promise<SimulationResult>((resolve, reject) => {
      const tasks: Task[] = [];
      let settled = false;
      const finish = (outcome: { result: SimulationResult } | { error: SimulationError }): void => {
        if (settled) return;
        settled = true;
        if (this.current === handle) this.current = null;
        for (const t of tasks) this.withdraw(t);
        if ('result' in outcome) resolve(outcome.result);
        else reject(outcome.error);
      };
      const handle = { cancel: () => finish({ error: new SimulationError('The simulation was cancelled.', 'cancelled') }) };
      this.current = handle;
      const ended = (msg: FromWorker): 'continue' | 'done' => {
        switch (msg.type) {
          case 'result':
            finish({ result: msg.result });
            return 'done';
          case 'error':
            finish({ error: new SimulationError(msg.message, 'failed') });
            return 'done';
          case 'cancelled':
            finish({ error: new SimulationError('The simulation was cancelled.', 'cancelled') });
            return 'done';
          case 'too-long':
            finish({ error: new SimulationError('The run would take longer than the limit for runs in the browser.', 'too-long', msg.estimate) });
            return 'done';
          default:
            return 'continue';
        }
      };
      const failTask = (error: SimulationError): void => finish({ error });

      if (ranges.length <= 1) {
        // One worker: the ordinary whole-run message, exactly as SimulationClient sends it.
        const { onEstimate, ...settings } = options;
        tasks.push({
          msg: { type: 'run', runId: this.nextRunId++, plan, ...settings },
          transfer: [],
          handle: (msg) => {
            if (msg.type === 'progress') onProgress?.(msg.done, msg.total);
            else if (msg.type === 'estimate') onEstimate?.(msg.estimate);
            return ended(msg);
          },
          fail: failTask,
        });
      } else {
        const done = ranges.map(() => 0);
        const blocks: (ReplicationBlock | null)[] = ranges.map(() => null);
        const report = (): void => onProgress?.(done.reduce((s, d) => s + d, 0), replications);
        ranges.forEach((range, r) => {
          tasks.push({
            msg: { type: 'range', runId: this.nextRunId++, plan, replications, seed, from: range.from, to: range.to, ...(r === 0 ? { pilot: true } : {}) },
            transfer: [],
            handle: (msg) => {
              if (msg.type === 'progress') {
                done[r] = msg.done;
                report();
                return 'continue';
              }
              if (msg.type === 'estimate') {
                const estimate = parallelRunEstimate(msg.estimate, ranges.length);
                options.onEstimate?.(estimate);
                if (options.maxSeconds !== undefined && estimate.seconds > options.maxSeconds) {
                  finish({ error: new SimulationError('The run would take longer than the limit for runs in the browser.', 'too-long', estimate) });
                  return 'done';
                }
                return 'continue';
              }
              if (msg.type === 'block') {
                blocks[r] = msg.block;
                done[r] = range.to - range.from;
                report();
                if (blocks.every((b) => b !== null)) this.mergeLater(plan, replications, seed, blocks as ReplicationBlock[], tasks, ended, failTask);
                return 'done';
              }
              return ended(msg);
            },
            fail: failTask,
          });
        });
      }
      // A single run goes ahead of queued batch jobs (in its own order).
      this.queue.unshift(...tasks);
      this.pump();
    });
  }

  /** Cancel the current single run, if any (its promise rejects with reason 'cancelled'). */
  cancel(): void {
    this.current?.cancel();
  }

  /** Whether a single run is in progress. */
  get busy(): boolean {
    return this.current !== null;
  }

  /**
   * Run many whole simulations (grid cells), each on one worker, queued over the pool.
   * @returns done (resolves when every job has finished or failed, or the batch was cancelled;
   *   never rejects) and cancel (stops every queued and running job of this batch; no callbacks after it).
   */
  runBatch(jobs: readonly BatchJob[], handlers: BatchHandlers): { done: Promise<void>; cancel(): void } {
    const total = jobs.reduce((s, j) => s + j.replications, 0);
    const done = jobs.map(() => 0);
    const tasks: Task[] = [];
    let open = jobs.length;
    let cancelled = false;
    let resolveDone: () => void = () => undefined;
    const donePromise = new Promise<void>((resolve) => {
      resolveDone = resolve;
    });
    const report = (): void => {
      if (!cancelled) handlers.onProgress?.(done.reduce((s, d) => s + d, 0), total);
    };
    const settleOne = (): void => {
      open--;
      if (open === 0) resolveDone();
    };
    if (jobs.length === 0) resolveDone();
    jobs.forEach((job, index) => {
      tasks.push({
        msg: { type: 'run', runId: this.nextRunId++, plan: job.plan, replications: job.replications, seed: job.seed },
        transfer: [],
        handle: (msg) => {
          if (cancelled) return 'done';
          switch (msg.type) {
            case 'progress':
              done[index] = msg.done;
              report();
              return 'continue';
            case 'result':
              done[index] = job.replications;
              report();
              handlers.onResult(index, msg.result);
              settleOne();
              return 'done';
            case 'error':
              handlers.onError(index, msg.message);
              settleOne();
              return 'done';
            case 'cancelled':
            case 'too-long':
              handlers.onError(index, 'The simulation was cancelled.');
              settleOne();
              return 'done';
            default:
              return 'continue';
          }
        },
        fail: (error) => {
          if (cancelled) return;
          handlers.onError(index, error.message);
          settleOne();
        },
      });
    });
    this.queue.push(...tasks);
    this.pump();
    return {
      done: donePromise,
      cancel: () => {
        if (cancelled) return;
        cancelled = true;
        for (const t of tasks) this.withdraw(t);
        resolveDone();
      },
    };
  }

  /** Stop every worker for good (e.g. when the page closes); the current run is cancelled. */
  dispose(): void {
    this.cancel();
    const stopped = new SimulationError('The simulation was cancelled.', 'cancelled');
    const queued = this.queue.splice(0);
    for (const slot of this.slots) this.abandon(slot, stopped);
    for (const task of queued) task.fail(stopped);
  }

  /** Once every block is in: a merge task at the front of the queue (blocks' buffers transferred). */
  private mergeLater(
    plan: Plan,
    replications: number,
    seed: number,
    blocks: ReplicationBlock[],
    tasks: Task[],
    ended: (msg: FromWorker) => 'continue' | 'done',
    fail: (error: SimulationError) => void,
  ): void {
    const task: Task = {
      msg: { type: 'merge', runId: this.nextRunId++, plan, replications, seed, blocks },
      transfer: blocks.flatMap(replicationBlockTransfers),
      handle: ended,
      fail,
    };
    tasks.push(task);
    this.queue.unshift(task);
    // pump() runs after the block's handler returns (the slot is freed first).
  }

  /** Take a task out of the queue, or stop it on its worker (which is then free at once). */
  private withdraw(task: Task): void {
    const q = this.queue.indexOf(task);
    if (q >= 0) {
      this.queue.splice(q, 1);
      return;
    }
    const slot = this.slots.find((s) => s.task === task);
    if (!slot) return;
    this.release(slot);
    try {
      slot.worker?.postMessage({ type: 'cancel', runId: task.msg.runId } satisfies ToWorker);
    } catch {
      this.abandon(slot, null);
    }
    queueMicrotask(() => this.pump());
  }

  /** Hand queued tasks to free workers (creating workers as needed). */
  private pump(): void {
    for (const slot of this.slots) {
      if (this.queue.length === 0) return;
      if (slot.task) continue;
      const task = this.queue.shift() as Task;
      let worker: PoolWorker;
      try {
        worker = slot.worker ?? this.create(slot);
      } catch (err) {
        task.fail(err instanceof SimulationError ? err : new SimulationError(`Could not start the simulation: ${err instanceof Error ? err.message : String(err)}`, 'failed'));
        continue;
      }
      slot.task = task;
      slot.silenceMs = this.startMs;
      try {
        worker.postMessage(task.msg, task.transfer);
        this.watch(slot);
      } catch (err) {
        this.release(slot);
        task.fail(new SimulationError(`Could not start the simulation: ${err instanceof Error ? err.message : String(err)}`, 'failed'));
      }
    }
  }

  private create(slot: Slot): PoolWorker {
    if (this.factory === defaultFactory && typeof Worker === 'undefined') {
      throw new SimulationError('This browser cannot run the simulation in the background (no Web Worker support).', 'failed');
    }
    const w = this.factory();
    w.onmessage = (ev) => this.receive(slot, w, ev.data);
    w.onerror = (ev) => {
      this.abandon(slot, new SimulationError(`The simulation stopped unexpectedly${ev.message ? `: ${ev.message}` : ''}.`, 'failed'));
    };
    w.onmessageerror = () => {
      this.abandon(
        slot,
        new SimulationError(
          'The simulation sent back a message this page could not read, so its results are lost. Run it again; if this keeps happening, reload the page.',
          'failed',
        ),
      );
    };
    slot.worker = w;
    return w;
  }

  private receive(slot: Slot, worker: PoolWorker, msg: FromWorker): void {
    const task = slot.task;
    if (slot.worker !== worker || !task || msg.runId !== task.msg.runId) return; // stale: a withdrawn task
    if (msg.type === 'estimate') slot.silenceMs = Math.max(this.runningMs, 10_000 * msg.estimate.secondsPerReplication);
    // A task's last message frees its worker before anything else happens (nothing to cancel there).
    const last = msg.type !== 'progress' && msg.type !== 'estimate';
    if (last) this.release(slot);
    if (task.handle(msg) === 'done' || last) {
      if (slot.task === task) this.release(slot);
      this.pump();
    } else if (slot.task === task) this.watch(slot);
  }

  /** Free a slot: no task, no silence timer. */
  private release(slot: Slot): void {
    slot.task = null;
    if (slot.timer !== null) this.clearTimer(slot.timer);
    slot.timer = null;
  }

  /** Give up on a slot's worker (crashed, unreadable or silent): its task fails; a fresh worker next time. */
  private abandon(slot: Slot, error: SimulationError | null): void {
    const task = slot.task;
    this.release(slot);
    slot.worker?.terminate();
    slot.worker = null;
    if (task && error) task.fail(error);
    this.pump();
  }

  /** (Re)start a busy slot's silence timer. */
  private watch(slot: Slot): void {
    if (slot.timer !== null) this.clearTimer(slot.timer);
    const task = slot.task;
    slot.timer = this.setTimer(() => {
      if (slot.task !== task) return;
      const seconds = Math.round(slot.silenceMs / 1000);
      this.abandon(
        slot,
        new SimulationError(
          `The simulation stopped responding: nothing was heard from it for ${seconds} s, so the browser has most likely ended it (for example to free memory). No results were kept from this run. Run it again; if it stops again, try fewer replications or smaller pools, or run the plan from the command line.`,
          'stalled',
        ),
      );
    }, slot.silenceMs);
  }
}
