import type { MatchingDistance } from '../plan';
import type { CovariateModel } from './covariateModel';
import { expectedObservedGapAfterMatching, expectedTrueGapAfterMatching, matchingScoreWeights } from './covariateMatchedEstimate';
import { dot, multiplyVector, solvePositiveDefinite } from './linearAlgebra';

/** Closed-form balance on one variable before and after matching (unlimited pool, exact matching). */
export interface ExpectedCovariateBalance {
  /** "Pretest" or the covariate's name. */
  name: string;
  measured: boolean;
  exact: boolean;
  /** Observed gap over the pooled observed SD sqrt((s_P² + s_C²)/2), before matching. */
  observedSMDBefore: number;
  /** The same after matching (0 for the variables matched on). */
  observedSMDAfter: number;
  /** True-score gap over the pooled true-score SD, before matching (equals the gap over that SD). */
  trueSMDBefore: number;
  /** True-score gap after matching over the same pooled true-score SD: the hidden imbalance. */
  trueSMDAfter: number;
  /** Variance of the observed variable, programme over matched partners, after matching (1 for those matched on). */
  varianceRatioAfter: number;
}

/**
 * Expected balance per variable (pretest first) after exact matching on the
 * plan's matching distance from an unlimited comparison pool: the observed and
 * true-score standardised mean differences before and after, and the variance
 * ratio after. The gaps after are expectedObservedGapAfterMatching and
 * expectedTrueGapAfterMatching; SMDs divide by the full pools' pooled SDs
 * sqrt((s_P² + s_C²)/2) (observed, or true-score) before and after alike (Stuart
 * 2010). The partners' covariance after matching on Z = A X is
 * Sigma_C − Sigma_C A'V_C^-1 A Sigma_C + Sigma_C A'V_C^-1 V_P V_C^-1 A Sigma_C, with
 * V_g = A Sigma_X,g A' (normal regression on Z within the comparison group,
 * Z distributed as in the programme); the programme keeps Sigma_X,P.
 *
 * Reference: Rubin (2001) and Stuart (2010) for the SMD and variance-ratio
 * diagnostics; Cochran & Rubin (1973) on fallible matching variables; computed.
 *
 * @param cm the covariate model. @param distance the matching distance.
 * @returns one record per variable, pretest first.
 * @throws never for a valid model.
 * @example pretest only, reliability .75, gap −10, SDs 10 → observed SMD −1 → 0; true SMD −1.155 → −0.289
 */
export function expectedCovariateBalance(cm: CovariateModel, distance: MatchingDistance): ExpectedCovariateBalance[] {
  const obsAfter = expectedObservedGapAfterMatching(cm, distance);
  const trueAfter = expectedTrueGapAfterMatching(cm, distance);
  const a = matchingScoreWeights(cm, distance);
  const sC = cm.sigmaX.comparison;
  const sP = cm.sigmaX.programme;
  const vC = a.map((u) => a.map((w) => dot(u, multiplyVector(sC, w))));
  const vP = a.map((u) => a.map((w) => dot(u, multiplyVector(sP, w))));
  return cm.names.map((name, j) => {
    const sdX = Math.sqrt(((sP[j]![j] as number) + (sC[j]![j] as number)) / 2);
    const sdT = Math.sqrt(((cm.sigmaT.programme[j]![j] as number) + (cm.sigmaT.comparison[j]![j] as number)) / 2);
    let partnerVar = sC[j]![j] as number;
    if (a.length > 0) {
      const cross = a.map((u) => dot(u, sC[j] as number[])); // A Sigma_C e_j
      const w = solvePositiveDefinite(vC, cross);
      partnerVar += -dot(cross, w) + dot(w, multiplyVector(vP, w));
    }
    const gap = cm.gap[j] as number;
    return {
      name,
      measured: cm.measured[j] as boolean,
      exact: cm.exact[j] as boolean,
      observedSMDBefore: gap / sdX,
      observedSMDAfter: zeroIfTiny((obsAfter[j] as number) / sdX, gap / sdX),
      trueSMDBefore: gap / sdT,
      trueSMDAfter: (trueAfter[j] as number) / sdT,
      varianceRatioAfter: (sP[j]![j] as number) / partnerVar,
    };
  });
}

/** Rounding noise (below 1e-12 of the gap before) shown as 0. */
function zeroIfTiny(x: number, before: number): number {
  return Math.abs(x) <= 1e-12 * Math.max(1, Math.abs(before)) ? 0 : x;
}
