// A simulation thread of the command line's pool (nodeSimulationPool.ts): it only passes
// messages (threadProtocol.ts); the work is runReplicationRange and the engines.
import { parentPort } from 'node:worker_threads';
// Every design's closed forms, registered in the engine registry (src/core/engineRegistry.ts).
import '../../core/allEngines';
import { createPlanSimulation } from '../multivariate/createPlanSimulation';
import { replicationBlockTransfers } from '../replicationBlock';
import type { SimulationRun } from '../types';
import { runReplicationRange } from './runReplicationRange';
import type { FromThread, ToThread } from './threadProtocol';

const port = parentPort;
if (!port) throw new Error('simulationThread.ts runs only as a worker thread.');

/** The run of the latest 'range' key: a run's later ranges reuse its buffers. */
let cached: { key: number; run: SimulationRun } | null = null;
const post = (msg: FromThread, transfer: ArrayBuffer[] = []): void => port.postMessage(msg, transfer);

port.on('message', (msg: ToThread) => {
  const id = msg.id;
  const progress = (done: number, total: number): void => post({ type: 'progress', id, done, total });
  try {
    const options = { replications: msg.replications, seed: msg.seed };
    if (msg.type === 'range') {
      if (cached === null || cached.key !== msg.key) cached = { key: msg.key, run: createPlanSimulation(msg.plan, options) };
      const block = runReplicationRange(msg.plan, options, msg.from, msg.to, progress, cached.run);
      post({ type: 'block', id, block }, replicationBlockTransfers(block));
    } else {
      cached = null;
      const run = createPlanSimulation(msg.plan, options);
      const chunk = Math.max(1, Math.ceil(run.total / 20));
      for (let i = 0; i < run.total; i += chunk) {
        const to = Math.min(run.total, i + chunk);
        run.runChunk(i, to);
        progress(to, run.total);
      }
      post({ type: 'result', id, result: run.finish() });
    }
  } catch (err) {
    post({ type: 'error', id, message: err instanceof Error ? err.message : String(err) });
  }
});
