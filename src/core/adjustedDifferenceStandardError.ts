import { dot, multiplyVector, solvePositiveDefinite, transpose } from './multivariate/linearAlgebra';
import { welchSatterthwaiteDf } from './welchSatterthwaiteDf';

/** One group's population moments of the outcome Y and the adjusted variables X, and its size. */
export interface GroupMoments {
  /** People in the group (≥ 2). */
  n: number;
  /** var(Y) within the group, squared posttest points (> 0). */
  varY: number;
  /** cov(X, Y) within the group, one entry per adjusted variable. */
  covXY: readonly number[];
  /** Cov(X) within the group (positive definite), one row and column per adjusted variable. */
  covX: readonly (readonly number[])[];
}

/**
 * Large-sample standard error and Welch–Satterthwaite-type df of a
 * covariate-adjusted mean difference θ̂ = ΔȲ − (M b̂)'ΔX̄, where b̂ is the
 * pooled within-group slope vector (weights n_g − 1) and M a fixed matrix:
 * the identity for ordinary ANCOVA, 1/rho' (one variable) or
 * Sigma_T'^-1 S_X (several) for the reliability-corrected ANCOVA of Porter (1967).
 *
 * Delta method (first-order expansion about b*, the probability limit of b̂;
 * group means are independent of the within-group sums of products under
 * normality, so there is no cross term):
 *
 *   b*  = W^-1 Σ_g w_g cov_g(X, Y),  W = Σ_g w_g Cov_g(X),  w_g = n_g − 1
 *   γ   = M b*
 *   a_g = (varY_g − 2 γ'cov_g(X, Y) + γ'Cov_g(X) γ) / n_g        (the group mean terms)
 *   r_g = varY_g − 2 b*'cov_g(X, Y) + b*'Cov_g(X) b*              (residual variance about b*)
 *   d_g = cov_g(X, Y) − Cov_g(X) b*                              (0 when the group's own slope is b*)
 *   u   = W^-1 M'ΔX
 *   Var(θ̂) ≈ a_P + a_C + Σ_g w_g (r_g u'Cov_g(X)u + (u'd_g)²)
 *   df = Welch–Satterthwaite on a_P (n_P − 1) and a_C (n_C − 1), minus the number of slopes (at least 1).
 *
 * The last term is ΔX' M Var(b̂) M'ΔX with Var(b̂) ≈ W^-1 Σ_g w_g (r_g Cov_g(X) + d_g d_g') W^-1
 * (normal fourth moments, Isserlis 1918). M is treated as known: the sampling
 * variation of an estimated S_X inside M (several variables) is ignored.
 * With the same moments in both groups it equals the pooled textbook variance
 * σ²(1/n_P + 1/n_C + ΔX'W^-1ΔX) for ANCOVA (Cochran 1957, from memory), and
 * with equal n as well its df is the pooled n_P + n_C − 2 − p.
 * References: delta method (e.g. Casella & Berger 2002, §5.5.4); Welch (1947), Biometrika 34, 28–35;
 * Porter (1967) for the corrected estimator.
 *
 * @param P programme group's moments. @param C comparison group's moments (same number of variables p ≥ 1).
 * @param gap ΔX = programme minus comparison mean of X, one entry per variable (points).
 * @param M p × p matrix applied to the pooled slopes (identity for ANCOVA).
 * @returns { se (points, > 0 unless the outcome is fully predicted), df (≥ 1) }.
 * @throws Error when a group has fewer than 2 people (from the df), or W is not positive definite.
 * @example one variable, groups alike (varY 105, cov 80, varX 100), n 100 each, ΔX 0, M = [[1]]:
 *   se = sqrt(41·0.02) ≈ 0.906, df = 197
 */
export function adjustedDifferenceStandardError(
  P: GroupMoments,
  C: GroupMoments,
  gap: readonly number[],
  M: readonly (readonly number[])[],
): { se: number; df: number } {
  const groups = [P, C];
  const p = gap.length;
  const w = groups.map((g) => g.n - 1);
  const W = P.covX.map((row, i) => row.map((x, j) => w[0]! * x + w[1]! * (C.covX[i]![j] as number)));
  const wxy = P.covXY.map((x, i) => w[0]! * x + w[1]! * (C.covXY[i] as number));
  const bStar = solvePositiveDefinite(W, wxy);
  const gamma = multiplyVector(M, bStar);
  const quad = (S: readonly (readonly number[])[], v: readonly number[]): number => dot(v, multiplyVector(S, v));
  const a = groups.map((g) => (g.varY - 2 * dot(gamma, g.covXY) + quad(g.covX, gamma)) / g.n);
  const u = solvePositiveDefinite(W, multiplyVector(transpose(M), gap));
  let slopeTerm = 0;
  groups.forEach((g, k) => {
    const r = g.varY - 2 * dot(bStar, g.covXY) + quad(g.covX, bStar);
    const d = g.covXY.map((x, i) => x - dot(g.covX[i]!, bStar));
    slopeTerm += w[k]! * (r * quad(g.covX, u) + dot(u, d) ** 2);
  });
  const variance = a[0]! + a[1]! + slopeTerm;
  const terms = [
    { variance: Math.max(0, a[0]!), df: w[0]! },
    { variance: Math.max(0, a[1]!), df: w[1]! },
  ];
  // Both mean terms zero only when the outcome is fully predicted; the caller reports that.
  const ws = terms[0]!.variance + terms[1]!.variance > 0 ? welchSatterthwaiteDf(terms) : w[0]! + w[1]!;
  const df = Math.max(1, ws - p);
  return { se: Math.sqrt(variance), df };
}
