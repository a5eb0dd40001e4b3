import type { FromWorker, ToWorker } from '../../../src/sim/protocol';
import type { WorkerFactory } from '../../../src/sim/simulationClient';
import { createSimulationWorkerHandler } from '../../../src/sim/workerHandler';

/**
 * Stand-in Web Workers for the pool tests (Node and jsdom have no Worker): each
 * runs the real worker's message handling (createSimulationWorkerHandler) in
 * this thread, with messages copied both ways as postMessage copies them
 * (structuredClone) and delivered asynchronously, so cancels interleave with
 * chunks as in a browser. `hold` makes workers swallow messages (never answer);
 * `now` replaces the clock the pilot is timed with.
 */
export function inProcessWorkers(opts: { hold?: boolean; now?: () => number } = {}) {
  const sent: { worker: number; msg: ToWorker }[] = [];
  const workers: ReturnType<WorkerFactory>[] = [];
  let terminated = 0;
  const factory: WorkerFactory = () => {
    const index = workers.length;
    let alive = true;
    const w: ReturnType<WorkerFactory> = {
      onmessage: null,
      onerror: null,
      onmessageerror: null,
      terminate: () => {
        alive = false;
        terminated++;
      },
      postMessage: (msg: ToWorker) => {
        sent.push({ worker: index, msg });
        if (opts.hold) return;
        const copy = structuredClone(msg);
        setTimeout(() => {
          if (alive) void handle(copy);
        }, 0);
      },
    };
    const handle = createSimulationWorkerHandler({
      post: (msg: FromWorker) => {
        const copy = structuredClone(msg);
        setTimeout(() => {
          if (alive) w.onmessage?.({ data: copy } as MessageEvent<FromWorker>);
        }, 0);
      },
      yieldTick: () => new Promise((resolve) => setTimeout(resolve, 0)),
      now: opts.now ?? (() => performance.now()),
    });
    workers.push(w);
    return w;
  };
  return { factory, sent, workers, terminated: () => terminated, types: () => sent.map((s) => s.msg.type) };
}
