import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import { covariateModelProblems } from '../../src/core/multivariate/covariateModelProblems';
import type { Plan } from '../../src/core/plan';
import { type PlanProblem, validatePlan } from '../../src/core/validatePlan';
import { covariate, planWithCovariates } from './multivariateFixture';

// Every cross-field covariate rule with its exact message (validatePlan reports all at once).
// Numeric thresholds: a correlation matrix must be positive definite (common practice);
// a correlation corrected for attenuation, r / sqrt(rho_1 rho_2), cannot pass 1 (Spearman 1904);
// given r12 and r13, r23 lies in r12 r13 ± sqrt((1 − r12²)(1 − r13²)) (common practice, 3 × 3 determinant).

/** The demo (invented) with attendance, deprivation and a recorded flag; the pretest's within-group reliability is .75. */
function base(): Plan {
  return planWithCovariates(
    [
      covariate({ name: 'Attendance', reliability: 0.7, outcomeCorrelation: 0.3 }),
      covariate({ name: 'Deprivation', programmeMean: 6, comparisonMean: 5, sd: 2, reliability: 0.9, outcomeCorrelation: -0.2 }),
      covariate({ name: 'Recorded flag', programmeMean: 0.4, comparisonMean: 0.5, sd: 0.5, reliability: 1, outcomeCorrelation: 0.05, exact: true }),
    ],
    [
      [1, 0.3, -0.3, 0],
      [0.3, 1, -0.2, 0],
      [-0.3, -0.2, 1, 0],
      [0, 0, 0, 1],
    ],
  );
}

function problems(plan: unknown): PlanProblem[] {
  const r = validatePlan(plan);
  return r.ok ? [] : r.problems;
}

const setPair = (p: Plan, i: number, j: number, r: number): void => {
  p.covariateCorrelations![i]![j] = r;
  p.covariateCorrelations![j]![i] = r;
};

describe('covariate checks in validatePlan (exact messages)', () => {
  it('the base plan is valid and analysable', () => {
    expect(problems(base())).toEqual([]);
    expect(() => analysePlan(base())).not.toThrow();
  });

  it('matrix missing', () => {
    const p = base();
    delete p.covariateCorrelations;
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations',
        message:
          'The covariate correlation matrix is missing: with 3 covariates, give a 4 × 4 matrix of observed within-group correlations (the pretest, Attendance, Deprivation and Recorded flag, in that order).',
      },
    ]);
  });

  it('wrong number of rows; a row of the wrong length; a matrix without covariates', () => {
    const p = base();
    p.covariateCorrelations = p.covariateCorrelations!.slice(0, 3);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations',
        message:
          'The covariate correlation matrix must be 4 × 4 (the pretest, Attendance, Deprivation and Recorded flag, in that order); got 3 rows.',
      },
    ]);
    const q = base();
    q.covariateCorrelations![2] = [-0.3, -0.2, 1];
    expect(problems(q)).toEqual([
      {
        field: 'covariateCorrelations.2',
        message:
          'Row 3 of the covariate correlation matrix (Deprivation) must have 4 numbers, one per variable (the pretest, Attendance, Deprivation and Recorded flag, in that order); got 3.',
      },
    ]);
    const r = base();
    delete r.covariates;
    expect(problems(r)).toEqual([
      {
        field: 'covariateCorrelations',
        message: 'The covariate correlation matrix must be 1 × 1 (the pretest alone), since no covariates are listed; got 4 rows.',
      },
    ]);
  });

  it('not symmetric and a diagonal entry other than 1, both reported', () => {
    const p = base();
    p.covariateCorrelations![1]![2] = -0.25;
    p.covariateCorrelations![3]![3] = 0.9;
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations.1.2',
        message:
          'The correlation between Attendance and Deprivation must be the same in row 2, column 3 and in row 3, column 2; got -0.25 and -0.2.',
      },
      {
        field: 'covariateCorrelations.3.3',
        message: 'The correlation of Recorded flag with itself (row 4, column 4) must be 1; got 0.9.',
      },
    ]);
  });

  it('observed correlations impossible together: three variables, with the allowed range', () => {
    const p = base();
    setPair(p, 0, 1, 0.9);
    setPair(p, 0, 2, 0.9);
    setPair(p, 1, 2, 0.5);
    // Allowed r23: 0.81 ± sqrt(0.19 · 0.19) = 0.62 to 1.
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations',
        message:
          'The correlations among the pretest, Attendance and Deprivation are impossible together: no group of people could show all of them at once (the correlation matrix is not positive definite). Given the other two, the correlation between Attendance and Deprivation must lie between 0.62 and 1; got 0.5.',
      },
    ]);
  });

  it('observed correlations impossible together: four variables, every three possible', () => {
    const p = base();
    // Each pair -0.4: every 3 × 3 is positive definite (1 − 3·0.16 − 2·0.064 > 0) but 1 + 3(−0.4) < 0.
    for (const [i, j] of [[0, 1], [0, 2], [0, 3], [1, 2], [1, 3], [2, 3]] as const) setPair(p, i, j, -0.4);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations',
        message:
          'The correlations among the pretest, Attendance, Deprivation and Recorded flag are impossible together: no group of people could show all of them at once (the correlation matrix is not positive definite). Every smaller set of them is possible, so check these correlations together.',
      },
    ]);
  });

  it('two different variables perfectly correlated', () => {
    const p = base();
    setPair(p, 1, 2, -1);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations.1.2', // two variables: the cell itself, so the editor can mark it
        message:
          'The correlation between Attendance and Deprivation is -1: two different variables cannot be perfectly correlated within groups (one would merely repeat the other). Drop one of them or check the value.',
      },
    ]);
  });

  it('reliabilities too low for an observed correlation (Spearman 1904: 0.7 / sqrt(0.75 · 0.7) = 0.966; 0.8 → 1.104)', () => {
    const p = base();
    setPair(p, 0, 1, 0.7);
    p.covariates![0]!.outcomeCorrelation = 0.56; // keeps the outcome check out of the way
    expect(problems(p)).toEqual([]);
    setPair(p, 0, 1, 0.8);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations.0.1',
        message:
          'The observed correlation between the pretest and Attendance (0.8) is too high for their reliabilities (the pretest 0.75 and Attendance 0.7): corrected for measurement error it would be 1.104, beyond 1 in size. Raise the reliabilities or check the correlation.',
      },
    ]);
  });

  it('reliabilities too low for three correlations together, each pair possible', () => {
    const p = base();
    p.covariates![1]!.reliability = 0.7;
    // Corrected pairs 0.6/sqrt(.75·.7) = 0.83, 0.6/sqrt(.7·.7) = 0.86: possible one by one,
    // but the true-score matrix with 0.75, 0.7, 0.7 on the diagonal is not positive definite.
    setPair(p, 0, 1, 0.6);
    setPair(p, 0, 2, 0.6);
    setPair(p, 1, 2, -0.2);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations',
        message:
          'The observed correlations among the pretest, Attendance and Deprivation are too high for their reliabilities (the pretest 0.75, Attendance 0.7 and Deprivation 0.7): corrected for measurement error they are impossible together (the true-score covariance matrix is not positive definite). Raise the reliabilities or check the correlations.',
      },
    ]);
  });

  it("names the group whose pretest reliability binds when the groups' pretest SDs differ", () => {
    const p = base();
    p.groups.programme.pretestSD = 8; // SEM 5 → within-programme reliability 1 − 25/64 = 0.609375
    // Corrected: 0.66 / sqrt(0.609375 · 0.7) = 1.0105 in the programme group (0.911 in the comparison group).
    setPair(p, 0, 1, 0.66);
    expect(problems(p)).toEqual([
      {
        field: 'covariateCorrelations.0.1',
        message:
          "The observed correlation between the pretest and Attendance (0.66) is too high for their reliabilities (the pretest 0.609 (the pretest's within-group reliability in the programme group) and Attendance 0.7): corrected for measurement error it would be 1.011, beyond 1 in size. Raise the reliabilities or check the correlation.",
      },
    ]);
  });

  it("a covariate's outcome correlation too high for its reliability (sqrt(0.7) = 0.837)", () => {
    const p = base();
    p.covariates![0]!.outcomeCorrelation = 0.9;
    expect(problems(p)).toEqual([
      {
        field: 'covariates.0.outcomeCorrelation',
        message:
          "Attendance's correlation with the outcome (0.9) is too high for its reliability (0.7): an observed correlation cannot exceed the square root of the reliability (0.837) in size.",
      },
    ]);
  });

  it('outcome correlations too high together (each possible alone)', () => {
    const p = base();
    // Pretest uncorrelated with Attendance: explained shares add, .6²/.75 = .48 and .62²/.7 = .549
    // (each below 1 alone, Spearman 1904), together 1.029 → 103%.
    setPair(p, 0, 1, 0);
    setPair(p, 1, 2, 0);
    p.covariates![0]!.outcomeCorrelation = 0.62;
    expect(problems(p)).toEqual([
      {
        field: 'covariates.0.outcomeCorrelation',
        message:
          "Together, the correlations of the pretest and Attendance with the outcome (0.6 and 0.62) are too high for their reliabilities (0.75 and 0.7) and their correlations with each other: their true scores would explain 103% of the outcome's variance, and it must stay below 100%. Lower one of these correlations, or check the reliabilities.",
      },
    ]);
  });

  it('exact covariates: reliability below 1; not measured', () => {
    const p = base();
    p.covariates![2]!.reliability = 0.95;
    expect(problems(p)).toEqual([
      {
        field: 'covariates.2.reliability',
        message: 'Covariate 3 (Recorded flag) is matched exactly, so it must be recorded without error: its reliability must be 1; got 0.95.',
      },
    ]);
    const q = base();
    q.covariates![2]!.measured = false;
    expect(problems(q)).toEqual([
      {
        field: 'covariates.2.exact',
        message:
          'Covariate 3 (Recorded flag) is marked exact but not measured: a covariate that is never observed cannot be matched exactly. Mark it measured, or clear "exact".',
      },
    ]);
  });

  it('names: duplicates (ignoring case and spaces) and the pretest’s own name', () => {
    const p = base();
    p.covariates![1]!.name = ' attendance';
    p.covariates![2]!.name = 'Pretest';
    expect(problems(p)).toEqual([
      { field: 'covariates.1.name', message: 'Covariate names must differ: covariates 1 and 2 are both called " attendance".' },
      { field: 'covariates.2.name', message: 'Covariate 3 name must differ from "Pretest", the name Meanward gives the pretest; got "Pretest".' },
    ]);
  });

  it("the corrected ANCOVA's assumed pretest reliability too low for the observed correlations", () => {
    const p = base();
    setPair(p, 0, 1, 0.6);
    p.analysis.assumedReliability = 0.4;
    expect(problems(p)).toEqual([
      {
        field: 'analysis.assumedReliability',
        message:
          "The reliability-corrected ANCOVA cannot use an assumed pretest reliability of 0.4: with Attendance's reliability (0.7), the observed correlation between the pretest and Attendance would pass 1 once corrected for measurement error. Raise the assumed reliability.",
      },
    ]);
  });

  it('every problem at once, alongside the field rules; the typed plan is not changed', () => {
    const p = base();
    p.covariates![0]!.sd = -1; // field rule
    p.covariates![2]!.reliability = 0.9; // exact
    p.covariateCorrelations![1]![2] = 0.1; // not symmetric
    const before = structuredClone(p);
    const fields = problems(p).map((x) => x.field);
    expect(fields).toEqual(['covariates.0.sd', 'covariates.2.reliability', 'covariateCorrelations.1.2']);
    expect(p).toEqual(before);
  });

  it('propensity and Mahalanobis distances with the pretest as the only measured variable are allowed', () => {
    for (const distance of ['propensity', 'mahalanobis'] as const) {
      const p = base();
      for (const c of p.covariates!) c.measured = false;
      p.covariates![2]!.exact = false;
      p.matching.distance = distance;
      expect(problems(p)).toEqual([]);
      expect(() => analysePlan(p)).not.toThrow();
    }
  });

  it('deriveCovariateModel throws the same messages for a plan that skipped validation', () => {
    const p = base();
    p.covariates![0]!.outcomeCorrelation = 0.9;
    expect(() => deriveCovariateModel(p)).toThrow(
      "Attendance's correlation with the outcome (0.9) is too high for its reliability (0.7)",
    );
    expect(covariateModelProblems({ covariates: [], correlations: undefined, pretestSD: {}, poolSize: {} })).toEqual([]);
  });
});
