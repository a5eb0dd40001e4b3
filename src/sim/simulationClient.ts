import type { Plan } from '../core/plan';
import type { FromWorker, ToWorker } from './protocol';
import type { RunTimeEstimate } from './estimateRunSeconds';
import type { SimulationResult } from './types';

/**
 * Why a run's promise was rejected: 'cancelled' (by cancel() or a newer run), 'failed' (the
 * engine's message, or the worker crashed or sent something unreadable), 'stalled' (nothing
 * heard from the worker for too long: it was most likely ended by the browser) or 'too-long'
 * (the timed pilot's estimate exceeds the run's maxSeconds; `estimate` says by how much).
 */
export class SimulationError extends Error {
  constructor(
    message: string,
    readonly reason: 'cancelled' | 'failed' | 'stalled' | 'too-long',
    readonly estimate?: RunTimeEstimate,
  ) {
    super(message);
    this.name = 'SimulationError';
  }
}

/** How long the client waits without a word from the worker before it calls the run stalled. */
export interface SilenceLimits {
  /** Before the run-time estimate arrives (the first replication may be slow): default 120,000 ms. */
  startMs?: number;
  /** After it: at least this (default 30,000 ms), or 10 replications' estimated time if longer. */
  runningMs?: number;
  /** Timer functions (injected for tests); default setTimeout / clearTimeout. */
  setTimer?: (fn: () => void, ms: number) => unknown;
  clearTimer?: (handle: unknown) => void;
}

/** Creates the worker; injected so tests can supply a fake. */
export type WorkerFactory = () => Pick<Worker, 'postMessage' | 'terminate'> & {
  onmessage: ((ev: MessageEvent<FromWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
  onmessageerror?: ((ev: MessageEvent) => void) | null;
};

const defaultFactory: WorkerFactory = () =>
  new Worker(new URL('./worker.ts', import.meta.url), { type: 'module' }) as unknown as ReturnType<WorkerFactory>;

interface Pending {
  runId: number;
  resolve: (r: SimulationResult) => void;
  reject: (e: SimulationError) => void;
  onProgress?: (done: number, total: number) => void;
  onEstimate?: (estimate: RunTimeEstimate) => void;
  /** Current allowance of silence, ms. */
  silenceMs: number;
  timer: unknown;
}

/**
 * Main-thread handle on the simulation worker. The worker is created lazily
 * on the first run (jsdom has no Worker). One run at a time: starting a new
 * run cancels the previous one, whose promise rejects with reason 'cancelled'.
 * Rejection messages are written for researchers and can be shown as they are.
 *
 * A worker that ends without a word (terminated by the browser, out of memory)
 * or sends a message the page cannot read would otherwise leave a run
 * "running" for ever: the client rejects with 'failed' on the worker's error
 * and messageerror events, and with 'stalled' when nothing (progress, the
 * estimate, a result) has arrived within the silence limits: the worker
 * reports at least every 100 ms between replications, so only a dead worker
 * or a replication many times slower than its estimate stays silent that long.
 * Either way the worker is replaced on the next run.
 *
 * @example
 *   const client = new SimulationClient();
 *   const result = await client.run(plan, (done, total) => setProgress(done / total));
 */
export class SimulationClient {
  private worker: ReturnType<WorkerFactory> | null = null;
  private nextRunId = 1;
  private pending: Pending | null = null;

  private readonly startMs: number;
  private readonly runningMs: number;
  private readonly setTimer: (fn: () => void, ms: number) => unknown;
  private readonly clearTimer: (handle: unknown) => void;

  constructor(
    private readonly factory: WorkerFactory = defaultFactory,
    limits: SilenceLimits = {},
  ) {
    this.startMs = limits.startMs ?? 120_000;
    this.runningMs = limits.runningMs ?? 30_000;
    this.setTimer = limits.setTimer ?? ((fn, ms) => setTimeout(fn, ms));
    this.clearTimer = limits.clearTimer ?? ((h) => clearTimeout(h as ReturnType<typeof setTimeout>));
  }

  /**
   * Simulate `plan` in the worker.
   * @param plan a validated plan (replications and seed from plan.simulation unless given).
   * @param onProgress called with (done, total) at least every 5% or 100 ms.
   * @param options replications / seed overrides; maxSeconds: stop after the timed pilot when the
   *   estimate exceeds it (reject 'too-long'); onEstimate: receives the estimate (once, early).
   * @returns the SimulationResult.
   * @throws SimulationError ('failed' with the engine's message; 'cancelled'; 'stalled'; 'too-long').
   */
  run(
    plan: Plan,
    onProgress?: (done: number, total: number) => void,
    options: { replications?: number; seed?: number; maxSeconds?: number; onEstimate?: (estimate: RunTimeEstimate) => void } = {},
  ): Promise<SimulationResult> {
    this.cancel();
    let worker: ReturnType<WorkerFactory>;
    try {
      worker = this.ensureWorker();
    } catch (err) {
      return Promise.reject(
        err instanceof SimulationError ? err : new SimulationError(`Could not start the simulation: ${String(err)}`, 'failed'),
      );
    }
    const runId = this.nextRunId++;
    return new Promise<SimulationResult>((resolve, reject) => {
      const { onEstimate, ...settings } = options;
      const pending: Pending = { runId, resolve, reject, onProgress, onEstimate, silenceMs: this.startMs, timer: null };
      this.pending = pending;
      const msg: ToWorker = { type: 'run', runId, plan, ...settings };
      try {
        worker.postMessage(msg);
        this.watch(pending);
      } catch (err) {
        this.settle();
        reject(new SimulationError(`Could not start the simulation: ${err instanceof Error ? err.message : String(err)}`, 'failed'));
      }
    });
  }

  /** Cancel the current run, if any (its promise rejects with reason 'cancelled'). */
  cancel(): void {
    const p = this.settle();
    if (!p) return;
    this.worker?.postMessage({ type: 'cancel', runId: p.runId } satisfies ToWorker);
    p.reject(new SimulationError('The simulation was cancelled.', 'cancelled'));
  }

  /** Whether a run is in progress. */
  get busy(): boolean {
    return this.pending !== null;
  }

  /** Stop the worker for good (e.g. when the page closes). */
  dispose(): void {
    this.cancel();
    this.worker?.terminate();
    this.worker = null;
  }

  private ensureWorker(): ReturnType<WorkerFactory> {
    if (this.worker) return this.worker;
    if (this.factory === defaultFactory && typeof Worker === 'undefined') {
      throw new SimulationError('This browser cannot run the simulation in the background (no Web Worker support).', 'failed');
    }
    const w = this.factory();
    w.onmessage = (ev) => this.handle(ev.data);
    w.onerror = (ev) => {
      this.abandon(new SimulationError(`The simulation stopped unexpectedly${ev.message ? `: ${ev.message}` : ''}.`, 'failed'));
    };
    w.onmessageerror = () => {
      this.abandon(
        new SimulationError(
          'The simulation sent back a message this page could not read, so its results are lost. Run it again; if this keeps happening, reload the page.',
          'failed',
        ),
      );
    };
    this.worker = w;
    return w;
  }

  /** Clear the pending run and its silence timer; returns what was pending. */
  private settle(): Pending | null {
    const p = this.pending;
    this.pending = null;
    if (p && p.timer !== null) this.clearTimer(p.timer);
    return p;
  }

  /** Give up on the worker (crashed, unreadable or silent): a fresh one next time. */
  private abandon(error: SimulationError): void {
    const p = this.settle();
    this.worker?.terminate();
    this.worker = null;
    p?.reject(error);
  }

  /** (Re)start the silence timer of a pending run. */
  private watch(p: Pending): void {
    if (p.timer !== null) this.clearTimer(p.timer);
    p.timer = this.setTimer(() => {
      if (this.pending !== p) return;
      const seconds = Math.round(p.silenceMs / 1000);
      this.abandon(
        new SimulationError(
          `The simulation stopped responding: nothing was heard from it for ${seconds} s, so the browser has most likely ended it (for example to free memory). No results were kept from this run. Run it again; if it stops again, try fewer replications or smaller pools, or run the plan from the command line.`,
          'stalled',
        ),
      );
    }, p.silenceMs);
  }

  private handle(msg: FromWorker): void {
    const p = this.pending;
    if (!p || msg.runId !== p.runId) return; // a stale message from a cancelled run
    switch (msg.type) {
      case 'progress':
        this.watch(p);
        p.onProgress?.(msg.done, msg.total);
        return;
      case 'estimate':
        p.silenceMs = Math.max(this.runningMs, 10_000 * msg.estimate.secondsPerReplication);
        this.watch(p);
        p.onEstimate?.(msg.estimate);
        return;
      case 'too-long':
        this.settle();
        p.reject(new SimulationError('The run would take longer than the limit for runs in the browser.', 'too-long', msg.estimate));
        return;
      case 'result':
        this.settle();
        p.resolve(msg.result);
        return;
      case 'error':
        this.settle();
        p.reject(new SimulationError(msg.message, 'failed'));
        return;
      case 'cancelled':
        this.settle();
        p.reject(new SimulationError('The simulation was cancelled.', 'cancelled'));
        return;
    }
  }
}
