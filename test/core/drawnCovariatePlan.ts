import type { CovariateSpec, Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { covariate } from './multivariateFixture';

/** A property test's draws for k covariates (arrays at least k long). */
export interface CovariateDraws {
  k: number;
  /** Programme minus comparison, in the covariate's SDs. */
  gaps: number[];
  rels: number[];
  outs: number[];
  measured: boolean[];
}

/**
 * Invented covariates C1…Ck from a property test's draws: SD `sd`, comparison
 * mean 0, programme mean gap_j × sd, and the drawn reliability, outcome
 * correlation and measured flag.
 */
export function drawnCovariates(o: CovariateDraws, sd: number): CovariateSpec[] {
  return Array.from({ length: o.k }, (_, j) =>
    covariate({
      name: `C${j + 1}`,
      programmeMean: sd * o.gaps[j]!,
      comparisonMean: 0,
      sd,
      reliability: o.rels[j]!,
      outcomeCorrelation: o.outs[j]!,
      measured: o.measured[j]!,
    }),
  );
}

/** The demo plan (invented) with the drawn programme pretest SD and a pretest of reliability .8 at reference SD 8. */
export function drawnBasePlan(programmePretestSD: number): Plan {
  const base = demoPlan();
  base.groups.programme.pretestSD = programmePretestSD;
  base.pretest = { reliability: 0.8, referenceSD: 8 };
  return base;
}
