import type { CovariateModel } from '../../core/multivariate/covariateModel';

/**
 * What the several-covariate engine's parts need from the generating model:
 * a subset of the core's CovariateModel (deriveCovariateModel, src/core/multivariate),
 * so the parts can be tested with hand-made models while the engine always
 * takes the core's model (simulation and closed forms describe the same world).
 *
 * Variables are indexed pretest first (0), then the plan's covariates in order.
 * Model in group g (Lord & Novick 1968 ch. 3; docs/covariates.md):
 *   T ~ N(mean_g, sigmaT_g),  X = T + E,  E_j ~ N(0, sem_j²) independent,
 *   Y = d_g + beta'T + tau [g = P] + e,  e ~ N(0, residualSD²),  d_P − d_C = growthGap.
 */
export type CovariateSimModel = Pick<
  CovariateModel,
  'names' | 'measured' | 'exact' | 'mean' | 'sem' | 'beta' | 'residualSD' | 'growthGap' | 'effect' | 'n'
> & {
  sigmaT: Pick<CovariateModel['sigmaT'], 'programme' | 'comparison'>;
};
