/// <reference lib="webworker" />
// The quick-figures worker only passes messages; the work is estimatePlannedProcedure.
// Every design's closed forms, registered in the engine registry (src/core/engineRegistry.ts).
import '../core/allEngines';
import { estimatePlannedProcedure } from './estimatePlannedProcedure';
import type { FromQuickWorker, ToQuickWorker } from './quickFiguresProtocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const post = (msg: FromQuickWorker): void => scope.postMessage(msg);

scope.onmessage = (event: MessageEvent<ToQuickWorker>) => {
  const msg = event.data;
  if (msg.type !== 'estimate') return;
  try {
    post({ type: 'estimates', id: msg.id, estimates: estimatePlannedProcedure(msg.plan) });
  } catch (err) {
    post({ type: 'error', id: msg.id, message: err instanceof Error ? err.message : String(err) });
  }
};
