import type { FromWorker, ToWorker } from './protocol';
import type { RunTimeEstimate } from './estimateRunSeconds';
import { replicationBlockTransfers } from './replicationBlock';
import { runSimulationInSteps, type StepHost } from './runSimulationInSteps';
import { mergeReplicationBlocks } from './pool/runReplicationRange';
import { runRangeInSteps } from './pool/runRangeInSteps';

/** What the handler needs from the worker it runs in (or from a test's stand-in). */
export interface WorkerHost {
  post(msg: FromWorker, transfer?: ArrayBuffer[]): void;
  /** Give queued messages (cancel, a newer run) a chance to arrive; resolves soon. */
  yieldTick(): Promise<void>;
  now(): number;
}

/**
 * The simulation worker's message handling (src/sim/protocol.ts), apart from
 * the worker itself so tests can run it in-process: 'run' a whole simulation;
 * 'range' part of one and send its block back; 'merge' a run's blocks and send
 * the result; 'cancel'. One task at a time: a newer task supersedes (cancels)
 * an older one, which then sends 'cancelled'. Errors are sent as the engine's
 * researcher-readable message.
 *
 * @param host posting, yielding and the clock.
 * @returns the handler for each message received.
 * @example scope.onmessage = (e) => void handle(e.data);
 */
export function createSimulationWorkerHandler(host: WorkerHost): (msg: ToWorker) => Promise<void> {
  let currentRunId: number | null = null;
  const cancelledIds = new Set<number>();
  const post = host.post;

  return async (msg: ToWorker): Promise<void> => {
    if (msg.type === 'cancel') {
      cancelledIds.add(msg.runId);
      return;
    }
    const runId = msg.runId;
    if (currentRunId !== null && currentRunId !== runId) cancelledIds.add(currentRunId); // newer run supersedes
    currentRunId = runId;
    const stop = (): boolean => cancelledIds.has(runId) || currentRunId !== runId;
    let tooLong: RunTimeEstimate | null = null;
    const stepHost: StepHost = {
      progress: (done, total) => {
        if (!stop()) post({ type: 'progress', runId, done, total });
      },
      yieldTick: () => host.yieldTick(),
      cancelled: stop,
      now: () => host.now(),
      estimate: (estimate) => {
        if (stop()) return false;
        post({ type: 'estimate', runId, estimate });
        if (msg.type === 'run' && msg.maxSeconds !== undefined && estimate.seconds > msg.maxSeconds) {
          tooLong = estimate;
          return false;
        }
        return true;
      },
    };
    try {
      if (msg.type === 'run') {
        const result = await runSimulationInSteps(msg.plan, { replications: msg.replications, seed: msg.seed }, stepHost);
        if (tooLong && !stop()) post({ type: 'too-long', runId, estimate: tooLong });
        else if (result && !stop()) post({ type: 'result', runId, result });
        else post({ type: 'cancelled', runId });
      } else if (msg.type === 'range') {
        const options = { replications: msg.replications, seed: msg.seed };
        const block = await runRangeInSteps(msg.plan, options, msg.from, msg.to, stepHost, msg.pilot === true);
        if (block && !stop()) post({ type: 'block', runId, block }, replicationBlockTransfers(block));
        else post({ type: 'cancelled', runId });
      } else {
        await host.yieldTick(); // a cancel sent right after the merge still gets through
        if (stop()) post({ type: 'cancelled', runId });
        else post({ type: 'result', runId, result: mergeReplicationBlocks(msg.plan, { replications: msg.replications, seed: msg.seed }, msg.blocks) });
      }
    } catch (err) {
      if (!stop()) post({ type: 'error', runId, message: err instanceof Error ? err.message : String(err) });
    } finally {
      cancelledIds.delete(runId);
      if (currentRunId === runId) currentRunId = null;
    }
  };
}
