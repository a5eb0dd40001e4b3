import type { AnalysisId } from './plan';
import type { ModelParameters } from './modelParameters';
import { adjustedDifferenceStandardError } from './adjustedDifferenceStandardError';
import { formatNumber, requireReliability } from './inputChecks';
import { welchSatterthwaiteDf } from './welchSatterthwaiteDf';

/** Approximate sampling precision of one analysis for given sample sizes. */
export interface StandardErrorResult {
  /** Approximate standard error of the estimate, posttest points (> 0). */
  se: number;
  /** Degrees of freedom of the t test. */
  df: number;
  /** Programme members the SE assumes (matched members for the matched difference). */
  nProgramme: number;
  /** Comparison members the SE assumes (k per matched programme member for the matched difference). */
  nComparison: number;
}

/** Options an analysis' SE depends on. */
export interface StandardErrorOptions {
  /** rho' of the reliability-corrected ANCOVA, in (0, 1]. */
  assumedReliability: number;
  /** Comparison partners per matched programme member (k ≥ 1). */
  ratio: number;
}

/**
 * Approximate standard error and degrees of freedom of each analysis' estimate,
 * from the model's variances (large-sample approximations; the simulation
 * gives the exact figures for the planned procedure).
 *
 * - matchedDifference: n matched sets of 1 programme member and k partners;
 *   SE² = (v_P + v_C/k)/n + beta²(rho_P − rho_C)²·s_P²/n, df = n − 1, where
 *   v_g = var(Y | X, g) = beta²·trueVar_g·(1 − rho_g) + residualVar (Kelley
 *   regression of T on X; the second term is the spread of the pair
 *   differences' means when the groups' reliabilities differ). Ignores the
 *   caliper's leftover X differences and partner re-use with replacement
 *   (a comparison member used for several programme members makes the pair
 *   differences correlated, so the SE is too small when reuse is common;
 *   Abadie & Imbens 2006).
 *   `sizes.programme` is the number of matched programme members (values below
 *   2 are raised to 2 so the SE stays finite; analyseAnalysis reports such a
 *   matching as infeasible instead of using this figure).
 * - gainScore: each group's own v_g = var(Y − X) = var(Y) + s_g² − 2·beta·trueVar_g;
 *   SE² = v_P/n_P + v_C/n_C with the Welch–Satterthwaite df (Welch 1947). With
 *   equal variances and equal n it is the pooled two-sample t (df 2n − 2).
 * - ancova and correctedAncova: the estimate ΔȲ − c·b̂·ΔX̄, b̂ the pooled
 *   within-group slope, c = 1 for ANCOVA and 1/rho' for the corrected ANCOVA
 *   (Porter 1967). Delta-method variance (see adjustedDifferenceStandardError):
 *   SE² ≈ Σ_g (varY_g − 2c·b*·cov_g + c²b*²·s_g²)/n_g + c²·ΔX²·Var(b̂),
 *   Var(b̂) ≈ Σ_g (n_g − 1)(s_g²·r_g + d_g²)/SS_X², with b* = Σ(n_g − 1)cov_g / SS_X,
 *   SS_X = Σ(n_g − 1)s_g², r_g = varY_g − 2b*cov_g + b*²s_g² (residual variance
 *   about the pooled slope) and d_g = cov_g − b*·s_g². The first sum carries
 *   the sampling variance of the group pretest means the correction multiplies
 *   by c. df: Welch–Satterthwaite on the two group terms, minus 1 for the slope.
 *   With equal group variances it is the pooled ANCOVA SE σ²(1/n_P + 1/n_C + ΔX²/SS_X)
 *   (Cochran 1957, from memory), with df n_P + n_C − 3 when n_P = n_C.
 *
 * @param id analysis. @param m model parameters.
 * @param sizes programme and comparison sample sizes (≥ 2 each; for the matched
 *   difference the programme figure is matched members and the comparison one is ignored).
 * @param options assumed reliability and matching ratio.
 * @returns { se, df, nProgramme, nComparison }.
 * @throws Error when a size is below 2 (full-sample analyses), the assumed
 *   reliability is out of range, or the variance is zero (outcome fully predicted).
 * @example ANCOVA, gap 0, rho .8, beta 1, residual SD 5, SD 10, 100 per group:
 *   σ² = 100·.8·.2 + 25 = 41, SE = sqrt(41·0.02) ≈ 0.906
 */
export function analysisStandardError(
  id: AnalysisId,
  m: ModelParameters,
  sizes: { programme: number; comparison: number },
  options: StandardErrorOptions,
): StandardErrorResult {
  const resVar = m.residualSD ** 2;
  const tv = { P: m.trueSD.programme ** 2, C: m.trueSD.comparison ** 2 };
  const sx2 = { P: m.observedSD.programme ** 2, C: m.observedSD.comparison ** 2 };
  const rho = { P: m.reliability.programme, C: m.reliability.comparison };
  const b0 = m.beta;
  const varY = { P: b0 * b0 * tv.P + resVar, C: b0 * b0 * tv.C + resVar };
  const cov = { P: b0 * tv.P, C: b0 * tv.C };

  let result: StandardErrorResult;
  if (id === 'matchedDifference') {
    const k = options.ratio;
    if (!(k >= 1)) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(k)}.`);
    const n = Math.max(2, sizes.programme);
    const vP = b0 * b0 * tv.P * (1 - rho.P) + resVar;
    const vC = b0 * b0 * tv.C * (1 - rho.C) + resVar;
    const slopeSpread = b0 * b0 * (rho.P - rho.C) ** 2 * sx2.P;
    result = { se: Math.sqrt((vP + vC / k + slopeSpread) / n), df: n - 1, nProgramme: n, nComparison: k * n };
  } else {
    const nP = sizes.programme;
    const nC = sizes.comparison;
    if (!(nP >= 2 && nC >= 2)) {
      throw new Error(
        `Each group needs at least 2 people for this analysis; got ${formatNumber(nP)} and ${formatNumber(nC)}.`,
      );
    }
    if (id === 'gainScore') {
      // Welch (1947): each group's own var(Y − X) over its own n, Welch–Satterthwaite df.
      const vP = (varY.P + sx2.P - 2 * cov.P) / nP;
      const vC = (varY.C + sx2.C - 2 * cov.C) / nC;
      const df = vP + vC > 0 ? welchSatterthwaiteDf([{ variance: vP, df: nP - 1 }, { variance: vC, df: nC - 1 }]) : nP + nC - 2;
      result = { se: Math.sqrt(vP + vC), df, nProgramme: nP, nComparison: nC };
    } else {
      const c =
        id === 'ancova'
          ? 1
          : 1 / requireReliability(options.assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      const group = (g: 'P' | 'C', n: number) => ({ n, varY: varY[g], covXY: [cov[g]], covX: [[sx2[g]]] });
      const { se, df } = adjustedDifferenceStandardError(group('P', nP), group('C', nC), [m.pretestGap], [[c]]);
      result = { se, df, nProgramme: nP, nComparison: nC };
    }
  }
  if (!(result.se > 0) || !Number.isFinite(result.se)) {
    throw new Error(
      'The standard error of this analysis is zero or undefined: the outcome would be predicted perfectly by the pretest. ' +
        'Check the pre–post correlation and the reliability.',
    );
  }
  return result;
}
