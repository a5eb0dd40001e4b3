import type { Plan } from '../core/plan';
import type { PlannedProcedureEstimates } from '../core/plannedProcedure';
import type { FromQuickWorker, ToQuickWorker } from './quickFiguresProtocol';

/** Creates the worker; injected so tests can supply a fake. */
export type QuickWorkerFactory = () => Pick<Worker, 'postMessage' | 'terminate'> & {
  onmessage: ((ev: MessageEvent<FromQuickWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
};

const defaultFactory: QuickWorkerFactory = () =>
  new Worker(new URL('./quickFiguresWorker.ts', import.meta.url), { type: 'module' }) as unknown as ReturnType<QuickWorkerFactory>;

/** A quick run still going after this long is abandoned when a newer plan arrives (the worker is restarted). */
export const STALE_AFTER_MS = 400;

interface Waiter {
  plan: Plan;
  resolve: (e: PlannedProcedureEstimates | null) => void;
}

/**
 * Main-thread handle on the quick-figures worker (a short seeded simulation
 * of the planned procedure, estimatePlannedProcedure). Latest wins: while one
 * plan is being estimated, newer requests replace each other and only the
 * newest is sent next; a replaced request resolves with null. A run older
 * than STALE_AFTER_MS when a newer plan arrives is abandoned (the worker is
 * restarted), so a slow quick run never holds up the plan being typed. The worker is
 * created on first use (jsdom has no Worker).
 *
 * @example
 *   const quick = new QuickFiguresClient();
 *   const estimates = await quick.estimate(plan); // null when a newer plan replaced it
 */
export class QuickFiguresClient {
  private worker: ReturnType<QuickWorkerFactory> | null = null;
  private nextId = 1;
  private inFlight: (Waiter & { id: number; sentAt: number }) | null = null;
  private queued: Waiter | null = null;

  constructor(
    private readonly factory: QuickWorkerFactory = defaultFactory,
    private readonly now: () => number = () => performance.now(),
  ) {}

  /**
   * Estimate the planned procedure's figures for `plan`.
   * @returns the estimates, or null when a newer request replaced this one or the worker failed.
   */
  estimate(plan: Plan): Promise<PlannedProcedureEstimates | null> {
    return new Promise((resolve) => {
      this.queued?.resolve(null);
      this.queued = { plan, resolve };
      if (this.inFlight && this.now() - this.inFlight.sentAt > STALE_AFTER_MS) {
        // A slow quick run (huge pools, a wide random-within-caliper search) must not hold up the plan
        // being typed now: drop it and start afresh.
        this.inFlight.resolve(null);
        this.inFlight = null;
        this.worker?.terminate();
        this.worker = null;
      }
      if (!this.inFlight) this.sendNext();
    });
  }

  /** Stop the worker; pending requests resolve with null. */
  dispose(): void {
    this.queued?.resolve(null);
    this.inFlight?.resolve(null);
    this.queued = null;
    this.inFlight = null;
    this.worker?.terminate();
    this.worker = null;
  }

  private sendNext(): void {
    const next = this.queued;
    this.queued = null;
    if (!next) return;
    const worker = this.ensureWorker();
    const id = this.nextId++;
    this.inFlight = { ...next, id, sentAt: this.now() };
    const msg: ToQuickWorker = { type: 'estimate', id, plan: next.plan };
    worker.postMessage(msg);
  }

  private ensureWorker(): ReturnType<QuickWorkerFactory> {
    if (this.worker) return this.worker;
    const w = this.factory();
    w.onmessage = (ev) => {
      const msg = ev.data;
      const current = this.inFlight;
      if (!current || msg.id !== current.id) return;
      this.inFlight = null;
      current.resolve(msg.type === 'estimates' ? msg.estimates : null);
      this.sendNext();
    };
    w.onerror = () => {
      // A failed worker: give up on the request (the formula figures stay shown) and start afresh next time.
      this.inFlight?.resolve(null);
      this.inFlight = null;
      this.worker?.terminate();
      this.worker = null;
      this.sendNext();
    };
    this.worker = w;
    return w;
  }
}
