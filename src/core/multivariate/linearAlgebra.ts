/*
 * Small dense linear algebra for the several-covariate model, on plain
 * number[][] (JSON-safe, structured-clone safe). The Cholesky factorisation
 * and its solve are ml-matrix 6.15.1's (CholeskyDecomposition), copied
 * verbatim onto plain arrays (the same loops in the same order, so the same
 * doubles) so the page's first screen need not load the library, whose
 * matrix class is several times larger than the two loops used here;
 * test/core/linearAlgebra.test.ts compares them with ml-matrix bit for bit.
 * This file adds a relative tolerance to the positive-definiteness test.
 *
 * ml-matrix: The MIT License (MIT), Copyright (c) 2014 Michaël Zasso.
 * Permission is hereby granted, free of charge, to any person obtaining a
 * copy of this software and associated documentation files (the "Software"),
 * to deal in the Software without restriction, including without limitation
 * the rights to use, copy, modify, merge, publish, distribute, sublicense,
 * and/or sell copies of the Software, and to permit persons to whom the
 * Software is furnished to do so, subject to the following conditions: The
 * above copyright notice and this permission notice shall be included in all
 * copies or substantial portions of the Software. THE SOFTWARE IS PROVIDED
 * "AS IS", WITHOUT WARRANTY OF ANY KIND, EXPRESS OR IMPLIED, INCLUDING BUT
 * NOT LIMITED TO THE WARRANTIES OF MERCHANTABILITY, FITNESS FOR A PARTICULAR
 * PURPOSE AND NONINFRINGEMENT. IN NO EVENT SHALL THE AUTHORS OR COPYRIGHT
 * HOLDERS BE LIABLE FOR ANY CLAIM, DAMAGES OR OTHER LIABILITY, WHETHER IN AN
 * ACTION OF CONTRACT, TORT OR OTHERWISE, ARISING FROM, OUT OF OR IN
 * CONNECTION WITH THE SOFTWARE OR THE USE OR OTHER DEALINGS IN THE SOFTWARE.
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

/** The Cholesky factor L (A = L L') when A is positive definite (with the tolerance above), else null. */
function choleskyIfPositiveDefinite(a: readonly (readonly number[])[]): number[][] | null {
  const cho = choleskyDecomposition(symmetrise(a));
  if (!cho.positiveDefinite) return null;
  const l = cho.L;
  for (let j = 0; j < a.length; j++) {
    const d = at(l, j, j) ** 2;
    if (!(d > 1e-10 * Math.abs(at(a, j, j)))) return null;
  }
  return l;
}

/** ml-matrix's CholeskyDecomposition constructor, on a square number[][] (see the note at the top). */
function choleskyDecomposition(a: readonly (readonly number[])[]): { L: number[][]; positiveDefinite: boolean } {
  // Matrix.isSymmetric: every entry equal to its mirror (so a NaN anywhere fails, as in ml-matrix).
  for (let i = 0; i < a.length; i++) {
    for (let j = 0; j <= i; j++) {
      if (at(a, i, j) !== at(a, j, i)) throw new Error('Matrix is not symmetric');
    }
  }
  const dimension = a.length;
  const l: number[][] = Array.from({ length: dimension }, () => new Array<number>(dimension).fill(0));
  let positiveDefinite = true;
  let i: number, j: number, k: number;

  for (j = 0; j < dimension; j++) {
    const lj = l[j] as number[];
    let d = 0;
    for (k = 0; k < j; k++) {
      const lk = l[k] as number[];
      let s = 0;
      for (i = 0; i < k; i++) {
        s += (lk[i] as number) * (lj[i] as number);
      }
      s = (at(a, j, k) - s) / (lk[k] as number);
      lj[k] = s;
      d = d + s * s;
    }

    d = at(a, j, j) - d;

    positiveDefinite &&= d > 0;
    lj[j] = Math.sqrt(Math.max(d, 0));
    for (k = j + 1; k < dimension; k++) {
      lj[k] = 0;
    }
  }
  return { L: l, positiveDefinite };
}

/** ml-matrix's CholeskyDecomposition.solve for a positive definite factor L: X with L L' X = B (B is copied). */
function choleskySolve(l: readonly (readonly number[])[], value: readonly (readonly number[])[]): number[][] {
  const dimension = l.length;
  if (value.length !== dimension) throw new Error('Matrix dimensions do not match');
  const count = value[0]?.length ?? 0;
  const B = value.map((row) => row.slice());
  let i: number, j: number, k: number;

  for (k = 0; k < dimension; k++) {
    const Bk = B[k] as number[];
    for (j = 0; j < count; j++) {
      for (i = 0; i < k; i++) {
        Bk[j] = (Bk[j] as number) - at(B, i, j) * at(l, k, i);
      }
      Bk[j] = (Bk[j] as number) / at(l, k, k);
    }
  }

  for (k = dimension - 1; k >= 0; k--) {
    const Bk = B[k] as number[];
    for (j = 0; j < count; j++) {
      for (i = k + 1; i < dimension; i++) {
        Bk[j] = (Bk[j] as number) - at(B, i, j) * at(l, i, k);
      }
      Bk[j] = (Bk[j] as number) / at(l, k, k);
    }
  }

  return B;
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
  const l = choleskyIfPositiveDefinite(a);
  if (!l) throw new Error('Internal fault: a covariance matrix that must be positive definite is not.');
  const rhs = isVector ? (b as number[]).map((v) => [v]) : (b as number[][]);
  const x = choleskySolve(l, rhs);
  return isVector ? x.map((row) => row[0] as number) : x;
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
