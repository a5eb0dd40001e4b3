import type { Plan } from '../plan';
import type { ModelParameters } from '../modelParameters';
import { deriveModelParameters } from '../deriveModelParameters';
import { covariateModelProblems, covariateCheckInput } from './covariateModelProblems';
import { dot, range, solvePositiveDefinite, symmetrise } from './linearAlgebra';

/** A matrix per group, and the pool-size weighted average of the two (n_P Σ_P + n_C Σ_C) / (n_P + n_C). */
export interface GroupMatrices {
  programme: number[][];
  comparison: number[][];
  pooled: number[][];
}

/**
 * The several-covariate generating model, pretest first (index 0), then the
 * plan's covariates in order (index j = covariate j's position + 1). Plain
 * arrays only, so it passes to a Web Worker and into JSON unchanged.
 *
 * Model (classical test theory with several fallible variables; Lord & Novick
 * 1968 ch. 3; Fuller 1987 ch. 2, from memory): in group g,
 *   T ~ N(mu_g, Sigma_T,g),  X = T + E,  E ~ N(0, diag(sem²)) independent of T,
 *   Y = a + d_g + beta'T + tau [g = P] + e,  e ~ N(0, residualSD²).
 * Observed and true means coincide (errors have mean 0).
 *
 * Within-group covariances: the observed correlation matrix R (the plan's
 * covariateCorrelations) holds in both groups, with Sigma_X,g = D_g R D_g,
 * D_g = diag(pretest SD of group g, covariate SDs). Only the pretest's SD may
 * differ between the groups (the plan gives one SD per covariate); the SEMs
 * are properties of the instruments and common to both groups. So when the
 * two pretest SDs are equal, the groups' covariance matrices are equal, as the
 * closed forms for propensity-score matching assume; when they differ, each
 * formula uses the group whose covariance it needs (the comparison group's for
 * matching, the pooled one for ANCOVA), exactly as the one-pretest formulas do.
 *
 * The outcome's true-score slopes solve Sigma_T,C beta = c, where
 * c_j = r_jY · SD_j · posttestSD is the comparison group's observed covariance
 * of variable j with the outcome (the pretest's r_jY is the plan's pre–post
 * correlation); residual variance = posttestSD² − beta' Sigma_T,C beta.
 */
export interface CovariateModel {
  /** Display names: "Pretest", then each covariate's name. */
  names: string[];
  /** Whether each variable is observed (the pretest always is). */
  measured: boolean[];
  /** Whether each variable is matched exactly (the pretest never is). */
  exact: boolean[];
  /** Indices of the measured variables, ascending (0 first). */
  measuredIndices: number[];
  /** Indices of the measured variables matched exactly. */
  exactIndices: number[];
  /** Group means (observed = true), in each variable's own units. */
  mean: { programme: number[]; comparison: number[] };
  /** Programme minus comparison mean per variable (Delta). */
  gap: number[];
  /** Observed within-group SDs per variable. */
  observedSD: { programme: number[]; comparison: number[] };
  /** Standard error of measurement per variable (0 for an error-free one). */
  sem: number[];
  /** Within-group reliability per variable (true variance / observed variance), and pooled. */
  reliability: { programme: number[]; comparison: number[]; pooled: number[] };
  /** Observed within-group correlations (the plan's matrix; [[1]] without covariates). */
  correlations: number[][];
  /** Observed within-group covariance matrices Sigma_X. */
  sigmaX: GroupMatrices;
  /** True-score within-group covariance matrices Sigma_T = Sigma_X − diag(sem²). */
  sigmaT: GroupMatrices;
  /** The outcome's slopes on the true scores (posttest points per unit of each variable). */
  beta: number[];
  /** SD of the outcome residual e, posttest points (> 0). */
  residualSD: number;
  /** Within-group posttest SD per group implied by the model (comparison = the plan's). */
  posttestSD: { programme: number; comparison: number };
  /** Growth gap d_P − d_C, posttest points. */
  growthGap: number;
  /** Programme effect tau, posttest points. */
  effect: number;
  /** Pool sizes. */
  n: { programme: number; comparison: number };
}

// usesCovariateModel and matchingDistance live in covariateUse.ts (small, on the page's first screen).
export { matchingDistance, usesCovariateModel } from './covariateUse';

/**
 * Build the several-covariate model (see CovariateModel) from a validated plan.
 *
 * Reference: Sigma_T = Sigma_X − diag(SEM²) with SEM² = (1 − reliability)·SD²
 * (classical test theory, errors independent; Lord & Novick 1968, from memory);
 * slopes from the normal equations Sigma_T beta = cov(X, Y) (Fuller 1987,
 * measurement error models, from memory). The pretest's SEM, SDs and
 * within-group reliabilities are exactly those of deriveModelParameters.
 *
 * @param plan a plan that passed validatePlan (covariates optional: none gives a one-variable model).
 * @param model the plan's one-pretest model parameters (derived when omitted).
 * @returns the model; every number finite.
 * @throws Error with the same researcher-readable message validatePlan gives when the
 *   correlations, reliabilities and outcome correlations are impossible together.
 * @example
 *   // one covariate with no gap, no correlations: beta = [model.beta, 0]
 */
export function deriveCovariateModel(plan: Plan, model?: ModelParameters): CovariateModel {
  const m = model ?? deriveModelParameters(plan);
  const covariates = plan.covariates ?? [];
  const problems = covariateModelProblems(covariateCheckInput(plan, m));
  if (problems.length > 0) throw new Error(problems.map((p) => p.message).join(' '));

  const p = covariates.length + 1;
  const R = covariates.length === 0 ? [[1]] : symmetrise(plan.covariateCorrelations ?? []);
  const sdP = [m.observedSD.programme, ...covariates.map((c) => c.sd)];
  const sdC = [m.observedSD.comparison, ...covariates.map((c) => c.sd)];
  const sem = [m.sem, ...covariates.map((c) => c.sd * Math.sqrt(1 - c.reliability))];
  const nP = m.n.programme;
  const nC = m.n.comparison;
  const N = nP + nC;

  const cov = (sd: number[]): number[][] =>
    symmetrise(R.map((row, i) => row.map((r, j) => (j === i ? (sd[i] as number) ** 2 : (sd[i] as number) * r * (sd[j] as number)))));
  const minusErrors = (s: number[][]): number[][] =>
    s.map((row, i) => row.map((x, j) => (i === j ? x - (sem[i] as number) ** 2 : x)));
  const pool = (a: number[][], c: number[][]): number[][] =>
    symmetrise(a.map((row, i) => row.map((x, j) => (nP * x + nC * (c[i]?.[j] as number)) / N)));

  const sxP = cov(sdP);
  const sxC = cov(sdC);
  // The pretest's true variances exactly as deriveModelParameters has them.
  const stP = minusErrors(sxP);
  const stC = minusErrors(sxC);
  stP[0]![0] = m.trueSD.programme ** 2;
  stC[0]![0] = m.trueSD.comparison ** 2;
  const sigmaX: GroupMatrices = { programme: sxP, comparison: sxC, pooled: pool(sxP, sxC) };
  const sigmaT: GroupMatrices = { programme: stP, comparison: stC, pooled: pool(stP, stC) };

  const posttestSD = plan.outcome.posttestSD;
  const r = [plan.outcome.prePostCorrelation, ...covariates.map((c) => c.outcomeCorrelation)];
  const c = r.map((rj, j) => rj * (sdC[j] as number) * posttestSD);
  const beta = solvePositiveDefinite(stC, c);
  const residualVar = posttestSD * posttestSD - dot(beta, c);
  const programmeOutcomeVar = dot(beta, stP.map((row) => dot(row, beta))) + residualVar;

  const meanP = [m.mean.programme, ...covariates.map((cv) => cv.programmeMean)];
  const meanC = [m.mean.comparison, ...covariates.map((cv) => cv.comparisonMean)];
  const measured = [true, ...covariates.map((cv) => cv.measured)];
  const exact = [false, ...covariates.map((cv) => cv.exact && cv.measured)];
  const diag = (s: number[][]): number[] => s.map((row, i) => row[i] as number);
  const ratio = (a: number[], b: number[]): number[] => a.map((x, i) => x / (b[i] as number));

  return {
    names: ['Pretest', ...covariates.map((cv) => cv.name)],
    measured,
    exact,
    measuredIndices: range(p).filter((i) => measured[i]),
    exactIndices: range(p).filter((i) => exact[i]),
    mean: { programme: meanP, comparison: meanC },
    gap: meanP.map((x, i) => x - (meanC[i] as number)),
    observedSD: { programme: sdP, comparison: sdC },
    sem,
    reliability: {
      programme: [m.reliability.programme, ...ratio(diag(stP), diag(sxP)).slice(1)],
      comparison: [m.reliability.comparison, ...ratio(diag(stC), diag(sxC)).slice(1)],
      pooled: [m.reliability.pooled, ...ratio(diag(sigmaT.pooled), diag(sigmaX.pooled)).slice(1)],
    },
    correlations: R,
    sigmaX,
    sigmaT,
    beta,
    residualSD: Math.sqrt(residualVar),
    posttestSD: { programme: Math.sqrt(programmeOutcomeVar), comparison: posttestSD },
    growthGap: m.growthGap,
    effect: m.effect,
    n: { programme: nP, comparison: nC },
  };
}
