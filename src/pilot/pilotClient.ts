/**
 * Main-thread side of pilot-data reading. The browser reads and estimates in
 * a Web Worker (src/pilot/pilotWorker.ts) so a large file never freezes the
 * page; where there is no Worker (jsdom in tests, very old browsers) the same
 * request handler runs in the page. Either way the rows stay where they were
 * read: the caller sees a summary for the mapping step and the estimates.
 */
import type { FromPilotWorker, PilotErrorData, PilotFunctions, PilotTableSummary, ToPilotWorker } from './pilotWorkerProtocol';
import { PilotDataError, type ParseOptions, type PilotEstimates, type PilotMapping } from './types';

/** What the planner's store needs from a pilot reader. */
export interface PilotReader {
  /** Read a file (or its text) and keep its table; resolves with the summary for the mapping step. */
  read(file: Blob | string, fileName: string, options: ParseOptions): Promise<PilotTableSummary>;
  /** Estimate from the table of the last file read. */
  estimate(mapping: PilotMapping): Promise<PilotEstimates>;
  /** Drop the kept table. */
  forget(): void;
}

/** Creates the worker; injected so tests can supply a fake. */
export type PilotWorkerFactory = () => Pick<Worker, 'postMessage' | 'terminate'> & {
  onmessage: ((ev: MessageEvent<FromPilotWorker>) => void) | null;
  onerror: ((ev: ErrorEvent) => void) | null;
};

const defaultFactory: PilotWorkerFactory = () =>
  new Worker(new URL('./pilotWorker.ts', import.meta.url), { type: 'module' }) as unknown as ReturnType<PilotWorkerFactory>;

/** A failure reported as plain data, back as an Error (a PilotDataError when it carries a code). */
export function errorFromData(e: PilotErrorData): Error {
  if (e.code) return new PilotDataError(e.code, e.message, { column: e.column, row: e.row });
  const err = new Error(e.message);
  err.name = e.name;
  return err;
}

interface Pending {
  resolve: (msg: FromPilotWorker) => void;
  reject: (e: Error) => void;
}

/**
 * The pilot worker's main-thread handle. The worker is created on first use
 * and kept (it holds the table between reading and estimating).
 *
 * @example
 *   const client = new PilotClient();
 *   const summary = await client.read(file, file.name, { delimiter: 'auto', header: 'auto' });
 *   const estimates = await client.estimate(mapping);
 */
export class PilotClient implements PilotReader {
  private worker: ReturnType<PilotWorkerFactory> | null = null;
  private nextId = 1;
  private readonly pending = new Map<number, Pending>();

  constructor(private readonly factory: PilotWorkerFactory = defaultFactory) {}

  async read(file: Blob | string, fileName: string, options: ParseOptions): Promise<PilotTableSummary> {
    const reply = await this.request((requestId) => ({ type: 'read', requestId, file, fileName, options }));
    if (reply.type !== 'read') throw new Error('The pilot reader answered out of turn; please choose the file again.');
    return reply.summary;
  }

  async estimate(mapping: PilotMapping): Promise<PilotEstimates> {
    const reply = await this.request((requestId) => ({ type: 'estimate', requestId, mapping }));
    if (reply.type !== 'estimates') throw new Error('The pilot reader answered out of turn; please estimate again.');
    return reply.estimates;
  }

  forget(): void {
    this.worker?.postMessage({ type: 'forget' } satisfies ToPilotWorker);
  }

  /** Stop the worker for good. Requests still waiting are rejected. */
  dispose(): void {
    this.worker?.terminate();
    this.worker = null;
    this.failAll(new Error('The pilot reader was closed.'));
  }

  private request(make: (requestId: number) => ToPilotWorker): Promise<FromPilotWorker> {
    let worker: ReturnType<PilotWorkerFactory>;
    try {
      worker = this.ensureWorker();
    } catch (err) {
      return Promise.reject(new Error(`Could not start the pilot reader: ${err instanceof Error ? err.message : String(err)}`));
    }
    const requestId = this.nextId++;
    return new Promise<FromPilotWorker>((resolve, reject) => {
      this.pending.set(requestId, { resolve, reject });
      try {
        worker.postMessage(make(requestId));
      } catch (err) {
        this.pending.delete(requestId);
        reject(new Error(`Could not send the file to the pilot reader: ${err instanceof Error ? err.message : String(err)}`));
      }
    });
  }

  private ensureWorker(): ReturnType<PilotWorkerFactory> {
    if (this.worker) return this.worker;
    const w = this.factory();
    w.onmessage = (ev) => this.handle(ev.data);
    w.onerror = (ev) => {
      this.worker?.terminate();
      this.worker = null; // a fresh worker next time; its table is gone, so the file must be read again
      this.failAll(new Error(`The pilot reader stopped unexpectedly${ev.message ? `: ${ev.message}` : ''}. Please choose the file again.`));
    };
    this.worker = w;
    return w;
  }

  private failAll(err: Error): void {
    const all = [...this.pending.values()];
    this.pending.clear();
    for (const p of all) p.reject(err);
  }

  private handle(msg: FromPilotWorker): void {
    const p = this.pending.get(msg.requestId);
    if (!p) return;
    this.pending.delete(msg.requestId);
    if (msg.type === 'error') p.reject(errorFromData(msg.error));
    else p.resolve(msg);
  }
}

/**
 * A reader that runs the same request handler in the page (no worker). For
 * jsdom and browsers without Web Workers; a very large file then blocks the
 * page while it is read.
 * @param load resolves with the pure functions (loaded on first use).
 */
export function createInPagePilotReader(load: () => Promise<PilotFunctions>): PilotReader {
  let handler: ((msg: ToPilotWorker) => Promise<FromPilotWorker | null>) | null = null;
  let nextId = 1;
  const send = async (msg: ToPilotWorker): Promise<FromPilotWorker> => {
    if (!handler) {
      const [{ createPilotRequestHandler }, fns] = await Promise.all([import('./pilotWorkerProtocol'), load()]);
      handler ??= createPilotRequestHandler(fns);
    }
    const reply = await handler(msg);
    if (!reply) throw new Error('A newer pilot file was chosen while this one was being read.');
    if (reply.type === 'error') throw errorFromData(reply.error);
    return reply;
  };
  return {
    read: async (file, fileName, options) => {
      const reply = await send({ type: 'read', requestId: nextId++, file, fileName, options });
      if (reply.type !== 'read') throw new Error('The pilot reader answered out of turn; please choose the file again.');
      return reply.summary;
    },
    estimate: async (mapping) => {
      const reply = await send({ type: 'estimate', requestId: nextId++, mapping });
      if (reply.type !== 'estimates') throw new Error('The pilot reader answered out of turn; please estimate again.');
      return reply.estimates;
    },
    forget: () => void handler?.({ type: 'forget' }),
  };
}

/** The pure functions from src/pilot, loaded on first use (they bring the CSV parser). */
export const loadPilotFunctions = async (): Promise<PilotFunctions> => {
  const [{ parseDelimitedText }, { estimatePilot }] = await Promise.all([import('./parseDelimitedText'), import('./estimatePilot')]);
  return { parseDelimitedText, estimatePilot };
};

/** The reader the app uses: the worker when the browser has one, else the in-page reader. */
export function createPilotReader(): PilotReader {
  if (typeof Worker !== 'undefined') return new PilotClient();
  return createInPagePilotReader(loadPilotFunctions);
}
