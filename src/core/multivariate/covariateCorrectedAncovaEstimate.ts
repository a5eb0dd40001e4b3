import { requireReliability } from '../inputChecks';
import type { CovariateModel } from './covariateModel';
import { adjustedTrueGap } from './covariateAncovaEstimate';
import { dot } from './linearAlgebra';

/**
 * The analyst's estimate of the measured variables' true-score covariance
 * matrix for the reliability-corrected ANCOVA: the pooled observed covariance
 * Sigma_X with each diagonal entry multiplied by the reliability the analyst
 * assumes (the plan's assumed reliability for the pretest; each covariate's
 * stated reliability for the others); off-diagonal entries are unchanged
 * (errors independent). Full p × p; only the measured block is used.
 * @param cm the covariate model. @param assumedReliability rho' for the pretest, in (0, 1].
 * @returns Sigma_T' (pooled), p × p.
 * @throws Error when assumedReliability is outside (0, 1].
 * @example pretest only → [[rho' · pooled pretest variance]]
 */
export function assumedTrueScoreCovariance(cm: CovariateModel, assumedReliability: number): number[][] {
  requireReliability(assumedReliability, 'The assumed reliability for the corrected ANCOVA');
  const rel = cm.reliability.pooled.map((r, i) => (i === 0 ? assumedReliability : r));
  return cm.sigmaX.pooled.map((row, i) => row.map((x, j) => (i === j ? x * (rel[i] as number) : x)));
}

/**
 * Expected estimate of the multivariate reliability-corrected ANCOVA: each
 * member's measured variables X[m] are replaced by their estimated true scores
 * X̄_g + Sigma_T'[m, m] Sigma_X[m, m]^-1 (X[m] − X̄_g) (own group's means; Kelley's
 * estimate in several variables), then ordinary ANCOVA. Derivation (computed):
 * the replacement keeps the group means, and its pooled within-group slopes
 * are Sigma_T'[m, m]^-1 Sigma_T[m, :] beta, so the estimate is
 * growthGap + tau + beta' (Delta − Sigma_T[:, m] Sigma_T'[m, m]^-1 Delta[m]).
 * With the true reliabilities (Sigma_T' = Sigma_T) only the unmeasured part
 * (unmeasuredBias) and the growth gap remain. With the pretest only it equals
 * correctedAncovaEstimate: tau + delta + beta(1 − rho_pooled / rho')·Delta.
 *
 * Reference: Porter (1967), one fallible covariate; its several-covariate form
 * as in Fuller (1987, ch. 2), from memory; computed.
 *
 * @param cm the covariate model. @param assumedReliability rho' for the pretest, in (0, 1].
 * @returns expected estimate, posttest points.
 * @throws Error when assumedReliability is outside (0, 1] or the assumed
 *   reliabilities make Sigma_T'[m, m] not positive definite (validatePlan reports this first).
 * @example pretest only, rho' = rho_pooled, delta 0 → tau exactly
 */
export function covariateCorrectedAncovaEstimate(cm: CovariateModel, assumedReliability: number): number {
  const assumed = assumedTrueScoreCovariance(cm, assumedReliability);
  return cm.growthGap + cm.effect + dot(cm.beta, adjustedTrueGap(cm, assumed));
}
