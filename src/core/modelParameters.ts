import type { Plan } from './plan';

/**
 * The generating model's parameters, derived from a plan's researcher-facing
 * inputs (see deriveModelParameters). Every analytic formula and the Monte
 * Carlo engine draw from this one object, so both describe the same world.
 *
 * Model (classical test theory; Lord & Novick 1968):
 *   T ~ N(mu_g, trueSD_g^2),  X = T + E, E ~ N(0, sem^2),
 *   Y = a + d_g + beta T + tau [g = P] + e,  e ~ N(0, residualSD^2).
 */
export interface ModelParameters {
  /** True (= observed) pretest means, test points. */
  mean: { programme: number; comparison: number };
  /** Programme minus comparison true-score mean, test points (Delta). */
  pretestGap: number;
  /** Observed within-group pretest SDs. */
  observedSD: { programme: number; comparison: number };
  /** True-score within-group SDs. */
  trueSD: { programme: number; comparison: number };
  /** Standard error of measurement (common to both groups). */
  sem: number;
  /** Within-group reliabilities, and the pooled (pool-size weighted) one used by ANCOVA. */
  reliability: { programme: number; comparison: number; pooled: number };
  /** True-score stability slope of the outcome on the true pretest. */
  beta: number;
  /** SD of the outcome's residual e. */
  residualSD: number;
  /** Within-group posttest SD in each group implied by the model. */
  posttestSD: { programme: number; comparison: number };
  /** Growth gap d_P - d_C (delta), posttest points. */
  growthGap: number;
  /** Programme effect tau in posttest points. */
  effect: number;
  /** Pool sizes. */
  n: { programme: number; comparison: number };
}
