/// <reference lib="webworker" />
// The simulation worker only passes messages; the handling is createSimulationWorkerHandler
// (whole runs, ranges of a run for the worker pool, merges) and the engine runSimulationInSteps.
// Every design's closed forms, registered in the engine registry (src/core/engineRegistry.ts).
import '../core/allEngines';
import type { FromWorker, ToWorker } from './protocol';
import { createSimulationWorkerHandler } from './workerHandler';

const scope = self as unknown as DedicatedWorkerGlobalScope;

// A MessageChannel round trip lets queued messages (cancel, a newer run) be handled between chunks.
const channel = new MessageChannel();
const waiting: (() => void)[] = [];
channel.port1.onmessage = () => waiting.shift()?.();
const yieldTick = (): Promise<void> =>
  new Promise((resolve) => {
    waiting.push(resolve);
    channel.port2.postMessage(0);
  });

const handle = createSimulationWorkerHandler({
  post: (msg: FromWorker, transfer: ArrayBuffer[] = []) => scope.postMessage(msg, transfer),
  yieldTick,
  now: () => performance.now(),
});

scope.onmessage = (event: MessageEvent<ToWorker>) => {
  void handle(event.data);
};
