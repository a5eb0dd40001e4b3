import { choleskyInPlace } from './smallCholesky';

/**
 * Coordinates in which the Mahalanobis distance is the Euclidean distance
 * (Mahalanobis 1936; Rubin 1980): with S the pooled within-group covariance
 * matrix of the measured covariates r that are not matched exactly (those
 * matched exactly are equal within a matched set and take no part), S = L L'
 * (Cholesky) and w = L^-1 x_r, so (x − x')' S^-1 (x − x') = |w − w'|².
 *
 * @param columns observed measured covariates (pool indexing).
 * @param notExact indices (into columns) of the covariates in the distance, length r ≥ 1.
 * @param pooledSxx pooled within-group sums of squares and products of all the columns (p × p row-major, p = columns.length).
 * @param df their degrees of freedom (n_P + n_C − 2).
 * @param size number of people.
 * @param out r Float64Arrays receiving the coordinates.
 * @returns false when S is not positive definite (then `out` is not usable).
 * @throws never.
 * @example one covariate with pooled SD 2 → w = x / 2.
 */
export function whitenedCoordinates(
  columns: readonly Float64Array[],
  notExact: readonly number[],
  pooledSxx: Float64Array,
  df: number,
  size: number,
  out: Float64Array[],
): boolean {
  const p = columns.length;
  const r = notExact.length;
  const l = new Float64Array(r * r);
  for (let i = 0; i < r; i++) {
    for (let j = 0; j <= i; j++) l[i * r + j] = (pooledSxx[(notExact[i] as number) * p + (notExact[j] as number)] as number) / df;
  }
  if (!choleskyInPlace(l, r)) return false;
  // Forward substitution for every person: w_i = (x_i − Σ_{j<i} L[i][j] w_j) / L[i][i].
  for (let i = 0; i < r; i++) {
    const w = out[i] as Float64Array;
    const x = columns[notExact[i] as number] as Float64Array;
    const d = l[i * r + i] as number;
    for (let t = 0; t < size; t++) w[t] = x[t] as number;
    for (let j = 0; j < i; j++) {
      const lij = l[i * r + j] as number;
      const wj = out[j] as Float64Array;
      for (let t = 0; t < size; t++) w[t] = (w[t] as number) - lij * (wj[t] as number);
    }
    for (let t = 0; t < size; t++) w[t] = (w[t] as number) / d;
  }
  return true;
}
