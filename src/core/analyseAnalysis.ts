import type { AnalyticAnalysis } from './analyticResults';
import type { TwoGroupAnalysisId } from './plan';
import type { ModelParameters } from './modelParameters';
import { ANALYSIS_DESCRIPTIONS } from './analysisDescriptions';
import { analysisStandardError } from './analysisStandardError';
import { analyticAnalysisRecord } from './analyticAnalysisRecord';
import { expectedEstimate } from './expectedEstimate';
import { matchedDifferenceFeasibility } from './matchedDifferenceFeasibility';

/** The plan settings one analysis' results depend on. */
export interface AnalysisSettings {
  /** Two-sided significance level in (0, 1). */
  alpha: number;
  /** rho' for the corrected ANCOVA, in (0, 1]. */
  assumedReliability: number;
  /** Share of |tau| an artefact may reach (≥ 0). */
  tolerableBiasShare: number;
  /** The plan's assumed growth gap (outcome.growthGap), points: the part of every bias that is not the regression artefact (default 0). */
  growthGap?: number;
  /** Target power for the required n, in (alpha, 1). */
  targetPower: number;
  /** Comparison partners per matched programme member (≥ 1). */
  ratio: number;
  /** Expected number of matched programme members (programme pool × expected matched share). */
  matchedProgramme: number;
  /** Whether a comparison member may serve several programme members (only shapes the infeasibility advice). */
  replacement: boolean;
}

/**
 * Closed-form results for one analysis: expected estimate, bias (in points, in
 * posttest SDs and as a share of tau), verdict, approximate SE and df, power
 * with and without the bias, false-positive and wrong-sign rates, and the n per
 * group needed for the target power.
 *
 * Reference: expected estimates — Thorndike (1942), Lord (1960), Porter (1967);
 * power — Cohen (1988), ch. 2. SEs are the approximations documented in
 * analysisStandardError; the required n uses the same SE forms at n per group.
 * The matched difference is reported as not feasible (feasible false, a
 * reason, null SE, power, error rates and required n) when fewer than 2
 * programme members are expected to be matched (matchedDifferenceFeasibility);
 * its SE ignores partner reuse with replacement (see analysisStandardError).
 *
 * @param id analysis. @param m model parameters. @param s settings (see AnalysisSettings).
 * @returns an AnalyticAnalysis record.
 * @throws Error when a setting is out of range.
 * @example demo plan, matchedDifference → bias −2 points (0.8·0.25·(−10)), verdict 'hides'
 */
export function analyseAnalysis(id: TwoGroupAnalysisId, m: ModelParameters, s: AnalysisSettings): AnalyticAnalysis {
  const tau = m.effect;
  const estimate = expectedEstimate(id, m, s.assumedReliability);
  const options = { assumedReliability: s.assumedReliability, ratio: s.ratio };
  const { name, assumption } = ANALYSIS_DESCRIPTIONS[id];
  const common = { id, name, assumption, estimate, tau, posttestSD: m.posttestSD.comparison };
  if (id === 'matchedDifference') {
    const reason = matchedDifferenceFeasibility(s.matchedProgramme, m.n.programme, s);
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
      : { programme: m.n.programme, comparison: m.n.comparison };
  const { se, df, nProgramme, nComparison } = analysisStandardError(id, m, sizes, options);
  const design = (n: number) => analysisStandardError(id, m, { programme: n, comparison: n }, options);
  return analyticAnalysisRecord({ ...common, precision: { se, df, design }, infeasibleReason: null, nProgramme, nComparison }, s);
}
