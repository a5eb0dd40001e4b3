/// <reference lib="webworker" />
// The simulation worker only passes messages; the engine is runSimulationInSteps.
import type { FromWorker, ToWorker } from './protocol';
import type { RunTimeEstimate } from './estimateRunSeconds';
import { runSimulationInSteps } from './runSimulationInSteps';

const scope = self as unknown as DedicatedWorkerGlobalScope;
let currentRunId: number | null = null;
const cancelledIds = new Set<number>();

const post = (msg: FromWorker): void => scope.postMessage(msg);

// A MessageChannel round trip lets queued messages (cancel, a newer run) be handled between chunks.
const channel = new MessageChannel();
const waiting: (() => void)[] = [];
channel.port1.onmessage = () => waiting.shift()?.();
const yieldTick = (): Promise<void> =>
  new Promise((resolve) => {
    waiting.push(resolve);
    channel.port2.postMessage(0);
  });

scope.onmessage = async (event: MessageEvent<ToWorker>) => {
  const msg = event.data;
  if (msg.type === 'cancel') {
    cancelledIds.add(msg.runId);
    return;
  }
  if (msg.type !== 'run') return;
  const runId = msg.runId;
  if (currentRunId !== null && currentRunId !== runId) cancelledIds.add(currentRunId); // newer run supersedes
  currentRunId = runId;
  const stop = (): boolean => cancelledIds.has(runId) || currentRunId !== runId;
  let tooLong: RunTimeEstimate | null = null;
  try {
    const result = await runSimulationInSteps(
      msg.plan,
      { replications: msg.replications, seed: msg.seed },
      {
        progress: (done, total) => {
          if (!stop()) post({ type: 'progress', runId, done, total });
        },
        yieldTick,
        cancelled: stop,
        now: () => performance.now(),
        estimate: (estimate) => {
          if (stop()) return false;
          post({ type: 'estimate', runId, estimate });
          if (msg.maxSeconds !== undefined && estimate.seconds > msg.maxSeconds) {
            tooLong = estimate;
            return false;
          }
          return true;
        },
      },
    );
    if (tooLong && !stop()) post({ type: 'too-long', runId, estimate: tooLong });
    else if (result && !stop()) post({ type: 'result', runId, result });
    else post({ type: 'cancelled', runId });
  } catch (err) {
    if (!stop()) post({ type: 'error', runId, message: err instanceof Error ? err.message : String(err) });
  } finally {
    cancelledIds.delete(runId);
    if (currentRunId === runId) currentRunId = null;
  }
};
