import type { SimulationClient } from '../sim/simulationClient';
import type { SimulationRunner } from './deps';

/**
 * The simulation runner the app uses: the Web Worker client in
 * src/sim/simulationClient, loaded on first use so the page opens without
 * waiting for the engine. Progress is passed on as a share, done / total.
 */
export function createSimulationRunner(): SimulationRunner {
  let client: SimulationClient | null = null;
  const get = async (): Promise<SimulationClient> => {
    if (!client) {
      const m = await import('../sim/simulationClient');
      client = new m.SimulationClient();
    }
    return client;
  };
  return {
    run: async (plan, onProgress) => (await get()).run(plan, (done, total) => onProgress(total > 0 ? done / total : 0)),
    cancel: () => client?.cancel(),
  };
}
