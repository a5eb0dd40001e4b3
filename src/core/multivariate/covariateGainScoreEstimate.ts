import type { CovariateModel } from './covariateModel';
import { dot } from './linearAlgebra';

/**
 * Expected gain-score estimate (Y − observed pretest, the pretest and posttest
 * on the same scale as in gainScoreEstimate): growthGap + tau + beta'Delta − Delta_0.
 * The covariates enter only through the outcome: their gaps flow through with
 * their true-score slopes. With the pretest only it equals gainScoreEstimate:
 * tau + delta + (beta − 1)·Delta.
 *
 * Reference: computed from the model (REFERENCES.md); Lord (1967) on gain scores versus ANCOVA.
 *
 * @param cm the covariate model.
 * @returns expected estimate, posttest points.
 * @throws never for a valid model.
 * @example pretest only, gap −10, beta 0.8, tau 2.5 → 4.5
 */
export function covariateGainScoreEstimate(cm: CovariateModel): number {
  return cm.growthGap + cm.effect + dot(cm.beta, cm.gap) - (cm.gap[0] as number);
}
