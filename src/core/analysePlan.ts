import { requiredNCounts } from './requiredNCounts';
import type { AnalyticAnalysis, AnalyticResults, BreakEven } from './analyticResults';
import type { ModelParameters } from './modelParameters';
import { TWO_GROUP_ANALYSIS_IDS, type AnalysisRecord, type Plan } from './plan';
import { analyseAnalysis } from './analyseAnalysis';
import { assertFiniteOutput } from './assertFiniteOutput';
import { breakEvenReliability } from './breakEvenReliability';
import { deriveModelParameters } from './deriveModelParameters';
import { expectedMatchedShare } from './expectedMatchedShare';
import { rankRemedies } from './rankRemedies';
import { existingGroupsSummary } from './design/existingGroupsSummary';
import { matchingDistance, usesCovariateModel } from './multivariate/covariateUse';
import { shareOfEffect } from './shareOfEffect';
import type { PlannedProcedureEstimates } from './plannedProcedure';
import { analysisSettings } from './analysisSettings';
import { withPlannedFigures } from './withPlannedFigures';
import { isClusterDesign, isSelectionDesign } from './design/studyDesign';
import { engine } from './engineRegistry';

export { DEFAULT_TARGET_POWER } from './analysisSettings';

/**
 * Everything the planner shows without simulation, for one plan: model
 * parameters, reliabilities, and per analysis the expected estimate, bias,
 * verdict, SE, power, error rates and required n; the break-even reliability;
 * and the ranked remedies. The ONE function the UI, the CLI and the report call.
 *
 * Reference: see the functions it calls (Kelley 1947; Spearman 1910, Brown 1910;
 * Thorndike 1942; Lord 1960; Porter 1967; Campbell & Erlebacher 1970; Cohen 1988).
 * Without `planned`, the matched difference's figures are the closed form for
 * unlimited pools and exact matching (basis 'formula'); with `planned` (from
 * estimatePlannedProcedure in src/sim, a short seeded simulation of the
 * planned procedure) they are for these pools, caliper, ratio, order and
 * replacement (basis 'planned-procedure'), the formula kept as `formulaEstimate`.
 *
 * @param plan a plan that has passed validation.
 * @param planned optional quick figures of the planned procedure (plain data).
 * @returns AnalyticResults in which every number is finite.
 * @throws Error with a researcher-readable message when the inputs contradict
 *   each other (e.g. r² > reliability) or a figure could not be computed.
 * @example analysePlan(demoPlan()).analyses.matchedDifference.bias // −2 (0.8·0.25·(−10))
 */
export function analysePlan(plan: Plan, planned?: PlannedProcedureEstimates): AnalyticResults {
  return { ...analysePlanForDesign(plan, planned), requiredNCounts: requiredNCounts(plan) };
}

/** analysePlan's one branch on the design (see the design seam in DEVELOPERS.md). */
function analysePlanForDesign(plan: Plan, planned?: PlannedProcedureEstimates): AnalyticResults {
  // The design's engine comes from the registry (src/core/engineRegistry.ts): a missing one throws, naming it.
  if (isSelectionDesign(plan)) return engine('selection').analyseSelectionPlan(plan, planned);
  if (isClusterDesign(plan)) return engine('clusters').analyseClusterPlan(plan, planned);
  if (usesCovariateModel(plan)) return analyseCovariatePlan(plan, planned);
  const m = deriveModelParameters(plan);
  const share = expectedMatchedShare(m, plan.matching);
  const settings = analysisSettings(plan, m.n.programme * share);
  const analyses = withPlannedFigures(
    Object.fromEntries(TWO_GROUP_ANALYSIS_IDS.map((id) => [id, analyseAnalysis(id, m, settings)])) as AnalysisRecord<AnalyticAnalysis>,
    planned,
    m.effect,
    m.posttestSD.comparison,
    settings,
  );
  return assertFiniteOutput(
    sharedResults(plan, m, analyses, breakEvenReliability(m, plan.analysis.tolerableBiasShare), planned),
    'results',
  );
}

/**
 * analysePlan for a plan with covariates or a propensity/Mahalanobis distance:
 * the covariate model's closed forms (src/core/multivariate), the matched share
 * for the plan's distance, the break-even pretest reliability with the other
 * covariates in place, the unmeasured part of the bias and the expected balance.
 */
function analyseCovariatePlan(plan: Plan, planned: PlannedProcedureEstimates | undefined): AnalyticResults {
  const {
    analyseCovariateAnalysis,
    covariateBreakEven,
    covariateMatchedShare,
    deriveCovariateModel,
    expectedCovariateBalance,
    mahalanobisCaliperSuggestion,
    unmeasuredBias,
  } = engine('covariates');
  const m = deriveModelParameters(plan);
  const cm = deriveCovariateModel(plan, m);
  const distance = matchingDistance(plan);
  const share = covariateMatchedShare(cm, m, plan.matching, distance);
  const settings = analysisSettings(plan, m.n.programme * share);
  const analyses = withPlannedFigures(
    Object.fromEntries(TWO_GROUP_ANALYSIS_IDS.map((id) => [id, analyseCovariateAnalysis(id, cm, distance, settings)])) as AnalysisRecord<AnalyticAnalysis>,
    planned,
    m.effect,
    m.posttestSD.comparison,
    settings,
  );
  const hidden = unmeasuredBias(cm);
  const results: AnalyticResults = {
    ...sharedResults(plan, m, analyses, covariateBreakEven(cm, m, distance, plan.analysis.tolerableBiasShare), planned),
    matchingDistance: distance,
    unmeasuredBias: {
      points: hidden,
      sd: hidden / cm.posttestSD.comparison,
      share: shareOfEffect(hidden, m.effect),
      covariates: cm.names.filter((_, j) => !cm.measured[j]),
    },
    covariateModel: cm,
    covariateBalance: expectedCovariateBalance(cm, distance),
    ...(distance === 'mahalanobis' ? { caliperSuggestion: mahalanobisCaliperSuggestion(cm, m, plan.matching) } : {}),
  };
  return assertFiniteOutput(results, 'results');
}

/** The results both paths give, in this order: model, reliabilities, tau, analyses, break-even, remedies. */
function sharedResults(
  plan: Plan,
  m: ModelParameters,
  analyses: AnalysisRecord<AnalyticAnalysis>,
  breakEven: BreakEven,
  planned: PlannedProcedureEstimates | undefined,
): AnalyticResults {
  return {
    model: m,
    reliability: { programme: m.reliability.programme, comparison: m.reliability.comparison, sem: m.sem },
    tau: m.effect,
    analyses,
    breakEven,
    remedies: rankRemedies(plan, m),
    procedure: planned
      ? { basis: 'planned-procedure', replications: planned.replications, seed: planned.seed }
      : { basis: 'formula', replications: null, seed: null },
    design: existingGroupsSummary(m),
  };
}
