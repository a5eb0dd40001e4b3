import { studyDesign } from '../../core/design/studyDesign';
import { usesCovariateModel } from '../../core/multivariate/covariateModel';
import type { Plan } from '../../core/plan';
import { createSimulation, type SimulationOptions, type SimulationRun } from '../createSimulation';
import { createPoolsSimulation } from '../design/createPoolsSimulation';
import { selectionPoolDrawer } from '../design/selectionPoolDrawer';
import { clusterPoolDrawer } from '../design/clusterPoolDrawer';
import { createMultivariateSimulation } from './createMultivariateSimulation';

/**
 * The Monte Carlo engine a plan needs (the engine's side of the design seam,
 * src/core/design/studyDesign.ts):
 *  - a selection design (a rule picked the programme from one population, or a
 *    one-group study): the pools engine with the selection drawer
 *    (createPoolsSimulation + selectionPoolDrawer);
 *  - two existing groups with covariates, or matching on a propensity score or
 *    Mahalanobis distance (usesCovariateModel): the several-covariate engine
 *    (createMultivariateSimulation);
 *  - people in clusters (a clusters section): the pools engine with the
 *    cluster drawer (createPoolsSimulation + clusterPoolDrawer);
 *  - every other plan: the one-pretest engine (createSimulation), untouched, so
 *    a plan without covariates gives exactly the numbers it always gave.
 * A new design adds a pool drawer (src/sim/design/) and one case here.
 *
 * @param plan a validated plan.
 * @param options replications and seed (defaults: plan.simulation).
 * @returns the stepping interface of the chosen engine.
 * @throws Error with a researcher-readable message for invalid settings or inputs (from the engines).
 * @example createPlanSimulation(demoPlan()) // the one-pretest engine: demoPlan has no covariates
 */
export function createPlanSimulation(plan: Plan, options: SimulationOptions = {}): SimulationRun {
  const design = studyDesign(plan);
  switch (design.kind) {
    case 'selection':
      return createPoolsSimulation(plan, options, selectionPoolDrawer(plan));
    case 'clusters':
      return createPoolsSimulation(plan, options, clusterPoolDrawer(plan));
    case 'existing-groups':
      return usesCovariateModel(plan) ? createMultivariateSimulation(plan, options) : createSimulation(plan, options);
  }
}
