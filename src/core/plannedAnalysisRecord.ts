import type { AnalysisSettings } from './analyseAnalysis';
import type { AnalyticAnalysis } from './analyticResults';
import { analyticAnalysisRecord } from './analyticAnalysisRecord';
import type { PlannedAnalysisFigures } from './plannedProcedure';

/**
 * One analysis' record for the procedure as planned: the expected estimate,
 * SE and sample sizes from a short seeded simulation of the planned matching
 * (estimatePlannedProcedure in src/sim), with power, false-positive and
 * wrong-sign rates and the verdict computed from them exactly as for a closed
 * form (analyticAnalysisRecord), and the infinite-pool formula kept as
 * `formulaEstimate`.
 *
 * The required n scales the planned SE as 1/sqrt(n) in the matched programme
 * members (SE(n) = se·sqrt(nProgramme / n), df n − 1): it assumes the same
 * share of reuse of comparison partners at the larger size (an approximation,
 * stated where it is shown).
 *
 * Reference: power — Cohen (1988), ch. 2 (noncentral t); the estimate and SE
 * are Monte Carlo figures (Morris, White & Crowther 2019).
 *
 * @param formula the closed-form record of the same analysis (name, assumption, formula estimate).
 * @param planned the quick simulation's figures (nProgramme ≥ 2, se > 0).
 * @param tau the hoped-for effect, points. @param posttestSD comparison posttest SD, points (> 0).
 * @param s plan settings.
 * @returns the AnalyticAnalysis with basis 'planned-procedure'.
 * @throws Error when the planned figures are out of range.
 * @example a matched difference whose quick mean is −1.91 (formula −0.50) → expectedEstimate −1.91, formulaEstimate −0.50
 */
export function plannedAnalysisRecord(
  formula: AnalyticAnalysis,
  planned: PlannedAnalysisFigures,
  tau: number,
  posttestSD: number,
  s: AnalysisSettings,
): AnalyticAnalysis {
  const n = planned.nProgramme;
  if (!(n >= 2) || !(planned.se > 0) || !Number.isFinite(planned.se) || !Number.isFinite(planned.meanEstimate)) {
    throw new Error(
      `The quick simulation of the planned procedure gave unusable figures for the ${formula.name.toLowerCase()} ` +
        `(matched programme members ${n}, SE ${planned.se}).`,
    );
  }
  const perMember = planned.se * Math.sqrt(n);
  return analyticAnalysisRecord(
    {
      id: formula.id,
      name: formula.name,
      assumption: formula.assumption,
      estimate: planned.meanEstimate,
      tau,
      posttestSD,
      precision: {
        se: planned.se,
        df: Math.max(1, n - 1),
        design: (size: number) => ({ se: perMember / Math.sqrt(size), df: Math.max(1, size - 1) }),
      },
      infeasibleReason: null,
      nProgramme: n,
      nComparison: planned.nComparison,
      formulaEstimate: formula.formulaEstimate,
      basis: 'planned-procedure',
      estimateMCSE: planned.meanEstimateMCSE,
    },
    s,
  );
}

/**
 * One analysis' record when the quick simulation of the planned procedure
 * could not compute it (nobody, or almost nobody, found a partner): not
 * feasible, with the simulation's reason; the formula's estimate, bias and
 * verdict stay (what matching would do with unlimited pools), and SE, power,
 * error rates and required n are null.
 *
 * @param formula the closed-form record. @param reason plain-English reason from the engine.
 * @param tau hoped-for effect, points. @param posttestSD comparison posttest SD (> 0). @param s plan settings.
 * @returns the AnalyticAnalysis with feasible false.
 * @throws Error when a setting is out of range.
 * @example a caliper nobody meets → feasible false, power null, the reason names the caliper
 */
export function plannedInfeasibleRecord(
  formula: AnalyticAnalysis,
  reason: string,
  tau: number,
  posttestSD: number,
  s: AnalysisSettings,
): AnalyticAnalysis {
  if (!formula.feasible) return formula; // the closed form already says why
  return analyticAnalysisRecord(
    {
      id: formula.id,
      name: formula.name,
      assumption: formula.assumption,
      estimate: formula.expectedEstimate,
      tau,
      posttestSD,
      precision: null,
      infeasibleReason: reason,
      nProgramme: formula.nProgramme,
      nComparison: formula.nComparison,
      formulaEstimate: formula.formulaEstimate,
      basis: 'formula',
      estimateMCSE: null,
    },
    s,
  );
}
