import type { AnalysisId } from './plan';
import type { ModelParameters } from './modelParameters';
import { formatNumber, requireReliability } from './inputChecks';

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
 *   caliper's leftover X differences and partner re-use with replacement.
 *   `sizes.programme` is the number of matched programme members (values below
 *   2 are raised to 2 so the SE stays finite).
 * - ancova: pooled within-group residual variance σ² of Y about the pooled
 *   slope b = Σ(n_g−1)·beta·trueVar_g / Σ(n_g−1)·s_g²; SE² = σ²(1/n_P + 1/n_C + ΔX²/SS_X),
 *   df = n_P + n_C − 3 (standard ANCOVA variance of an adjusted difference; Cochran 1957, from memory).
 * - gainScore: pooled var(Y − X) = var(Y) + s² − 2·beta·trueVar per group;
 *   SE² = v(1/n_P + 1/n_C), df = n_P + n_C − 2 (two-sample t test).
 * - correctedAncova: estimate ΔȲ − (b/rho')ΔX̄; SE² = σ²_c(1/n_P + 1/n_C) + ΔX²·σ²/(rho'²·SS_X),
 *   σ²_c the pooled residual variance of Y − (b/rho')(X − X̄_g), σ² the ANCOVA one.
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
    const wP = nP - 1;
    const wC = nC - 1;
    const pool = (a: number, c: number): number => (wP * a + wC * c) / (wP + wC);
    const ssx = wP * sx2.P + wC * sx2.C;
    const dx = m.pretestGap;
    const b = (wP * cov.P + wC * cov.C) / ssx;
    const resAbout = (slope: number): number =>
      pool(varY.P - 2 * slope * cov.P + slope * slope * sx2.P, varY.C - 2 * slope * cov.C + slope * slope * sx2.C);
    const sigma2 = resAbout(b);
    const inv = 1 / nP + 1 / nC;
    if (id === 'ancova') {
      result = { se: Math.sqrt(sigma2 * (inv + (dx * dx) / ssx)), df: nP + nC - 3, nProgramme: nP, nComparison: nC };
    } else if (id === 'gainScore') {
      const v = pool(varY.P + sx2.P - 2 * cov.P, varY.C + sx2.C - 2 * cov.C);
      result = { se: Math.sqrt(v * inv), df: nP + nC - 2, nProgramme: nP, nComparison: nC };
    } else {
      const rhoA = requireReliability(options.assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      const sigma2c = resAbout(b / rhoA);
      const se = Math.sqrt(sigma2c * inv + (dx * dx * sigma2) / (rhoA * rhoA * ssx));
      result = { se, df: nP + nC - 3, nProgramme: nP, nComparison: nC };
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
