import { demoPlan } from '../../src/io/demoPlan';
import type { Plan } from '../../src/core/plan';

/**
 * INVENTED: the demo plan with covariates a falls-prevention evaluation might match on: grip
 * strength (reliability .85), self-reported weekly activity (.6), living alone (a 0/1 record,
 * matched exactly) and an unmeasured fear-of-falling scale; matched on the propensity score.
 */
export function demoWithCovariates(distance: 'propensity' | 'mahalanobis', scale: number, comparisonMean?: number): Plan {
  const p = demoPlan();
  if (comparisonMean !== undefined) p.groups.comparison.pretestMean = comparisonMean;
  p.groups.programme.poolSize *= scale;
  p.groups.comparison.poolSize *= scale;
  p.matching = { ...p.matching, distance, caliper: distance === 'mahalanobis' ? 0.5 : 0.2 };
  p.covariates = [
    { name: 'Grip strength', programmeMean: 24, comparisonMean: 28, sd: 8, reliability: 0.85, outcomeCorrelation: 0.35, measured: true, exact: false },
    { name: 'Weekly activity', programmeMean: 4, comparisonMean: 6, sd: 3, reliability: 0.6, outcomeCorrelation: 0.3, measured: true, exact: false },
    { name: 'Lives alone', programmeMean: 0.55, comparisonMean: 0.4, sd: 0.5, reliability: 1, outcomeCorrelation: -0.1, measured: true, exact: true },
    { name: 'Fear of falling', programmeMean: 6, comparisonMean: 4.5, sd: 2, reliability: 0.8, outcomeCorrelation: -0.3, measured: false, exact: false },
  ];
  p.covariateCorrelations = [
    [1, 0.4, 0.3, -0.1, -0.3],
    [0.4, 1, 0.3, 0, -0.2],
    [0.3, 0.3, 1, 0, -0.25],
    [-0.1, 0, 0, 1, 0.1],
    [-0.3, -0.2, -0.25, 0.1, 1],
  ];
  return p;
}
