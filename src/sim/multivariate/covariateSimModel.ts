/**
 * What the several-covariate engine needs from the generating model: the
 * subset of src/core/multivariate's CovariateModel (deriveCovariateModel) the
 * simulation draws from. Declared here structurally so the engine's parts can
 * be tested with hand-made models; the engine itself always takes the core's
 * model, so simulation and closed forms describe the same world.
 *
 * Variables are indexed pretest first (0), then the plan's covariates in order.
 * Model in group g (Lord & Novick 1968 ch. 3; DESIGN.md):
 *   T ~ N(mean_g, sigmaT_g),  X = T + E,  E_j ~ N(0, sem_j²) independent,
 *   Y = d_g + beta'T + tau [g = P] + e,  e ~ N(0, residualSD²),  d_P − d_C = growthGap.
 */
export interface CovariateSimModel {
  /** Display names, "Pretest" first. */
  names: readonly string[];
  /** Whether each variable is observed (never matched or adjusted on when false). */
  measured: readonly boolean[];
  /** Whether each variable is matched exactly (only measured ones). */
  exact: readonly boolean[];
  /** Group means of each variable (observed = true). */
  mean: { programme: readonly number[]; comparison: readonly number[] };
  /** Within-group true-score covariance matrices. */
  sigmaT: { programme: readonly (readonly number[])[]; comparison: readonly (readonly number[])[] };
  /** Within-group observed covariance matrices (sigmaT + diag(sem²)). */
  sigmaX: { programme: readonly (readonly number[])[]; comparison: readonly (readonly number[])[] };
  /** Standard error of measurement per variable (0: error-free). */
  sem: readonly number[];
  /** The outcome's slopes on the true scores. */
  beta: readonly number[];
  /** SD of the outcome residual (> 0). */
  residualSD: number;
  /** d_P − d_C, posttest points. */
  growthGap: number;
  /** tau, posttest points. */
  effect: number;
  /** Pool sizes. */
  n: { programme: number; comparison: number };
}
