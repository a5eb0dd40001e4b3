/**
 * In-place Cholesky factorisation A = L L' of a small symmetric positive
 * definite matrix (row-major n × n; only the lower triangle is read; L is
 * written over it), by the Cholesky–Banachiewicz order (Golub & Van Loan
 * 2013, "Matrix Computations", 4th ed., Algorithm 4.2.1). Hand-coded for the
 * engine's per-replication solves of at most about ten unknowns, where a
 * library's matrix objects would cost more than the arithmetic; ml-matrix's
 * CholeskyDecomposition is the reference in the tests.
 *
 * @param a the matrix, row-major, length ≥ n²; overwritten by L (upper triangle left as is).
 * @param n order (≥ 1).
 * @returns false when a pivot is not above 1e-12 times its diagonal entry
 *   (not positive definite up to rounding); `a` is then partly overwritten.
 * @throws never.
 * @example [[4, 2], [2, 3]] → L = [[2, 0], [1, 1.4142135623730951]] (hand-worked)
 */
export function choleskyInPlace(a: Float64Array, n: number): boolean {
  for (let i = 0; i < n; i++) {
    const ri = i * n;
    for (let j = 0; j <= i; j++) {
      const rj = j * n;
      let s = a[ri + j] as number;
      for (let k = 0; k < j; k++) s -= (a[ri + k] as number) * (a[rj + k] as number);
      if (i === j) {
        if (!(s > 1e-12 * Math.abs(a[ri + i] as number)) || !(s > 0)) return false;
        a[ri + i] = Math.sqrt(s);
      } else {
        a[ri + j] = s / (a[rj + j] as number);
      }
    }
  }
  return true;
}

/**
 * Solve L L' x = b in place with the factor from choleskyInPlace (forward
 * then back substitution).
 * @param l the factor (row-major n × n, lower triangle). @param n order.
 * @param b right-hand side, overwritten by x (length ≥ n).
 * @returns nothing. @throws never.
 * @example with L from [[4, 2], [2, 3]], b = [2, 1] → x = [0.5, 0] (hand-worked)
 */
export function choleskySolveInPlace(l: Float64Array, n: number, b: Float64Array): void {
  for (let i = 0; i < n; i++) {
    let s = b[i] as number;
    const ri = i * n;
    for (let k = 0; k < i; k++) s -= (l[ri + k] as number) * (b[k] as number);
    b[i] = s / (l[ri + i] as number);
  }
  for (let i = n - 1; i >= 0; i--) {
    let s = b[i] as number;
    for (let k = i + 1; k < n; k++) s -= (l[k * n + i] as number) * (b[k] as number);
    b[i] = s / (l[i * n + i] as number);
  }
}
