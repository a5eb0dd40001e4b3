import type { SimulationClient } from '../sim/simulationClient';
import type { QuickFiguresClient } from '../sim/quickFiguresClient';
import type { PlannedProcedureRunner, SimulationRunner } from './deps';

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
    run: async (plan, onProgress, options = {}) =>
      (await get()).run(plan, (done, total) => onProgress(total > 0 ? done / total : 0), options),
    cancel: () => client?.cancel(),
  };
}

/**
 * The quick-figures runner the app uses: the worker client in
 * src/sim/quickFiguresClient (a short seeded simulation of the planned
 * procedure), loaded on first use. A failure resolves with null, so the
 * closed-form figures simply stay on screen.
 */
export function createPlannedProcedureRunner(): PlannedProcedureRunner {
  let client: QuickFiguresClient | null = null;
  return {
    estimate: async (plan) => {
      try {
        if (!client) {
          const m = await import('../sim/quickFiguresClient');
          client ??= new m.QuickFiguresClient();
        }
        return await client.estimate(plan);
      } catch {
        return null;
      }
    },
  };
}
