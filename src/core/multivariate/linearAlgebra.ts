import { CholeskyDecomposition, Matrix, solve } from 'ml-matrix';

/*
 * Small dense linear algebra for the several-covariate model, on plain
 * number[][] (JSON-safe, structured-clone safe). The factorisations and
 * solves are ml-matrix's; this file only adapts shapes and adds a relative
 * tolerance to its positive-definiteness test.
 */

/** Rows `rows` and columns `cols` of a matrix, as a new number[][]. */
export function block(a: readonly (readonly number[])[], rows: readonly number[], cols: readonly number[]): number[][] {
  return rows.map((i) => cols.map((j) => at(a, i, j)));
}

/** Entries `idx` of a vector. */
export function pick(v: readonly number[], idx: readonly number[]): number[] {
  return idx.map((i) => v[i] as number);
}

/** a[i][j], with a clear fault when out of range (never undefined). */
export function at(a: readonly (readonly number[])[], i: number, j: number): number {
  const x = a[i]?.[j];
  if (x === undefined) throw new Error(`Internal fault: matrix entry (${i}, ${j}) is outside a ${a.length}-row matrix.`);
  return x;
}

/** x'y. */
export function dot(x: readonly number[], y: readonly number[]): number {
  let s = 0;
  for (let i = 0; i < x.length; i++) s += (x[i] as number) * (y[i] as number);
  return s;
}

/** A x. */
export function multiplyVector(a: readonly (readonly number[])[], x: readonly number[]): number[] {
  return a.map((row) => dot(row, x));
}

/** A B for small dense matrices. */
export function multiply(a: readonly (readonly number[])[], b: readonly (readonly number[])[]): number[][] {
  return new Matrix(a as number[][]).mmul(new Matrix(b as number[][])).to2DArray();
}

/** A'. */
export function transpose(a: readonly (readonly number[])[]): number[][] {
  const rows = a.length;
  const cols = a[0]?.length ?? 0;
  return Array.from({ length: cols }, (_, j) => Array.from({ length: rows }, (_, i) => at(a, i, j)));
}

/** x − y. */
export function subtract(x: readonly number[], y: readonly number[]): number[] {
  return x.map((v, i) => v - (y[i] as number));
}

/**
 * A copy of a square matrix made exactly symmetric (upper triangle mirrored),
 * as ml-matrix's Cholesky demands bit-exact symmetry.
 */
export function symmetrise(a: readonly (readonly number[])[]): number[][] {
  return a.map((row, i) => row.map((x, j) => (j >= i ? x : at(a, j, i))));
}

/**
 * Whether a symmetric matrix is positive definite, with a relative tolerance:
 * every Cholesky pivot must exceed 1e-10 times its diagonal entry, so a matrix
 * that is singular up to rounding counts as not positive definite.
 */
export function isPositiveDefinite(a: readonly (readonly number[])[]): boolean {
  return a.length === 0 || choleskyIfPositiveDefinite(a) !== null;
}

/** ml-matrix's Cholesky factorisation when A is positive definite (with the tolerance above), else null. */
function choleskyIfPositiveDefinite(a: readonly (readonly number[])[]): CholeskyDecomposition | null {
  const cho = new CholeskyDecomposition(new Matrix(symmetrise(a)));
  if (!cho.isPositiveDefinite()) return null;
  const l = cho.lowerTriangularMatrix;
  for (let j = 0; j < a.length; j++) {
    const d = l.get(j, j) ** 2;
    if (!(d > 1e-10 * Math.abs(at(a, j, j)))) return null;
  }
  return cho;
}

/**
 * Solves A X = B for symmetric positive definite A (Cholesky). B may be a
 * vector (returns a vector) or a matrix (returns a matrix).
 * @throws Error when A is not positive definite.
 */
export function solvePositiveDefinite(a: readonly (readonly number[])[], b: readonly number[]): number[];
export function solvePositiveDefinite(a: readonly (readonly number[])[], b: readonly (readonly number[])[]): number[][];
export function solvePositiveDefinite(
  a: readonly (readonly number[])[],
  b: readonly number[] | readonly (readonly number[])[],
): number[] | number[][] {
  const isVector = typeof b[0] === 'number' || b.length === 0;
  if (a.length === 0) return isVector ? [] : (b as number[][]).map(() => []);
  const cho = choleskyIfPositiveDefinite(a);
  if (!cho) throw new Error('Internal fault: a covariance matrix that must be positive definite is not.');
  const rhs = isVector ? Matrix.columnVector(b as number[]) : new Matrix(b as number[][]);
  const x = cho.solve(rhs);
  return isVector ? x.getColumn(0) : x.to2DArray();
}

/** Solves A x = b for a general square A (LU, ml-matrix). */
export function solveGeneral(a: readonly (readonly number[])[], b: readonly number[]): number[] {
  if (a.length === 0) return [];
  return solve(new Matrix(a as number[][]), Matrix.columnVector(b as number[])).getColumn(0);
}

/** x' A^-1 x for symmetric positive definite A (0 for an empty x). */
export function inverseQuadraticForm(a: readonly (readonly number[])[], x: readonly number[]): number {
  if (x.length === 0) return 0;
  return dot(x, solvePositiveDefinite(a, x));
}

/** 0, 1, …, n − 1. */
export function range(n: number): number[] {
  return Array.from({ length: n }, (_, i) => i);
}
