import { analysePlan } from '../core/analysePlan';
import type { AnalyticResults } from '../core/analyticResults';
import type { Plan } from '../core/plan';
import { estimatePlannedProcedure } from './estimatePlannedProcedure';

/**
 * Everything shown before a full simulation, for the procedure as planned:
 * analysePlan's closed forms with the matched difference's expected estimate,
 * SE, power, error rates and matched n taken from a short seeded simulation of
 * the planned matching (estimatePlannedProcedure); the infinite-pool formula
 * stays as `formulaEstimate`. The CLI, the report and the planner's worker call it.
 *
 * @param plan a validated plan.
 * @returns AnalyticResults with procedure.basis 'planned-procedure'.
 * @throws Error with a researcher-readable message for contradictory inputs.
 * @example analysePlannedProcedure(demoPlan()).procedure.basis // 'planned-procedure'
 */
export function analysePlannedProcedure(plan: Plan): AnalyticResults {
  analysePlan(plan); // checks the inputs (researcher-readable messages) before any simulation
  return analysePlan(plan, estimatePlannedProcedure(plan));
}
