import type { Plan } from '../core/plan';
import type { FromWorker, ToWorker } from './protocol';
import type { SimulationResult } from './types';

/** Why a run's promise was rejected: 'cancelled' (by cancel() or a newer run) or 'failed'. */
export class SimulationError extends Error {
  constructor(
    message: string,
    readonly reason: 'cancelled' | 'failed',
  ) {
    super(message);
    this.name = 'SimulationError';
  }
}

/** Creates the worker; injected so tests can supply a fake. */
export type WorkerFactory = () => Pick<Worker, 'postMessage' | 'terminate'> & {
  onmessage: ((ev: MessageEvent<FromWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
};

const defaultFactory: WorkerFactory = () =>
  new Worker(new URL('./worker.ts', import.meta.url), { type: 'module' }) as unknown as ReturnType<WorkerFactory>;

interface Pending {
  runId: number;
  resolve: (r: SimulationResult) => void;
  reject: (e: SimulationError) => void;
  onProgress?: (done: number, total: number) => void;
}

/**
 * Main-thread handle on the simulation worker. The worker is created lazily
 * on the first run (jsdom has no Worker). One run at a time: starting a new
 * run cancels the previous one, whose promise rejects with reason 'cancelled'.
 * Rejection messages are written for researchers and can be shown as they are.
 *
 * @example
 *   const client = new SimulationClient();
 *   const result = await client.run(plan, (done, total) => setProgress(done / total));
 */
export class SimulationClient {
  private worker: ReturnType<WorkerFactory> | null = null;
  private nextRunId = 1;
  private pending: Pending | null = null;

  constructor(private readonly factory: WorkerFactory = defaultFactory) {}

  /**
   * Simulate `plan` in the worker.
   * @param plan a validated plan (replications and seed from plan.simulation unless given).
   * @param onProgress called with (done, total) at least every 5% or 100 ms.
   * @returns the SimulationResult.
   * @throws SimulationError ('failed' with the engine's message; 'cancelled').
   */
  run(
    plan: Plan,
    onProgress?: (done: number, total: number) => void,
    options: { replications?: number; seed?: number } = {},
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
      this.pending = { runId, resolve, reject, onProgress };
      const msg: ToWorker = { type: 'run', runId, plan, ...options };
      try {
        worker.postMessage(msg);
      } catch (err) {
        this.pending = null;
        reject(new SimulationError(`Could not start the simulation: ${err instanceof Error ? err.message : String(err)}`, 'failed'));
      }
    });
  }

  /** Cancel the current run, if any (its promise rejects with reason 'cancelled'). */
  cancel(): void {
    const p = this.pending;
    if (!p) return;
    this.pending = null;
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
      const p = this.pending;
      this.pending = null;
      this.worker?.terminate();
      this.worker = null; // a fresh worker next time
      p?.reject(new SimulationError(`The simulation stopped unexpectedly${ev.message ? `: ${ev.message}` : ''}.`, 'failed'));
    };
    this.worker = w;
    return w;
  }

  private handle(msg: FromWorker): void {
    const p = this.pending;
    if (!p || msg.runId !== p.runId) return; // a stale message from a cancelled run
    switch (msg.type) {
      case 'progress':
        p.onProgress?.(msg.done, msg.total);
        return;
      case 'result':
        this.pending = null;
        p.resolve(msg.result);
        return;
      case 'error':
        this.pending = null;
        p.reject(new SimulationError(msg.message, 'failed'));
        return;
      case 'cancelled':
        this.pending = null;
        p.reject(new SimulationError('The simulation was cancelled.', 'cancelled'));
        return;
    }
  }
}
