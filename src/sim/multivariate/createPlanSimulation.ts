import { usesCovariateModel } from '../../core/multivariate/covariateModel';
import type { Plan } from '../../core/plan';
import { createSimulation, type SimulationOptions, type SimulationRun } from '../createSimulation';
import { createMultivariateSimulation } from './createMultivariateSimulation';

/**
 * The Monte Carlo engine a plan needs: the several-covariate engine
 * (createMultivariateSimulation) when the plan lists covariates or matches on
 * a propensity score or Mahalanobis distance (usesCovariateModel), otherwise
 * the one-pretest engine (createSimulation), untouched, so a plan without
 * covariates gives exactly the numbers it always gave.
 *
 * @param plan a validated plan.
 * @param options replications and seed (defaults: plan.simulation).
 * @returns the stepping interface of the chosen engine.
 * @throws Error with a researcher-readable message for invalid settings or inputs (from either engine).
 * @example createPlanSimulation(demoPlan()) // the one-pretest engine: demoPlan has no covariates
 */
export function createPlanSimulation(plan: Plan, options: SimulationOptions = {}): SimulationRun {
  return usesCovariateModel(plan) ? createMultivariateSimulation(plan, options) : createSimulation(plan, options);
}
