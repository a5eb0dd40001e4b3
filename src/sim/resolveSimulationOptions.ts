import type { Plan } from '../core/plan';
import type { SimulationOptions } from './types';
import { validateSimulationSettings } from './validateSimulationSettings';

/**
 * A run's replication count and seed: the options given, else the plan's
 * `simulation` block; checked with the plan's other simulation settings
 * (validateSimulationSettings) before either engine allocates anything.
 *
 * @param plan the plan to simulate.
 * @param options replications (whole number 2..1,000,000) and seed (safe integer), each optional.
 * @returns total (replications) and seed.
 * @throws Error naming the field, its valid range and the value given (from validateSimulationSettings).
 * @example resolveSimulationOptions(demoPlan(), { replications: 200 }) // { total: 200, seed: demoPlan().simulation.seed }
 */
export function resolveSimulationOptions(plan: Plan, options: SimulationOptions): { total: number; seed: number } {
  const total = options.replications ?? plan.simulation.replications;
  const seed = options.seed ?? plan.simulation.seed;
  validateSimulationSettings(plan, total, seed);
  return { total, seed };
}
