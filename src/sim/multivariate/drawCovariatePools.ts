import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import type { NormalSampler } from '../normalSampler';
import type { CovariateSimModel } from './covariateSimModel';

/**
 * One replication's two pools under the several-covariate model, stored by
 * variable: for variable j (pretest first), observed[j][i] and trueScore[j][i]
 * for person i, comparison members at i in [0, nC), programme members at
 * i in [nC, nC + nP). Buffers are allocated once (createCovariatePools) and
 * overwritten by every draw.
 */
export interface CovariatePools {
  readonly nProgramme: number;
  readonly nComparison: number;
  /** nC + nP. */
  readonly size: number;
  /** Number of variables (pretest + covariates). */
  readonly variables: number;
  readonly observed: Float64Array[];
  readonly trueScore: Float64Array[];
  readonly outcome: Float64Array;
  /** The replication's standard normal variates (see drawCovariatePools for the layout). */
  readonly normals: Float64Array;
  /** Normal variates per person: variables + error-prone variables + 1. */
  readonly stride: number;
  /** Lower Cholesky factors of sigmaT per group, row-major variables × variables. */
  readonly choleskyProgramme: Float64Array;
  readonly choleskyComparison: Float64Array;
  readonly meanProgramme: Float64Array;
  readonly meanComparison: Float64Array;
  readonly sem: Float64Array;
  /** Indices of the variables measured with error (sem > 0), ascending. */
  readonly errorVariables: Int32Array;
  /** Whether each variable is recorded in whole-number categories (exact matching). */
  readonly wholeNumbers: Uint8Array;
  readonly beta: Float64Array;
  readonly residualSD: number;
  /** Outcome shift of the programme group: growth gap + tau. */
  readonly programmeShift: number;
}

/**
 * Allocate the pools' buffers and the generating constants for a model.
 * @param model the several-covariate model (src/core/multivariate, or a hand-made one in tests).
 * @returns reusable pools for drawCovariatePools.
 * @throws Error when a group's true-score covariance matrix is not positive
 *   definite (the core's validation rejects such plans first, naming the covariates).
 * @example createCovariatePools(model).stride // variables + error-prone variables + 1
 */
export function createCovariatePools(model: CovariateSimModel): CovariatePools {
  const p = model.names.length;
  const nP = model.n.programme;
  const nC = model.n.comparison;
  const size = nP + nC;
  const errorVariables = Int32Array.from(model.sem.map((s, j) => (s > 0 ? j : -1)).filter((j) => j >= 0));
  const stride = p + errorVariables.length + 1;
  const chol = (s: readonly (readonly number[])[], who: string): Float64Array => {
    const m = new Matrix(s.map((row, i) => row.map((x, j) => (j >= i ? x : (s[j]?.[i] as number)))));
    const c = new CholeskyDecomposition(m);
    if (!c.isPositiveDefinite()) {
      throw new Error(`The ${who} group's true-score covariance matrix of the pretest and covariates is not positive definite, so it cannot be simulated.`);
    }
    const l = c.lowerTriangularMatrix;
    const out = new Float64Array(p * p);
    for (let i = 0; i < p; i++) for (let j = 0; j <= i; j++) out[i * p + j] = l.get(i, j);
    return out;
  };
  return {
    nProgramme: nP,
    nComparison: nC,
    size,
    variables: p,
    observed: Array.from({ length: p }, () => new Float64Array(size)),
    trueScore: Array.from({ length: p }, () => new Float64Array(size)),
    outcome: new Float64Array(size),
    normals: new Float64Array(size * stride),
    stride,
    choleskyProgramme: chol(model.sigmaT.programme, 'programme'),
    choleskyComparison: chol(model.sigmaT.comparison, 'comparison'),
    meanProgramme: Float64Array.from(model.mean.programme),
    meanComparison: Float64Array.from(model.mean.comparison),
    sem: Float64Array.from(model.sem),
    errorVariables,
    wholeNumbers: Uint8Array.from(model.exact.map((e, j) => (e && model.measured[j] ? 1 : 0))),
    beta: Float64Array.from(model.beta),
    residualSD: model.residualSD,
    programmeShift: model.growthGap + model.effect,
  };
}

/**
 * Draw one replication's pools from the several-covariate model
 * (docs/simulation.md, "Several covariates"): for each person, true scores
 * T = mean_g + L_g z (L_g the Cholesky factor of the group's true-score
 * covariance; Gentle 2003, "Random Number Generation and Monte Carlo
 * Methods", sec. 5.3.1, the standard construction of multivariate normal
 * variates), observed X_j = T_j + sem_j z', outcome
 * Y = [P](growthGap + tau) + beta'T + residualSD z''.
 *
 * A variable matched exactly (a binary or categorical one) is recorded in
 * whole-number categories: its true value is the normal draw rounded to the
 * nearest whole number (its observed value too, after any measurement error),
 * and the outcome depends on the rounded value. The closed forms treat it as
 * continuous; the two agree closely when its SD spans several categories and
 * only roughly for a 0/1 variable (see docs/simulation.md).
 *
 * The replication's normal variates are drawn in one go, in a fixed layout:
 * comparison members first, then programme members; per person `stride`
 * variates: one per variable for the true scores, one per error-prone
 * variable, one for the outcome residual. So the numbers depend only on the
 * sampler's stream (replication i's own stream in the engine).
 *
 * @param pools buffers from createCovariatePools; overwritten.
 * @param normal a standard normal sampler on the replication's stream.
 * @returns nothing (fills pools.observed, pools.trueScore, pools.outcome).
 * @throws never.
 * @example
 *   // With sigmaT = [[64]], sem [6], mean 50: observed pretest ~ N(50, 100) (64 + 36).
 */
export function drawCovariatePools(pools: CovariatePools, normal: NormalSampler): void {
  const { nComparison: nC, size, variables: p, stride, observed, trueScore, outcome, normals: z } = pools;
  const { sem, errorVariables, wholeNumbers, beta, residualSD } = pools;
  const nErr = errorVariables.length;
  normal.fillStandard(z, z.length);
  for (let g = 0; g < 2; g++) {
    const programme = g === 1;
    const from = programme ? nC : 0;
    const to = programme ? size : nC;
    const L = programme ? pools.choleskyProgramme : pools.choleskyComparison;
    const mu = programme ? pools.meanProgramme : pools.meanComparison;
    const shift = programme ? pools.programmeShift : 0;
    for (let i = from; i < to; i++) {
      const base = i * stride;
      let y = shift + residualSD * (z[base + stride - 1] as number);
      for (let a = 0; a < p; a++) {
        let v = mu[a] as number;
        const row = a * p;
        for (let b = 0; b <= a; b++) v += (L[row + b] as number) * (z[base + b] as number);
        if (wholeNumbers[a]) v = Math.round(v);
        (trueScore[a] as Float64Array)[i] = v;
        (observed[a] as Float64Array)[i] = v;
        y += (beta[a] as number) * v;
      }
      for (let e = 0; e < nErr; e++) {
        const a = errorVariables[e] as number;
        const col = observed[a] as Float64Array;
        const x = (col[i] as number) + (sem[a] as number) * (z[base + p + e] as number);
        col[i] = wholeNumbers[a] ? Math.round(x) : x;
      }
      outcome[i] = y;
    }
  }
}
