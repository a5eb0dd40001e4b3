/// <reference lib="webworker" />
// The pilot-data worker only passes messages; reading and estimating are the
// pure functions of src/pilot, called through createPilotRequestHandler.
// Every design's closed forms, registered in the engine registry (src/core/engineRegistry.ts).
import '../core/allEngines';
import { estimatePilot } from './estimatePilot';
import { parseDelimitedText } from './parseDelimitedText';
import { createPilotRequestHandler, type FromPilotWorker, type ToPilotWorker } from './pilotWorkerProtocol';

const scope = self as unknown as DedicatedWorkerGlobalScope;
const handle = createPilotRequestHandler({ parseDelimitedText, estimatePilot });

scope.onmessage = async (event: MessageEvent<ToPilotWorker>) => {
  const reply: FromPilotWorker | null = await handle(event.data);
  if (reply) scope.postMessage(reply);
};
