import type { CovariateModel } from './covariateModel';
import { adjustedTrueGap } from './covariateAncovaEstimate';
import { dot } from './linearAlgebra';

/**
 * The part of the bias that no analysis of the measured variables can remove:
 * beta' (Delta − Sigma_T[:, m] Sigma_T[m, m]^-1 Delta[m]) (pooled within-group
 * true-score covariances), i.e. the outcome gap carried by the unmeasured
 * covariates' true scores beyond what the measured variables' true scores
 * account for. Even perfectly reliable measured variables, or a correction
 * with their true reliabilities, leave it. The growth gap is not part of it
 * (reported separately). Exactly 0 when every covariate is measured.
 *
 * Reference: omitted-variable bias in regression (common practice; e.g.
 * Cochran 1968), applied to true scores; computed.
 *
 * @param cm the covariate model.
 * @returns bias, posttest points.
 * @throws never for a valid model.
 * @example an unmeasured covariate uncorrelated with the others, gap −5, slope 0.4 → −2
 */
export function unmeasuredBias(cm: CovariateModel): number {
  if (cm.measured.every((x) => x)) return 0;
  return dot(cm.beta, adjustedTrueGap(cm, cm.sigmaT.pooled));
}
