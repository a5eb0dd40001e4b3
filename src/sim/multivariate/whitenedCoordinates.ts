import { CholeskyDecomposition, inverse, Matrix } from 'ml-matrix';

/**
 * Coordinates in which the Mahalanobis distance is the Euclidean distance
 * (Mahalanobis 1936; Rubin 1980): with S the pooled within-group covariance
 * matrix of the measured covariates and A = (S^-1)[r, r] its inverse's block
 * for the covariates r not matched exactly, A = L L' (Cholesky), w = L' x_r,
 * so (x − x')' A (x − x') = |w − w'|². Exactly matched covariates have equal
 * values within a matched set, so their differences are 0 and the distance on
 * all measured covariates reduces to this block.
 *
 * @param columns observed measured covariates (pool indexing), length p.
 * @param notExact indices (into columns) of the covariates not matched exactly, length r ≥ 1.
 * @param pooledSxx pooled within-group sums of squares and products of the p covariates (p × p row-major).
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
  const s = new Matrix(p, p);
  for (let a = 0; a < p; a++) for (let b = 0; b < p; b++) s.set(a, b, (pooledSxx[a * p + b] as number) / df);
  if (!new CholeskyDecomposition(s).isPositiveDefinite()) return false;
  const inv = inverse(s);
  const a = new Matrix(r, r);
  for (let i = 0; i < r; i++) {
    for (let j = i; j < r; j++) {
      const v = (inv.get(notExact[i] as number, notExact[j] as number) + inv.get(notExact[j] as number, notExact[i] as number)) / 2;
      a.set(i, j, v);
      a.set(j, i, v);
    }
  }
  const cho = new CholeskyDecomposition(a);
  if (!cho.isPositiveDefinite()) return false;
  const L = cho.lowerTriangularMatrix;
  // w_i = Σ_{j ≥ i} L[j][i] x_j (L' is upper triangular).
  for (let i = 0; i < r; i++) {
    const w = out[i] as Float64Array;
    w.fill(0, 0, size);
    for (let j = i; j < r; j++) {
      const l = L.get(j, i);
      const x = columns[notExact[j] as number] as Float64Array;
      for (let t = 0; t < size; t++) w[t] = (w[t] as number) + l * (x[t] as number);
    }
  }
  return true;
}
