import type { CovariateModel } from './covariateModel';
import { block, dot, multiplyVector, pick, solvePositiveDefinite } from './linearAlgebra';

/**
 * Expected ANCOVA estimate with all measured variables m (pretest first) as
 * covariates, full sample, pooled within-group slopes:
 * growthGap + tau + beta' (Delta − Sigma_T[:, m] Sigma_X[m, m]^-1 Delta[m]),
 * with the pool-size weighted within-group covariances (n_P Σ_P + n_C Σ_C)/N
 * (in large samples the OLS slopes of Y on X[m] with a group indicator are the
 * pooled within-group slopes Sigma_X[m, m]^-1 Sigma_T[m, :] beta; the estimate is
 * ΔȲ − b'ΔX̄[m]). With the pretest only it equals ancovaEstimate:
 * tau + delta + beta(1 − rho_pooled)·Delta.
 *
 * Reference: Lord (1960), large-sample covariance analysis with a fallible
 * control variable; Cochran (1968), errors of measurement in statistics
 * (several fallible covariates), from memory; computed.
 *
 * @param cm the covariate model.
 * @returns expected estimate, posttest points.
 * @throws never for a valid model.
 * @example pretest only, gap −10, rho .75, beta 0.8, tau 2.5 → 0.5
 */
export function covariateAncovaEstimate(cm: CovariateModel): number {
  return cm.growthGap + cm.effect + dot(cm.beta, adjustedTrueGap(cm, cm.sigmaX.pooled));
}

/**
 * Delta − Sigma_T[:, m] S[m, m]^-1 Delta[m] with the pooled Sigma_T and a given
 * pooled matrix S (Sigma_X for ANCOVA; the analyst's corrected Sigma_T' for the
 * reliability-corrected ANCOVA; Sigma_T for the unmeasured part).
 * @param cm the covariate model. @param s a p × p pooled matrix whose [m, m] block is positive definite.
 * @returns the true-score gap left per variable, in its own units.
 * @throws Error when S[m, m] is not positive definite.
 * @example S = Sigma_T (pooled) → 0 for every measured variable
 */
export function adjustedTrueGap(cm: CovariateModel, s: number[][]): number[] {
  const m = cm.measuredIndices;
  const w = solvePositiveDefinite(block(s, m, m), pick(cm.gap, m));
  const shift = multiplyVector(block(cm.sigmaT.pooled, cm.names.map((_, i) => i), m), w);
  return cm.gap.map((d, i) => d - (shift[i] as number));
}
