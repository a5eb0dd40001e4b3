import type { SimulationRunner } from './deps';

/**
 * The simulation runner the app uses: the Web Worker client in
 * src/sim/simulationClient, loaded on first use so the page opens without
 * waiting for the engine.
 */
export function createSimulationRunner(): SimulationRunner {
  const modules = import.meta.glob<Record<string, unknown>>('../sim/simulationClient.ts');
  const loader = modules['../sim/simulationClient.ts'];
  let client: SimulationRunner | null = null;
  const get = async (): Promise<SimulationRunner> => {
    if (client) return client;
    if (!loader) throw new Error('the simulation engine is not part of this build.');
    const m = await loader();
    client = pickClient(m);
    return client;
  };
  return {
    run: async (plan, onProgress) => (await get()).run(plan, onProgress),
    cancel: () => client?.cancel(),
  };
}

/** Find the run/cancel client among the module's exports. */
function pickClient(m: Record<string, unknown>): SimulationRunner {
  const isRunner = (x: unknown): x is SimulationRunner =>
    typeof x === 'object' && x !== null && typeof (x as SimulationRunner).run === 'function' && typeof (x as SimulationRunner).cancel === 'function';
  for (const v of Object.values(m)) if (isRunner(v)) return v;
  throw new Error('the simulation engine could not be started.');
}
