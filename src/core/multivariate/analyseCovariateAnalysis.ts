import type { AnalyticAnalysis } from '../analyticResults';
import type { AnalysisSettings } from '../analyseAnalysis';
import type { MatchingDistance, TwoGroupAnalysisId } from '../plan';
import { analyticAnalysisRecord } from '../analyticAnalysisRecord';
import { matchedDifferenceFeasibility } from '../matchedDifferenceFeasibility';
import type { CovariateModel } from './covariateModel';
import { covariateAnalysisDescription } from './covariateAnalysisDescription';
import { covariateExpectedEstimate } from './covariateExpectedEstimate';
import { covariateStandardError } from './covariateStandardError';

/**
 * Closed-form results for one analysis under the covariate model: as
 * analyseAnalysis (expected estimate, bias in points, posttest SDs and share of
 * tau, verdict, approximate SE and df, power with and without the bias,
 * false-positive and wrong-sign rates, required n per group), with the
 * matched difference for the plan's matching distance and ANCOVA / corrected
 * ANCOVA on all measured variables.
 *
 * Reference: covariateExpectedEstimate and covariateStandardError (computed);
 * power — Cohen (1988), ch. 2. The required n uses the same SE forms at n per
 * group. As analyseAnalysis, the matched difference is not feasible (null SE,
 * power, error rates, required n; a reason) when fewer than 2 programme
 * members are expected to be matched; its SE ignores partner reuse.
 *
 * @param id analysis. @param cm covariate model. @param distance matching distance.
 * @param s settings (see AnalysisSettings; matchedProgramme from covariateMatchedShare).
 * @returns an AnalyticAnalysis record.
 * @throws Error when a setting is out of range.
 * @example pretest-only model → the same figures as analyseAnalysis to rounding
 */
export function analyseCovariateAnalysis(
  id: TwoGroupAnalysisId,
  cm: CovariateModel,
  distance: MatchingDistance,
  s: AnalysisSettings,
): AnalyticAnalysis {
  const tau = cm.effect;
  const estimate = covariateExpectedEstimate(id, cm, distance, s.assumedReliability);
  const options = { assumedReliability: s.assumedReliability, ratio: s.ratio };
  const { name, assumption } = covariateAnalysisDescription(id, distance);
  const common = { id, name, assumption, estimate, tau, posttestSD: cm.posttestSD.comparison };
  if (id === 'matchedDifference') {
    const reason = matchedDifferenceFeasibility(s.matchedProgramme, cm.n.programme, s);
    if (reason !== null) {
      const matched = Math.max(0, s.matchedProgramme);
      return analyticAnalysisRecord(
        { ...common, precision: null, infeasibleReason: reason, nProgramme: matched, nComparison: matched * s.ratio },
        s,
      );
    }
  }
  const sizes =
    id === 'matchedDifference'
      ? { programme: s.matchedProgramme, comparison: s.matchedProgramme * s.ratio }
      : { programme: cm.n.programme, comparison: cm.n.comparison };
  const { se, df, nProgramme, nComparison } = covariateStandardError(id, cm, distance, sizes, options);
  // Required n: the full-sample analyses need enough people for their covariates' df.
  const minN = id === 'matchedDifference' || id === 'gainScore' ? 2 : Math.ceil((cm.measuredIndices.length + 3) / 2);
  const design = (n: number) =>
    covariateStandardError(id, cm, distance, { programme: Math.max(n, minN), comparison: Math.max(n, minN) }, options);
  return analyticAnalysisRecord({ ...common, precision: { se, df, design }, infeasibleReason: null, nProgramme, nComparison }, s);
}
