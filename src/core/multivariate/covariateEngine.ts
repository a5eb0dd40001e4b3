import { analyseCovariateAnalysis } from './analyseCovariateAnalysis';
import { covariateModelWithMeasured, covariateModelWithPoolSizes, covariateModelWithSem } from './adjustCovariateModel';
import { covariateBreakEven } from './covariateBreakEven';
import { covariateCorrectedAncovaEstimate } from './covariateCorrectedAncovaEstimate';
import { covariateGainScoreEstimate } from './covariateGainScoreEstimate';
import { covariateMatchedEstimate } from './covariateMatchedEstimate';
import { covariateMatchedShare } from './covariateMatchedShare';
import { deriveCovariateModel } from './covariateModel';
import { covariateModelProblems, joinNames } from './covariateModelProblems';
import { expectedCovariateBalance } from './expectedCovariateBalance';
import { mahalanobisCaliperSuggestion } from './mahalanobisCaliperSuggestion';
import { unmeasuredBias } from './unmeasuredBias';

/**
 * The covariate model's checks and closed forms that validatePlan, analysePlan and rankRemedies
 * reach through the engine registry (src/core/engineRegistry.ts), registered by
 * src/core/allEngines.ts. The functions are the ones in this folder, unchanged.
 */
export const covariateEngine = {
  analyseCovariateAnalysis,
  covariateBreakEven,
  covariateCorrectedAncovaEstimate,
  covariateGainScoreEstimate,
  covariateMatchedEstimate,
  covariateMatchedShare,
  covariateModelWithMeasured,
  covariateModelWithPoolSizes,
  covariateModelWithSem,
  covariateModelProblems,
  deriveCovariateModel,
  expectedCovariateBalance,
  joinNames,
  mahalanobisCaliperSuggestion,
  unmeasuredBias,
};

export type CovariateEngine = typeof covariateEngine;
