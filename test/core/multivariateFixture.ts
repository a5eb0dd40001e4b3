import type { CovariateSpec, Plan } from '../../src/core/plan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { demoPlan } from '../../src/io/demoPlan';

/** A covariate with defaults (invented values), overridable: the shared test fixture. */
export { covariate } from '../fixtures/covariatePlans';

/** The demo plan (invented) with the given covariates and correlation matrix. */
export function planWithCovariates(covariates: CovariateSpec[], correlations: number[][], base: Plan = demoPlan()): Plan {
  const p = structuredClone(base);
  p.covariates = covariates;
  p.covariateCorrelations = correlations;
  return p;
}

/** The invented after-school maths example (several covariates, one unmeasured), a fresh copy. */
export function afterSchoolMaths(): Plan {
  return structuredClone(AFTER_SCHOOL_MATHS);
}

/** An identity matrix of size n (correlations all zero). */
export function identity(n: number): number[][] {
  return Array.from({ length: n }, (_, i) => Array.from({ length: n }, (_, j) => (i === j ? 1 : 0)));
}

/**
 * A one-factor correlation matrix r_ij = l_i l_j (i ≠ j): positive definite whenever
 * every |l_i| < 1 (common practice: a one-factor model with positive uniquenesses).
 */
export function oneFactor(loadings: number[]): number[][] {
  return loadings.map((a, i) => loadings.map((b, j) => (i === j ? 1 : a * b)));
}
