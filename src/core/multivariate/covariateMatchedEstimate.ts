import type { MatchingDistance } from '../plan';
import type { CovariateModel } from './covariateModel';
import { block, dot, multiplyVector, pick, solvePositiveDefinite, transpose } from './linearAlgebra';

/**
 * The linear scores that matching makes equal within a matched set, as rows of
 * weights over all variables (pretest first; unmeasured variables weigh 0).
 * Every distance matches exact covariates exactly, so each exact covariate
 * adds a row e_j. Then:
 * - "pretest": the row e_0 (the observed pretest);
 * - "mahalanobis": a row e_j for every measured variable (exact matching on all
 *   of them is the limit of a caliper shrinking to 0);
 * - "propensity": one row, the population linear propensity score (logit)
 *   gamma = Sigma_X[m, m]^-1 Delta[m] over the measured variables m, with the
 *   pooled within-group covariance (with equal within-group covariances and
 *   normal covariates the log-odds of programme membership are exactly linear
 *   with these slopes: Fisher's linear discriminant; Rosenbaum & Rubin 1983,
 *   from memory). When Delta[m] = 0 the score is constant and adds no row.
 * Rows that are linear combinations of earlier ones are dropped.
 *
 * @param cm the covariate model. @param distance the plan's matching distance.
 * @returns q rows of p weights (q ≥ 0).
 * @throws never for a valid model.
 * @example pretest only, no exact covariates → [[1, 0, …, 0]]
 */
export function matchingScoreWeights(cm: CovariateModel, distance: MatchingDistance): number[][] {
  const p = cm.names.length;
  const unit = (j: number): number[] => Array.from({ length: p }, (_, i) => (i === j ? 1 : 0));
  const rows = cm.exactIndices.map(unit);
  if (distance === 'pretest') rows.push(unit(0));
  else if (distance === 'mahalanobis') rows.push(...cm.measuredIndices.filter((j) => !cm.exact[j]).map(unit));
  else {
    const m = cm.measuredIndices;
    const slopes = solvePositiveDefinite(block(cm.sigmaX.pooled, m, m), pick(cm.gap, m));
    const gamma = Array.from({ length: p }, () => 0);
    m.forEach((j, t) => (gamma[j] = slopes[t] as number));
    rows.push(gamma);
  }
  return independentRows(rows, cm.sigmaX.comparison);
}

/**
 * Expected true-score gap (programme − comparison) per variable after exact
 * matching on the linear scores Z = A X (A = matchingScoreWeights) from an
 * unlimited comparison pool: Delta − Sigma_T,C A' (A Sigma_X,C A')^-1 A Delta.
 *
 * Derivation: within the comparison group, E[T | Z = z] = mu_C + Sigma_T,C A'
 * (A Sigma_X,C A')^-1 (z − A mu_C) (normal regression; cov(T, X) = Sigma_T since
 * errors are independent; Kelley 1947 in several variables). Averaged over the
 * programme's Z (mean A mu_P), the partners' true means are
 * mu_C + Sigma_T,C A'(A Sigma_X,C A')^-1 A Delta, while the programme members'
 * are mu_P. With the pretest alone this is (1 − rho_C)·Delta_0 for the pretest
 * (Thorndike 1942; Campbell & Erlebacher 1970).
 *
 * @param cm the covariate model. @param distance the matching distance.
 * @returns one gap per variable, in its own units (observed gaps of matched-on
 *   measured variables are 0; their true gaps are not).
 * @throws never for a valid model.
 * @example pretest only, rho_C .8, gap −10 → true pretest gap after −2
 */
export function expectedTrueGapAfterMatching(cm: CovariateModel, distance: MatchingDistance): number[] {
  return gapAfterScores(cm, matchingScoreWeights(cm, distance), cm.sigmaT.comparison);
}

/**
 * Expected observed gap per variable after matching (Sigma_X in place of
 * Sigma_T above): 0 for the variables matched on; for the others the part of
 * their gap that the matched-on scores do not account for.
 * @param cm the covariate model. @param distance the matching distance.
 * @returns one observed gap per variable. @throws never for a valid model.
 * @example pretest only → observed pretest gap after 0
 */
export function expectedObservedGapAfterMatching(cm: CovariateModel, distance: MatchingDistance): number[] {
  return gapAfterScores(cm, matchingScoreWeights(cm, distance), cm.sigmaX.comparison);
}

/**
 * Expected matched post-test difference for the plan's matching distance,
 * unlimited comparison pool and exact matching:
 * growthGap + tau + beta' (Delta − Sigma_T,C A' (A Sigma_X,C A')^-1 A Delta).
 * For "pretest" this is growthGap + tau + beta'(Delta − Sigma_T[:, 0] Sigma_X[0, 0]^-1 Delta_0);
 * for "mahalanobis" (and for "propensity" when the groups' covariances are
 * equal) growthGap + tau + beta'(Delta − Sigma_T[:, m] Sigma_X[m, m]^-1 Delta[m]).
 * With the pretest only it equals matchedDifferenceEstimate:
 * tau + delta + beta(1 − rho_C)·Delta.
 *
 * Reference: Thorndike (1942); Campbell & Erlebacher (1970); Cochran & Rubin
 * (1973) on matching with fallible covariates; Rosenbaum & Rubin (1983) on the
 * propensity score as a balancing score. Derivation in expectedTrueGapAfterMatching (computed).
 *
 * @param cm the covariate model. @param distance the matching distance.
 * @returns expected estimate, posttest points.
 * @throws never for a valid model.
 * @example pretest only, gap 15, rho .9, beta 1, tau 0 → 1.5
 */
export function covariateMatchedEstimate(cm: CovariateModel, distance: MatchingDistance): number {
  return cm.growthGap + cm.effect + dot(cm.beta, expectedTrueGapAfterMatching(cm, distance));
}

/** Delta − S A' (A Sigma_X,C A')^-1 A Delta, for S = Sigma_T,C or Sigma_X,C. */
function gapAfterScores(cm: CovariateModel, a: number[][], s: number[][]): number[] {
  if (a.length === 0) return [...cm.gap];
  const sx = cm.sigmaX.comparison;
  const at = transpose(a);
  const scoreVar = a.map((row) => a.map((other) => dot(row, multiplyVector(sx, other))));
  const coef = solvePositiveDefinite(scoreVar, multiplyVector(a, cm.gap));
  const shift = multiplyVector(s, multiplyVector(at, coef));
  return cm.gap.map((d, i) => d - (shift[i] as number));
}

/** Rows of A with any row that is (numerically) a combination of earlier rows removed, in the metric S. */
function independentRows(rows: number[][], s: number[][]): number[][] {
  const kept: number[][] = [];
  for (const row of rows) {
    const variance = dot(row, multiplyVector(s, row));
    if (!(variance > 0)) continue;
    const candidate = [...kept, row];
    const gram = candidate.map((u) => candidate.map((v) => dot(u, multiplyVector(s, v))));
    // Residual variance of the new row given the kept ones (Schur complement).
    const cross = gram[gram.length - 1]!.slice(0, -1);
    const residual = kept.length === 0 ? variance : variance - dot(cross, solvePositiveDefinite(gram.slice(0, -1).map((r) => r.slice(0, -1)), cross));
    if (residual > 1e-10 * variance) kept.push(row);
  }
  return kept;
}
