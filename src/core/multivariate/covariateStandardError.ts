import type { AnalysisId, MatchingDistance } from '../plan';
import type { StandardErrorOptions, StandardErrorResult } from '../analysisStandardError';
import { formatNumber, requireReliability } from '../inputChecks';
import type { CovariateModel } from './covariateModel';
import { matchingScoreWeights } from './covariateMatchedEstimate';
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
 *   re-use with replacement. With the pretest only it is the one-pretest formula.
 * - ancova (all measured m): W = Σ_g (n_g − 1) Sigma_X,g[m, m], pooled slopes
 *   b = W^-1 Σ_g (n_g − 1) Sigma_T,g[m, :] beta, σ² the pooled residual variance
 *   about b; SE² = σ²(1/n_P + 1/n_C + ΔX[m]' W^-1 ΔX[m]), df = n_P + n_C − 2 − |m|
 *   (the variance of an adjusted mean difference with several covariates;
 *   Cochran 1957, from memory).
 * - gainScore: as the one-pretest formula, with var(Y) and cov(X_0, Y) from the covariate model.
 * - correctedAncova: slopes b~ = M b with M = Sigma_T'^-1 S_X (S_X the pooled
 *   observed covariance, Sigma_T' = S_X with its diagonal times the assumed
 *   reliabilities); SE² = σ_c²(1/n_P + 1/n_C) + σ² (M'ΔX)' W^-1 (M'ΔX),
 *   σ_c² the pooled residual variance of Y − b~'(X[m] − X̄_g[m]); df as ANCOVA.
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
    if (!(nP >= 2 && nC >= 2 && nP + nC - 2 - m.length >= 1)) {
      throw new Error(
        `Each group needs at least 2 people, and together more than the ${m.length} adjusted variable${m.length === 1 ? '' : 's'} plus 2, for this analysis; got ${formatNumber(nP)} and ${formatNumber(nC)}.`,
      );
    }
    const wP = nP - 1;
    const wC = nC - 1;
    const pool = (x: number, y: number): number => (wP * x + wC * y) / (wP + wC);
    const sxm = { P: block(sX.P, m, m), C: block(sX.C, m, m) };
    const cxy = { P: pick(tb.P, m), C: pick(tb.C, m) }; // cov(X[m], Y) per group
    const W = sxm.P.map((row, i) => row.map((x, j) => wP * x + wC * (sxm.C[i]![j] as number)));
    const wxy = cxy.P.map((x, i) => wP * x + wC * (cxy.C[i] as number));
    const b = solvePositiveDefinite(W, wxy);
    const resAbout = (slope: number[]): number =>
      pool(
        varY.P - 2 * dot(slope, cxy.P) + dot(slope, multiplyVector(sxm.P, slope)),
        varY.C - 2 * dot(slope, cxy.C) + dot(slope, multiplyVector(sxm.C, slope)),
      );
    const sigma2 = resAbout(b);
    const inv = 1 / nP + 1 / nC;
    const dx = pick(cm.gap, m);
    const df = nP + nC - 2 - m.length;
    if (id === 'ancova') {
      const lever = dot(dx, solvePositiveDefinite(W, dx));
      result = { se: Math.sqrt(sigma2 * (inv + lever)), df, nProgramme: nP, nComparison: nC };
    } else if (id === 'gainScore') {
      const v = pool(varY.P + (sX.P[0]![0] as number) - 2 * (tb.P[0] as number), varY.C + (sX.C[0]![0] as number) - 2 * (tb.C[0] as number));
      result = { se: Math.sqrt(v * inv), df: nP + nC - 2, nProgramme: nP, nComparison: nC };
    } else {
      const rhoA = requireReliability(options.assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      const sPooled = W.map((row) => row.map((x) => x / (wP + wC)));
      const rel = m.map((j) => (j === 0 ? rhoA : (cm.reliability.pooled[j] as number)));
      const assumed = sPooled.map((row, i) => row.map((x, j) => (i === j ? x * (rel[i] as number) : x)));
      // b~ = Sigma_T'^-1 S_X b ; M' dx = S_X Sigma_T'^-1 dx (both symmetric).
      const bt = solvePositiveDefinite(assumed, multiplyVector(sPooled, b));
      const mdx = multiplyVector(sPooled, solvePositiveDefinite(assumed, dx));
      const sigma2c = resAbout(bt);
      const se = Math.sqrt(sigma2c * inv + sigma2 * dot(mdx, solvePositiveDefinite(W, mdx)));
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
