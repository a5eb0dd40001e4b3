import type { MatchingDistance, Plan } from '../src/core/plan';
import { demoPlan } from '../src/io/demoPlan';

/**
 * An invented plan shared by the chart, report and results tests: the demo's
 * groups and pretest, plus a measured covariate with its own error and group
 * gap (attendance) and a confounder that is never measured (motivation),
 * unless `motivationMeasured`. Invented values, no real study.
 */
export function inventedCovariatePlan(
  { distance = 'mahalanobis', motivationMeasured = false }: { distance?: MatchingDistance; motivationMeasured?: boolean } = {},
): Plan {
  const plan = demoPlan();
  return {
    ...plan,
    matching: { ...plan.matching, distance },
    covariates: [
      { name: 'Attendance', programmeMean: 85, comparisonMean: 90, sd: 10, reliability: 0.7, outcomeCorrelation: 0.3, measured: true, exact: false },
      { name: 'Motivation', programmeMean: -0.5, comparisonMean: 0, sd: 1, reliability: 1, outcomeCorrelation: 0.3, measured: motivationMeasured, exact: false },
    ],
    covariateCorrelations: [
      [1, 0.3, 0.2],
      [0.3, 1, 0.1],
      [0.2, 0.1, 1],
    ],
  };
}
