import type { AnalysisId, MatchingDistance } from '../plan';
import type { StandardErrorOptions, StandardErrorResult } from '../analysisStandardError';
import { formatNumber, requireReliability } from '../inputChecks';
import type { CovariateModel } from './covariateModel';
import { matchingScoreWeights } from './covariateMatchedEstimate';
import { adjustedDifferenceStandardError } from '../adjustedDifferenceStandardError';
import { welchSatterthwaiteDf } from '../welchSatterthwaiteDf';
import { block, dot, multiplyVector, pick, solvePositiveDefinite, subtract } from './linearAlgebra';

/**
 * Approximate standard error and degrees of freedom of each analysis under the
 * covariate model: the one-pretest approximations of analysisStandardError
 * with the pretest replaced by the measured variables m (or, for the matched
 * difference, by the scores matched on). Large-sample approximations; the
 * simulation gives the exact figures for the planned procedure.
 *
 * - matchedDifference: n matched sets of 1 programme member and k partners,
 *   exact matching on the scores Z = A X (A = matchingScoreWeights):
 *   SE² = (v_P + v_C/k + s)/n, df = n − 1, where v_g = var(Y | Z, g) =
 *   beta'Sigma_T,g beta + residualVar − beta'Sigma_T,g A'(A Sigma_X,g A')^-1 A Sigma_T,g beta,
 *   and s = (B_P − B_C)(A Sigma_X,P A')(B_P − B_C)' with B_g = beta'Sigma_T,g A'(A Sigma_X,g A')^-1
 *   (the spread of the pairs' expected differences when the groups' regressions
 *   on Z differ). Ignores the caliper's leftover differences and partner
 *   re-use with replacement (reused partners make pair differences
 *   correlated, so the SE is too small when reuse is common; Abadie & Imbens 2006). With the pretest only it is the one-pretest formula.
 * - ancova (all measured m): the delta-method variance of ΔȲ − b̂'ΔX̄[m] with
 *   b̂ the pooled within-group slopes (weights n_g − 1), each group's own
 *   residual variance about the pooled slopes over its own n, plus
 *   ΔX[m]'Var(b̂)ΔX[m]; df Welch–Satterthwaite on the two group terms minus |m|
 *   (adjustedDifferenceStandardError with M = I). With the same covariance
 *   matrices in both groups it is the pooled σ²(1/n_P + 1/n_C + ΔX[m]' W^-1 ΔX[m])
 *   (Cochran 1957, from memory).
 * - gainScore: Welch (1947), v_P/n_P + v_C/n_C with v_g = var(Y − X_0) from the
 *   covariate model and the Welch–Satterthwaite df.
 * - correctedAncova: slopes b~ = M b with M = Sigma_T'^-1 S_X (S_X the pooled
 *   observed covariance, Sigma_T' = S_X with its diagonal times the assumed
 *   reliabilities); the same delta-method variance with that M, so the group
 *   means the correction multiplies by M are included. M is treated as known
 *   (its own sampling variation through S_X is ignored; with the pretest alone
 *   M = 1/rho' exactly). Estimator: Porter (1967).
 *
 * @param id analysis. @param cm covariate model. @param distance matching distance.
 * @param sizes programme and comparison sample sizes (matched programme members
 *   for the matched difference, whose comparison figure is ignored).
 * @param options assumed pretest reliability and matching ratio.
 * @returns { se, df, nProgramme, nComparison }.
 * @throws Error when a size is below 2 (full-sample analyses; df must stay ≥ 1),
 *   the ratio is below 1, the assumed reliability is out of range, or the variance is zero.
 * @example pretest only: equals analysisStandardError for the same model to rounding
 */
export function covariateStandardError(
  id: AnalysisId,
  cm: CovariateModel,
  distance: MatchingDistance,
  sizes: { programme: number; comparison: number },
  options: StandardErrorOptions,
): StandardErrorResult {
  const resVar = cm.residualSD ** 2;
  const sT = { P: cm.sigmaT.programme, C: cm.sigmaT.comparison };
  const sX = { P: cm.sigmaX.programme, C: cm.sigmaX.comparison };
  const tb = { P: multiplyVector(sT.P, cm.beta), C: multiplyVector(sT.C, cm.beta) };
  const varY = { P: dot(cm.beta, tb.P) + resVar, C: dot(cm.beta, tb.C) + resVar };

  let result: StandardErrorResult;
  if (id === 'matchedDifference') {
    const k = options.ratio;
    if (!(k >= 1)) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(k)}.`);
    const n = Math.max(2, sizes.programme);
    const a = matchingScoreWeights(cm, distance);
    const given = (g: 'P' | 'C'): { v: number; slope: number[] } => {
      if (a.length === 0) return { v: varY[g], slope: [] };
      const scoreVar = a.map((row) => a.map((other) => dot(row, multiplyVector(sX[g], other))));
      const cross = multiplyVector(a, tb[g]); // A Sigma_T,g beta = cov(Z, Y)
      const slope = solvePositiveDefinite(scoreVar, cross);
      return { v: varY[g] - dot(cross, slope), slope };
    };
    const gP = given('P');
    const gC = given('C');
    const diff = subtract(gP.slope, gC.slope);
    const scoreVarP = a.map((row) => a.map((other) => dot(row, multiplyVector(sX.P, other))));
    const spread = a.length === 0 ? 0 : dot(diff, multiplyVector(scoreVarP, diff));
    result = { se: Math.sqrt((gP.v + gC.v / k + spread) / n), df: n - 1, nProgramme: n, nComparison: k * n };
  } else {
    const nP = sizes.programme;
    const nC = sizes.comparison;
    const m = cm.measuredIndices;
    // The gain score adjusts for nothing, so only the adjusting analyses need df for the covariates.
    if (!(nP >= 2 && nC >= 2 && (id === 'gainScore' || nP + nC - 2 - m.length >= 1))) {
      throw new Error(
        `Each group needs at least 2 people, and together more than the ${m.length} adjusted variable${m.length === 1 ? '' : 's'} plus 2, for this analysis; got ${formatNumber(nP)} and ${formatNumber(nC)}.`,
      );
    }
    const group = (g: 'P' | 'C', n: number) => ({ n, varY: varY[g], covXY: pick(tb[g], m), covX: block(sX[g], m, m) });
    const moments = { P: group('P', nP), C: group('C', nC) };
    const dx = pick(cm.gap, m);
    if (id === 'gainScore') {
      // Welch (1947): each group's own var(Y − X_0) over its own n, Welch–Satterthwaite df.
      const vP = (varY.P + (sX.P[0]![0] as number) - 2 * (tb.P[0] as number)) / nP;
      const vC = (varY.C + (sX.C[0]![0] as number) - 2 * (tb.C[0] as number)) / nC;
      const df = vP + vC > 0 ? welchSatterthwaiteDf([{ variance: vP, df: nP - 1 }, { variance: vC, df: nC - 1 }]) : nP + nC - 2;
      result = { se: Math.sqrt(vP + vC), df, nProgramme: nP, nComparison: nC };
    } else if (id === 'ancova') {
      const identity = m.map((_, i) => m.map((__, j) => (i === j ? 1 : 0)));
      const { se, df } = adjustedDifferenceStandardError(moments.P, moments.C, dx, identity);
      result = { se, df, nProgramme: nP, nComparison: nC };
    } else {
      const rhoA = requireReliability(options.assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      const wP = nP - 1;
      const wC = nC - 1;
      // S_X: pooled observed covariance of X[m]; Sigma_T': S_X with its diagonal times the assumed reliabilities.
      const sPooled = moments.P.covX.map((row, i) => row.map((x, j) => (wP * x + wC * (moments.C.covX[i]![j] as number)) / (wP + wC)));
      const rel = m.map((j) => (j === 0 ? rhoA : (cm.reliability.pooled[j] as number)));
      const assumed = sPooled.map((row, i) => row.map((x, j) => (i === j ? x * (rel[i] as number) : x)));
      // M = Sigma_T'^-1 S_X, so that the corrected slopes are M b.
      const M = solvePositiveDefinite(assumed, sPooled);
      const { se, df } = adjustedDifferenceStandardError(moments.P, moments.C, dx, M);
      result = { se, df, nProgramme: nP, nComparison: nC };
    }
  }
  if (!(result.se > 0) || !Number.isFinite(result.se)) {
    throw new Error(
      'The standard error of this analysis is zero or undefined: the outcome would be predicted perfectly by the pretest and covariates. ' +
        'Check the outcome correlations and the reliabilities.',
    );
  }
  return result;
}
