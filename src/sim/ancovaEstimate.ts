import { ancovaOnCovariates, createGroupMoments, type GroupMoments, type StackedComparison } from './multivariate/ancovaOnCovariates';

/**
 * The two-group ANCOVA estimate of the programme effect from within-group
 * moments, one covariate X, common slope (Lord 1960; any regression text,
 * e.g. Maxwell & Delaney 2004, ch. 9), with a standard error that holds for
 * the estimator under unequal group variances. With
 * `reliabilityCorrection` rho' < 1 it is Porter's (1967) corrected ANCOVA:
 * X is replaced within each group by X̄_g + rho' (X − X̄_g), which divides the
 * pooled within-group slope by rho'. With c = 1/rho':
 *
 *   b0 = (Sxy_P + Sxy_C) / (Sxx_P + Sxx_C),   b = c·b0
 *   estimate θ̂ = (Ȳ_P − Ȳ_C) − b (X̄_P − X̄_C)
 *
 * SE — delta method, group-wise (docs/simulation.md, "Standard errors"):
 * θ̂ = Σ_g ±(Ȳ_g − b X̄_g); linearising in the group means and in b0 (under
 * normal scores the sample means are independent of the within-group sums of
 * products, so the two parts add):
 *
 *   Var(θ̂) ≈ Σ_g s²_{D,g} / n_g + c² ΔX̄² Var(b0),
 *   s²_{D,g} = (Syy_g − 2b Sxy_g + b² Sxx_g) / (n_g − 1)   (the variance of Y − bX in group g),
 *   Var(b0) = Σ_g Sxx_g σ̂²_g / Sxx²,   σ̂²_g = (Syy_g − Sxy_g² / Sxx_g) / (n_g − 2)
 *
 * (σ̂²_g is group g's own residual variance of Y given X; the groups'
 * variances differ under the model because their reliabilities differ).
 * Unlike the OLS SE this counts the sampling variance of the group pretest
 * means that the correction multiplies (c ≠ 1), and does not assume equal
 * residual variances (c = 1 too). df: Welch–Satterthwaite (Welch 1947), each
 * group's share u_g = s²_{D,g}/n_g + c² ΔX̄² Sxx_g σ̂²_g / Sxx² taken as a
 * scaled chi-square on n_g − 2 df (welchSatterthwaite). Computed by the
 * several-covariate ancovaOnCovariates with p = 1 and Λ = [rho'] (one code
 * path for both engines); a group whose X has no spread uses the pooled
 * residual variance instead of its own.
 *
 * Stacked comparison rows (ANCOVA in a matched sample with replacement, a
 * comparison member used n_j times appearing n_j times): pass `stacked`
 * (the use counts, the comparison pretest column and σ²_C) with the
 * comparison moments taken over the stacked rows (n_C = Σ n_j = N); with
 * Q = Σ n_j² (x_j − x̄_C)² the
 * comparison share is then s²_{D,C} Σn_j²/N² + c² ΔX̄² σ²_C Q / Sxx², with
 * s²_{D,C} the weighted variance of Y − bX over distinct members (divisor
 * N − Σn_j²/N, unbiased for independent values under fixed weights), σ²_C the
 * comparison group's conditional variance of Y given X (from the full pool),
 * and df from Kish's (1965) effective size N²/Σn_j² − 2. Without reuse
 * (every n_j = 1) this is the ordinary group-wise form.
 *
 * What a naive analysis would report: the OLS SE s·sqrt(1/n_P + 1/n_C +
 * ΔX̄² / (rho'² Sxx)), s² = (Syy − b0² Sxx)/(n − 3), df n − 3, written to
 * out[3], out[4] when `out` has room (rho' treated as known, equal residual
 * variances, reused rows independent).
 *
 * @param m Float64Array [nP, meanXP, meanYP, SxxP, SxyP, SyyP, nC, meanXC, meanYC, SxxC, SxyC, SyyC];
 *   S.. are within-group sums of squares and cross-products about the group means (points²).
 * @param reliabilityCorrection rho' in (0, 1]; 1 gives ordinary ANCOVA.
 * @param out Float64Array(3 or 5) receiving [estimate, SE, df] (and [naive OLS SE, n − 3]).
 * @param stacked stacked comparison rows' reuse (StackedComparison, one column), or null (each row a distinct person).
 * @returns false when the estimate cannot be computed (fewer than 3 people, or 3 effective, in a
 *   group, no within-group covariate variation, or zero residual variance); `out` is then untouched.
 * @throws never.
 * @example
 *   // P: X̄ 10, Ȳ 12; C: X̄ 12, Ȳ 13; Sxx 10+10, Sxy 5+5 → b = 0.5, estimate = -1 + 1 = 0 (hand-worked).
 */
export function ancovaEstimate(
  m: Float64Array,
  reliabilityCorrection: number,
  out: Float64Array,
  stacked: StackedComparison | null = null,
): boolean {
  fill(ONE_P, m, 0);
  fill(ONE_C, m, 6);
  if (reliabilityCorrection === 1) return ancovaOnCovariates(ONE_P, ONE_C, null, out, stacked);
  LAMBDA[0] = reliabilityCorrection;
  return ancovaOnCovariates(ONE_P, ONE_C, LAMBDA, out, stacked);
}

// One-covariate moments and Λ = [rho'], reused by every call (no allocation per replication).
const ONE_P = createGroupMoments(1);
const ONE_C = createGroupMoments(1);
const LAMBDA = new Float64Array(1);

function fill(G: GroupMoments, m: Float64Array, at: number): void {
  G.n = m[at] as number;
  G.means[0] = m[at + 1] as number;
  G.meanY = m[at + 2] as number;
  G.sxx[0] = m[at + 3] as number;
  G.sxy[0] = m[at + 4] as number;
  G.syy = m[at + 5] as number;
}
