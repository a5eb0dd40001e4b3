// Shared inputs for chart tests: the invented demo plan, its closed-form
// results from core, and a small real simulation (seeded, so deterministic).
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { ChartInput } from '../../src/charts/chartTypes';
import type { SimulationResult } from '../../src/sim/types';

/** Replications for chart tests: enough for Monte Carlo SEs of about 0.06 points, quick to run. */
export const TEST_REPLICATIONS = 300;

let cached: SimulationResult | null = null;

/** The demo plan's closed-form input (no simulation). */
export function closedFormInput(): ChartInput {
  const plan = demoPlan();
  return { plan, analytic: analysePlan(plan), simulation: null };
}

/** The demo plan with a seeded simulation of TEST_REPLICATIONS replications. */
export function simulatedInput(): ChartInput & { simulation: SimulationResult } {
  const plan = demoPlan();
  cached ??= simulatePlan(plan, { replications: TEST_REPLICATIONS, seed: 20261201 });
  return { plan, analytic: analysePlan(plan), simulation: cached };
}
