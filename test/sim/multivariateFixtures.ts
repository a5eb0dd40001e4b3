import type { CovariateSpec, Plan } from '../../src/core/plan';
import { covariate } from '../fixtures/covariatePlans';
import { testPlan } from './planFixtures';

/**
 * Invented covariates for tests (no real study): attendance (fallible), a
 * motivation scale nobody measured, and age in whole years (error-free,
 * matched exactly). Correlations are invented too.
 */
export const ATTENDANCE: CovariateSpec = covariate();
export const MOTIVATION: CovariateSpec = covariate({ name: 'Motivation', programmeMean: 47, comparisonMean: 50, reliability: 0.8, measured: false });
export const AGE: CovariateSpec = covariate({
  name: 'Age',
  programmeMean: 40,
  comparisonMean: 42,
  sd: 8,
  reliability: 1,
  outcomeCorrelation: 0.2,
  exact: true,
});

/**
 * An invented several-covariate plan: testPlan's pools and pretest plus the
 * given covariates, with correlations r_ij (pretest first) taken from `r`
 * (a full matrix), and matching overrides.
 */
export function covariatePlan(options: {
  covariates: CovariateSpec[];
  correlations: number[][];
  base?: Parameters<typeof testPlan>[0];
}): Plan {
  const plan = testPlan(options.base ?? {});
  plan.covariates = options.covariates.map((c) => ({ ...c }));
  plan.covariateCorrelations = options.correlations.map((row) => [...row]);
  return plan;
}
