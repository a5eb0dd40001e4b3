import type { AnalyticAnalysis, AnalyticResults, BreakEven } from './analyticResults';
import type { ModelParameters } from './modelParameters';
import { ANALYSIS_IDS, type AnalysisId, type Plan } from './plan';
import { analyseAnalysis, type AnalysisSettings } from './analyseAnalysis';
import { assertFiniteOutput } from './assertFiniteOutput';
import { breakEvenReliability } from './breakEvenReliability';
import { deriveModelParameters } from './deriveModelParameters';
import { expectedMatchedShare } from './expectedMatchedShare';
import { rankRemedies } from './rankRemedies';
import { analyseCovariateAnalysis } from './multivariate/analyseCovariateAnalysis';
import { covariateBreakEven } from './multivariate/covariateBreakEven';
import { covariateMatchedShare } from './multivariate/covariateMatchedShare';
import { deriveCovariateModel, matchingDistance, usesCovariateModel } from './multivariate/covariateModel';
import { expectedCovariateBalance } from './multivariate/expectedCovariateBalance';
import { unmeasuredBias } from './multivariate/unmeasuredBias';
import { shareOfEffect } from './shareOfEffect';

/** Default target power when the plan gives none (Cohen 1988's convention of .80). */
export const DEFAULT_TARGET_POWER = 0.8;

/**
 * Everything the planner shows without simulation, for one plan: model
 * parameters, reliabilities, and per analysis the expected estimate, bias,
 * verdict, SE, power, error rates and required n; the break-even reliability;
 * and the ranked remedies. The ONE function the UI, the CLI and the report call.
 *
 * Reference: see the functions it calls (Kelley 1947; Spearman 1910, Brown 1910;
 * Thorndike 1942; Lord 1960; Porter 1967; Campbell & Erlebacher 1970; Cohen 1988).
 * These figures assume infinite pools for the estimates and approximate SEs and
 * matched shares; the simulation gives exact figures for the planned procedure.
 *
 * @param plan a plan that has passed validation.
 * @returns AnalyticResults in which every number is finite.
 * @throws Error with a researcher-readable message when the inputs contradict
 *   each other (e.g. r² > reliability) or a figure could not be computed.
 * @example analysePlan(demoPlan()).analyses.matchedDifference.bias // −2 (0.8·0.25·(−10))
 */
export function analysePlan(plan: Plan): AnalyticResults {
  if (usesCovariateModel(plan)) return analyseCovariatePlan(plan);
  const m = deriveModelParameters(plan);
  const share = expectedMatchedShare(m, plan.matching);
  const settings = analysisSettings(plan, m.n.programme * share);
  const analyses = Object.fromEntries(ANALYSIS_IDS.map((id) => [id, analyseAnalysis(id, m, settings)])) as Record<
    AnalysisId,
    AnalyticAnalysis
  >;
  return assertFiniteOutput(sharedResults(plan, m, analyses, breakEvenReliability(m, plan.analysis.tolerableBiasShare)), 'results');
}

/**
 * analysePlan for a plan with covariates or a propensity/Mahalanobis distance:
 * the covariate model's closed forms (src/core/multivariate), the matched share
 * for the plan's distance, the break-even pretest reliability with the other
 * covariates in place, the unmeasured part of the bias and the expected balance.
 */
function analyseCovariatePlan(plan: Plan): AnalyticResults {
  const m = deriveModelParameters(plan);
  const cm = deriveCovariateModel(plan, m);
  const distance = matchingDistance(plan);
  const share = covariateMatchedShare(cm, m, plan.matching, distance);
  const settings = analysisSettings(plan, m.n.programme * share);
  const analyses = Object.fromEntries(
    ANALYSIS_IDS.map((id) => [id, analyseCovariateAnalysis(id, cm, distance, settings)]),
  ) as Record<AnalysisId, AnalyticAnalysis>;
  const hidden = unmeasuredBias(cm);
  const results: AnalyticResults = {
    ...sharedResults(plan, m, analyses, covariateBreakEven(cm, m, distance, plan.analysis.tolerableBiasShare)),
    matchingDistance: distance,
    unmeasuredBias: {
      points: hidden,
      sd: hidden / cm.posttestSD.comparison,
      share: shareOfEffect(hidden, m.effect),
      covariates: cm.names.filter((_, j) => !cm.measured[j]),
    },
    covariateModel: cm,
    covariateBalance: expectedCovariateBalance(cm, distance),
  };
  return assertFiniteOutput(results, 'results');
}

/** The settings every analysis reads from the plan; matchedProgramme = expected matched programme members. */
function analysisSettings(plan: Plan, matchedProgramme: number): AnalysisSettings {
  return {
    alpha: plan.analysis.alpha,
    assumedReliability: plan.analysis.assumedReliability,
    tolerableBiasShare: plan.analysis.tolerableBiasShare,
    targetPower: plan.analysis.targetPower ?? DEFAULT_TARGET_POWER,
    ratio: plan.matching.ratio,
    matchedProgramme,
    replacement: plan.matching.replacement,
  };
}

/** The results both paths give, in this order: model, reliabilities, tau, analyses, break-even, remedies. */
function sharedResults(
  plan: Plan,
  m: ModelParameters,
  analyses: Record<AnalysisId, AnalyticAnalysis>,
  breakEven: BreakEven,
): AnalyticResults {
  return {
    model: m,
    reliability: { programme: m.reliability.programme, comparison: m.reliability.comparison, sem: m.sem },
    tau: m.effect,
    analyses,
    breakEven,
    remedies: rankRemedies(plan, m),
  };
}
