import type { AnalysisSettings } from './analyseAnalysis';
import type { AnalyticAnalysis } from './analyticResults';
import { TWO_GROUP_ANALYSIS_IDS, type AnalysisRecord } from './plan';
import { plannedAnalysisRecord, plannedInfeasibleRecord } from './plannedAnalysisRecord';
import { isPlannedInfeasible, type PlannedProcedureEstimates } from './plannedProcedure';

/**
 * The analyses with the quick simulation's planned-procedure figures in place
 * of the closed form wherever the simulation covered them (the matched
 * difference); other analyses keep their closed forms, which already hold
 * for the full samples as planned. Shared by every design's path through
 * analysePlan, so the planned figures are used the same way everywhere.
 *
 * Reference: see plannedAnalysisRecord (Morris, White & Crowther 2019 for the Monte Carlo figures).
 * @param analyses the closed-form records. @param planned quick figures (plain data), or undefined.
 * @param tau hoped-for effect, posttest points. @param posttestSD the posttest SD biases are scaled by (> 0).
 * @param settings plan settings.
 * @returns the records (a new object when planned figures are given; the same one otherwise).
 * @throws Error when the planned figures are unusable (plannedAnalysisRecord).
 * @example withPlannedFigures(closedForms, undefined, 2.5, 10, s) === closedForms
 */
export function withPlannedFigures(
  analyses: AnalysisRecord<AnalyticAnalysis>,
  planned: PlannedProcedureEstimates | undefined,
  tau: number,
  posttestSD: number,
  settings: AnalysisSettings,
): AnalysisRecord<AnalyticAnalysis> {
  if (!planned) return analyses;
  const out = { ...analyses };
  for (const id of TWO_GROUP_ANALYSIS_IDS) {
    const f = planned.analyses[id];
    const formula = analyses[id];
    if (!f || !formula) continue;
    out[id] = isPlannedInfeasible(f)
      ? plannedInfeasibleRecord(formula, f.reason, tau, posttestSD, settings)
      : plannedAnalysisRecord(formula, f, tau, posttestSD, settings);
  }
  return out;
}
