// Public API of the statistical core. UI, report, CLI and simulation import from here.
// Importing it registers every design's engine (src/core/engineRegistry.ts), as outside the page.
import './allEngines';
export * from './plan';
export type { ModelParameters } from './modelParameters';
export type * from './analyticResults';
export { deriveModelParameters, standardErrorOfMeasurement } from './deriveModelParameters';
export { reliabilityToSem } from './reliabilityToSem';
export { semToReliability } from './semToReliability';
export { trueScoreSD } from './trueScoreSD';
export { withinGroupReliability } from './withinGroupReliability';
export { kelleyTrueScore } from './kelleyTrueScore';
export { spearmanBrown } from './spearmanBrown';
export { parallelFormsNeeded } from './parallelFormsNeeded';
export { outcomeSlope, type OutcomeModel } from './outcomeSlope';
export {
  matchedDifferenceEstimate,
  ancovaEstimate,
  gainScoreEstimate,
  correctedAncovaEstimate,
  expectedEstimate,
} from './expectedEstimate';
export {
  analysisStandardError,
  type StandardErrorResult,
  type StandardErrorOptions,
} from './analysisStandardError';
export { adjustedDifferenceStandardError, type GroupMoments } from './adjustedDifferenceStandardError';
export { welchSatterthwaiteDf } from './welchSatterthwaiteDf';
export { matchedDifferenceFeasibility, MIN_MATCHED_PROGRAMME } from './matchedDifferenceFeasibility';
export { normalCdf, normalPdf, normalQuantile, studentTCdf, studentTQuantile, noncentralTCdf } from './distributions';
export { twoSidedPower, falsePositiveRate, wrongSignRate } from './power';
export { requiredNPerGroup, type DesignAtN } from './requiredNPerGroup';
export { caliperWidth } from './caliperWidth';
export { expectedMatchedShare, type MatchingDemand } from './expectedMatchedShare';
export { breakEvenReliability } from './breakEvenReliability';
export { classifyArtefact } from './classifyArtefact';
export { modelWithSem, modelWithPretestGap, modelWithPoolSizes } from './adjustModel';
export { rankRemedies } from './rankRemedies';
export {
  sensitivityCurve,
  type SensitivityCurve,
  type SensitivityPoint,
  type SensitivityVariable,
} from './sensitivityCurve';
export { ANALYSIS_DESCRIPTIONS } from './analysisDescriptions';
export { analyseAnalysis, type AnalysisSettings } from './analyseAnalysis';
export { analysePlan, DEFAULT_TARGET_POWER } from './analysePlan';
export { assertFiniteOutput } from './assertFiniteOutput';
export { formatApart, formatNumber } from './inputChecks';
export { PLANNING_CAUTION } from './planningCaution';
// Several covariates (pretest first), each with its own reliability; matching distances; the unmeasured part.
export {
  deriveCovariateModel,
  usesCovariateModel,
  matchingDistance,
  type CovariateModel,
  type GroupMatrices,
} from './multivariate/covariateModel';
export {
  covariateModelProblems,
  covariateCheckInput,
  type CovariateCheckInput,
} from './multivariate/covariateModelProblems';
export {
  matchingScoreWeights,
  expectedTrueGapAfterMatching,
  expectedObservedGapAfterMatching,
  covariateMatchedEstimate,
} from './multivariate/covariateMatchedEstimate';
export { covariateAncovaEstimate, adjustedTrueGap } from './multivariate/covariateAncovaEstimate';
export { covariateGainScoreEstimate } from './multivariate/covariateGainScoreEstimate';
export {
  covariateCorrectedAncovaEstimate,
  assumedTrueScoreCovariance,
} from './multivariate/covariateCorrectedAncovaEstimate';
export { unmeasuredBias } from './multivariate/unmeasuredBias';
export { covariateExpectedEstimate } from './multivariate/covariateExpectedEstimate';
export { covariateStandardError } from './multivariate/covariateStandardError';
export { covariateMatchedShare } from './multivariate/covariateMatchedShare';
export { expectedCovariateBalance, type ExpectedCovariateBalance } from './multivariate/expectedCovariateBalance';
export { covariateBreakEven } from './multivariate/covariateBreakEven';
export {
  covariateModelWithSem,
  covariateModelWithPoolSizes,
  covariateModelWithMeasured,
} from './multivariate/adjustCovariateModel';
export { covariateAnalysisDescription } from './multivariate/covariateAnalysisDescription';
export { analyseCovariateAnalysis } from './multivariate/analyseCovariateAnalysis';
// Designs (the design seam): how people were drawn and assigned, and the selection designs' closed forms.
export {
  studyDesign,
  isSelectionDesign,
  isClusterDesign,
  designAnalysisIds,
  headlineAnalysisId,
  type StudyDesign,
  type ExistingGroupsDesign,
  type SelectionDesign,
  type ClustersDesign,
} from './design/studyDesign';
// Clusters (people in schools, classes, clinics): model, closed forms, presets.
export { clusterModel, clusterModelFor, ClusterModelError, type ClusterModel, type ClusterGroup } from './clusters/clusterModel';
export { analyseClusterPlan, clusterMeansModel, CLUSTER_ANALYSIS_NAMES } from './clusters/analyseClusterPlan';
export { newCohortClusterMeanReliability, samePeopleClusterMeanReliability, averagedClusterMeanReliability } from './clusters/clusterMeanReliability';
export { designEffect } from './clusters/designEffect';
export { minimumDetectableEffect } from './clusters/minimumDetectableEffect';
export { clusterSizeForReliability } from './clusters/clusterSizeForReliability';
export { clusterArtefact, clusterExpectedEstimate } from './clusters/clusterEstimates';
export { clusterStandardError } from './clusters/clusterStandardError';
export { ICC_PRESETS, type IccPreset } from './clusters/iccPresets';
export {
  selectionModel,
  selectionModelFor,
  selectionPopulation,
  selectionProbabilityGiven,
  selectedDensity,
  truncatedMoments,
  millsBelow,
  MIN_SELECTED,
  SEL_PRETEST,
  SEL_TRUE,
  SEL_OUTCOME,
  SEL_SCREENER,
  SEL_VARIABLES,
  type SelectionModel,
  type SelectionPopulation,
  type SelectedGroup,
} from './design/selectionModel';
export { derivedGroups } from './design/derivedGroups';
export { existingGroupsSummary } from './design/existingGroupsSummary';
export {
  selectionExpectedEstimate,
  selectionArtefact,
  selectionGroupGap,
  pooledWithinSlope,
  globalLinearDiscontinuity,
  type RegressionDiscontinuityEstimator,
} from './design/selectionEstimates';
export { selectionMatchedFigures, selectionMatchedShare, type SelectionMatchedFigures } from './design/selectionMatching';
export { selectionStandardError, type SelectionPrecision } from './design/selectionStandardError';
export { selectionModelParameters } from './design/selectionModelParameters';
export { selectionSummary, selectionRuleText } from './design/selectionSummary';
export { selectionRemedies, type SelectionRemedyInputs } from './design/selectionRemedies';
export { selectionSensitivityCurve } from './design/selectionSensitivity';
export { populationWithSem, withBasis, modelWith } from './design/selectionVariants';
export { analyseSelectionPlan, NO_OVERLAP_REASON, SELECTION_MATCHED_SE_NOTE } from './design/analyseSelectionPlan';
export { analysisSettings } from './analysisSettings';
export { withPlannedFigures } from './withPlannedFigures';
export { bandCrossings } from './bandCrossings';
export { presentAnalysisIds, presentAnalyses, requireAnalysis } from './presentAnalyses';
export { applyRemedy, APPLICABLE_REMEDY_IDS, type AppliedRemedy, type ApplyRemedyResult, type RemedyId } from './applyRemedy';
export { comparePlans, comparisonRow, estimandText, COMPARE_MIN_PLANS, COMPARE_MAX_PLANS, type CandidatePlan, type PlanComparisonRow } from './comparePlans';
export { engine, registerEngine, isEngineRegistered, enginesForPlan, missingEngines, MissingEngineError, ENGINE_NAMES, type EngineName, type Engines } from './engineRegistry';
