import { CholeskyDecomposition, Matrix } from 'ml-matrix';
import { describe, expect, it } from 'vitest';
import { inverseQuadraticForm, isPositiveDefinite, solvePositiveDefinite, symmetrise } from '../../src/core/multivariate/linearAlgebra';

/*
 * src/core/multivariate/linearAlgebra.ts carries a verbatim copy of ml-matrix 6.15.1's Cholesky
 * factorisation and solve on plain arrays (so the page's first screen does not load ml-matrix).
 * The reference is ml-matrix itself (a general-purpose npm library): the same seeded matrices go
 * through its CholeskyDecomposition, and every result must be the same double (Object.is).
 */

/** Seeded uniform numbers in [0, 1) (a small linear congruential generator; common practice). */
function lcg(seed: number): () => number {
  let s = seed >>> 0;
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0;
    return s / 2 ** 32;
  };
}

/** A random symmetric matrix: G G' + shift·I (shift ≤ 0 gives indefinite or near-singular ones). */
function randomSymmetric(n: number, rand: () => number, shift: number): number[][] {
  const g = Array.from({ length: n }, () => Array.from({ length: n }, () => 2 * rand() - 1));
  return Array.from({ length: n }, (_, i) =>
    Array.from({ length: n }, (_, j) => g[i]!.reduce((s, x, k) => s + x * g[j]![k]!, 0) + (i === j ? shift : 0)),
  );
}

/** What linearAlgebra did with ml-matrix before the copy (the reference). */
function referenceCholesky(a: number[][]): CholeskyDecomposition | null {
  const cho = new CholeskyDecomposition(new Matrix(symmetrise(a)));
  if (!cho.isPositiveDefinite()) return null;
  const l = cho.lowerTriangularMatrix;
  for (let j = 0; j < a.length; j++) if (!(l.get(j, j) ** 2 > 1e-10 * Math.abs(a[j]![j]!))) return null;
  return cho;
}

function sameArray(actual: number[], expected: number[], what: string): void {
  expect(actual.length).toBe(expected.length);
  actual.forEach((x, i) => {
    if (!Object.is(x, expected[i])) expect.fail(`${what}[${i}]: copy gave ${x}, ml-matrix ${expected[i]}`);
  });
}

describe('linear algebra: the Cholesky copy is bit-identical to ml-matrix 6.15.1', () => {
  it('solves with a vector and with a matrix right-hand side (sizes 1 to 10, 200 seeded systems)', () => {
    const rand = lcg(20261205);
    for (let trial = 0; trial < 200; trial++) {
      const n = 1 + (trial % 10);
      const a = randomSymmetric(n, rand, 0.05 + rand());
      const b = Array.from({ length: n }, () => 10 * rand() - 5);
      const cho = referenceCholesky(a);
      expect(cho, `system ${trial} should be positive definite`).not.toBeNull();
      sameArray(solvePositiveDefinite(a, b), cho!.solve(Matrix.columnVector(b)).getColumn(0), `solve #${trial}`);
      const bm = Array.from({ length: n }, () => [rand(), -rand(), 3 * rand()]);
      const got = solvePositiveDefinite(a, bm);
      const want = cho!.solve(new Matrix(bm)).to2DArray();
      got.forEach((row, i) => sameArray(row, want[i]!, `solve matrix #${trial} row ${i}`));
      expect(Object.is(inverseQuadraticForm(a, b), b.reduce((s, x, i) => s + x * cho!.solve(Matrix.columnVector(b)).get(i, 0), 0))).toBe(true);
    }
  });

  it('agrees on which matrices are positive definite (indefinite, near-singular, correlation-like)', () => {
    const rand = lcg(7);
    let refused = 0;
    for (let trial = 0; trial < 300; trial++) {
      const n = 1 + (trial % 6);
      const a = randomSymmetric(n, rand, -0.6 * rand());
      const expected = referenceCholesky(a) !== null;
      if (!expected) refused++;
      expect(isPositiveDefinite(a), `matrix #${trial}`).toBe(expected);
    }
    expect(refused).toBeGreaterThan(20); // the grid does reach matrices both ways
    // A 2 × 2 correlation matrix is positive definite exactly when |r| < 1 (common practice).
    expect(isPositiveDefinite([[1, 0.999], [0.999, 1]])).toBe(true);
    expect(isPositiveDefinite([[1, 1], [1, 1]])).toBe(false);
    expect(() => solvePositiveDefinite([[1, 1], [1, 1]], [1, 2])).toThrow(/positive definite/);
  });

  it('rejects a matrix with a missing value as ml-matrix does (not symmetric)', () => {
    expect(() => new CholeskyDecomposition(new Matrix([[1, Number.NaN], [Number.NaN, 1]]))).toThrow('Matrix is not symmetric');
    expect(() => isPositiveDefinite([[1, Number.NaN], [Number.NaN, 1]])).toThrow('Matrix is not symmetric');
  });
});
