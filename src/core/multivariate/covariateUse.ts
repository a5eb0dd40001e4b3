import type { MatchingDistance, Plan } from '../plan';

/**
 * Whether a plan needs the several-covariate model: it lists at least one
 * covariate, or it matches on a propensity score or Mahalanobis distance.
 * Plans that do not (no covariates, distance "pretest" or unset) keep the
 * one-pretest formulas unchanged, bit for bit.
 * @param plan a validated plan.
 * @returns true when analysePlan and the engine use the covariate model.
 * @throws never.
 * @example usesCovariateModel(demoPlan()) // false
 */
export function usesCovariateModel(plan: Plan): boolean {
  return (plan.covariates?.length ?? 0) > 0 || matchingDistance(plan) !== 'pretest';
}

/**
 * The plan's matching distance, "pretest" when unset.
 * @param plan a plan. @returns 'pretest' | 'propensity' | 'mahalanobis'. @throws never.
 * @example matchingDistance(demoPlan()) // 'pretest'
 */
export function matchingDistance(plan: Plan): MatchingDistance {
  return plan.matching.distance ?? 'pretest';
}
