import type { GroupMoments } from './ancovaOnCovariates';

/** Buffers of discriminantStart for p covariates (createDiscriminantWorkspace). */
export interface DiscriminantWorkspace {
  /** The pooled within-group covariance S and its Cholesky factor L, p × p row-major. */
  readonly S: Float64Array;
  readonly L: Float64Array;
  /** The mean differences, then the slopes. */
  readonly d: Float64Array;
  /** The returned start, intercept first (p + 1). */
  readonly start: number[];
}

/** Allocate discriminantStart's buffers. @param p covariates (≥ 1). @returns the buffers. @throws never. @example createDiscriminantWorkspace(4).start.length // 5 */
export function createDiscriminantWorkspace(p: number): DiscriminantWorkspace {
  return { S: new Float64Array(p * p), L: new Float64Array(p * p), d: new Float64Array(p), start: new Array<number>(p + 1).fill(0) };
}

/**
 * Linear discriminant coefficients from two groups' moments, as the logistic
 * regression's starting point: slopes S^-1 (x̄_P − x̄_C) with S the pooled
 * within-group covariance (Sxx_P + Sxx_C) / (n_P + n_C − 2), intercept
 * log(n_P / n_C) − slopes'(x̄_P + x̄_C)/2 (the log-odds under normal covariates
 * with a common covariance; Efron 1975, from memory).
 *
 * S = LL' and the solve take the operations of ml-matrix 6's
 * CholeskyDecomposition and its solve (the Jama algorithm) in the same order,
 * on preallocated arrays (no allocation per replication), so the start, and
 * with it every fitted logit of the engine, is the same to the last bit as
 * with that library's objects (a test compares them).
 *
 * @param P programme moments. @param C comparison moments (same p).
 * @param nP programme rows. @param nC comparison rows.
 * @param ws buffers from createDiscriminantWorkspace(p).
 * @returns ws.start (intercept, then one slope per covariate; overwritten by the next call),
 *   or undefined when S is not positive definite (the regression then starts from zero slopes).
 * @throws never.
 * @example one covariate, means 1 and 0, Sxx 4 and 4, n 5 and 5: S = 1, slope 1, intercept −0.5 (hand-worked).
 */
export function discriminantStart(P: GroupMoments, C: GroupMoments, nP: number, nC: number, ws: DiscriminantWorkspace): number[] | undefined {
  const p = P.p;
  const { S, L, d, start } = ws;
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) S[a * p + b] = ((P.sxx[a * p + b] as number) + (C.sxx[a * p + b] as number)) / (nP + nC - 2);
  let positiveDefinite = true;
  for (let j = 0; j < p; j++) {
    let dj = 0;
    for (let k = 0; k < j; k++) {
      let s = 0;
      for (let i = 0; i < k; i++) s += (L[k * p + i] as number) * (L[j * p + i] as number);
      s = ((S[j * p + k] as number) - s) / (L[k * p + k] as number);
      L[j * p + k] = s;
      dj = dj + s * s;
    }
    dj = (S[j * p + j] as number) - dj;
    positiveDefinite &&= dj > 0;
    L[j * p + j] = Math.sqrt(Math.max(dj, 0));
  }
  if (!positiveDefinite) return undefined;
  for (let a = 0; a < p; a++) d[a] = (P.means[a] as number) - (C.means[a] as number);
  for (let k = 0; k < p; k++) {
    for (let i = 0; i < k; i++) d[k] = (d[k] as number) - (d[i] as number) * (L[k * p + i] as number);
    d[k] = (d[k] as number) / (L[k * p + k] as number);
  }
  for (let k = p - 1; k >= 0; k--) {
    for (let i = k + 1; i < p; i++) d[k] = (d[k] as number) - (d[i] as number) * (L[i * p + k] as number);
    d[k] = (d[k] as number) / (L[k * p + k] as number);
  }
  let intercept = Math.log(nP / nC);
  for (let a = 0; a < p; a++) intercept -= ((d[a] as number) * ((P.means[a] as number) + (C.means[a] as number))) / 2;
  start[0] = intercept;
  for (let a = 0; a < p; a++) start[a + 1] = d[a] as number;
  return start;
}
