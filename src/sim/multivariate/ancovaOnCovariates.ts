import { choleskyInPlace, choleskySolveInPlace } from './smallCholesky';

/**
 * One group's moments for ANCOVA on several covariates: row count (or total
 * weight), means, and within-group sums of squares and cross-products about
 * the group's means.
 */
export interface GroupMoments {
  /** Number of covariates p. */
  readonly p: number;
  /** Rows (sum of weights). */
  n: number;
  readonly means: Float64Array;
  meanY: number;
  /** p × p, row-major: Σ w (x_a − x̄_a)(x_b − x̄_b). */
  readonly sxx: Float64Array;
  /** p: Σ w (x_a − x̄_a)(y − ȳ). */
  readonly sxy: Float64Array;
  syy: number;
  /** Work space reused by groupMoments and ancovaOnCovariates (no allocation per replication). */
  readonly work: {
    shift: Float64Array;
    row: Float64Array;
    sum: Float64Array;
    prod: Float64Array;
    W: Float64Array;
    w: Float64Array;
    A: Float64Array;
    c: Float64Array;
    LW: Float64Array;
    x: Float64Array;
  };
}

/** Allocate moments for p covariates. @param p number of covariates (≥ 1). @returns zeroed moments. @throws never. @example createGroupMoments(3).sxx.length // 9 */
export function createGroupMoments(p: number): GroupMoments {
  const q = p + 1;
  return {
    p,
    n: 0,
    means: new Float64Array(p),
    meanY: 0,
    sxx: new Float64Array(p * p),
    sxy: new Float64Array(p),
    syy: 0,
    work: {
      shift: new Float64Array(q),
      row: new Float64Array(q),
      sum: new Float64Array(q),
      prod: new Float64Array(q * q),
      W: new Float64Array(p * p),
      w: new Float64Array(p),
      A: new Float64Array(p * p),
      c: new Float64Array(p),
      LW: new Float64Array(p * p),
      x: new Float64Array(p),
    },
  };
}

/**
 * Moments of rows from..to of the covariate columns and the outcome, each row
 * counted `weight[i − from]` times (a stacked matched sample: a comparison
 * member used by two programme members counts twice), or once when `weight`
 * is null. One pass over the rows with every value shifted by the first
 * counted row's value (the shifted-data algorithm; Chan, Golub & LeVeque
 * 1983, "Algorithms for computing the sample variance", The American
 * Statistician 37), which keeps the cancellation error small for data far from 0.
 *
 * @param columns the covariates (p Float64Arrays, pool indexing).
 * @param y the outcome (pool indexing).
 * @param from first row. @param to end row (exclusive).
 * @param weight non-negative whole-number weights indexed from `from`, or null.
 * @param out receives the moments (its p = columns.length).
 * @returns nothing. @throws never.
 * @example rows x = 1, 2, 3 and y = 2, 4, 6 → means 2 and 4, sxx 2, sxy 4, syy 8 (hand-worked).
 */
export function groupMoments(
  columns: readonly Float64Array[],
  y: Float64Array,
  from: number,
  to: number,
  weight: ArrayLike<number> | null,
  out: GroupMoments,
): void {
  const p = out.p;
  const q = p + 1; // the outcome is variable p
  const { means, sxx, sxy } = out;
  const { shift, row, sum, prod } = out.work;
  shift.fill(0);
  sum.fill(0);
  prod.fill(0);
  let first = -1;
  for (let i = from; i < to && first < 0; i++) if (!weight || (weight[i - from] as number) !== 0) first = i;
  let n = 0;
  if (first >= 0) {
    for (let a = 0; a < p; a++) shift[a] = (columns[a] as Float64Array)[first] as number;
    shift[p] = y[first] as number;
    for (let i = first; i < to; i++) {
      const w = weight ? (weight[i - from] as number) : 1;
      if (w === 0) continue;
      n += w;
      for (let a = 0; a < p; a++) row[a] = ((columns[a] as Float64Array)[i] as number) - (shift[a] as number);
      row[p] = (y[i] as number) - (shift[p] as number);
      for (let a = 0; a < q; a++) {
        const wa = w * (row[a] as number);
        sum[a] = (sum[a] as number) + wa;
        const base = a * q;
        for (let b = a; b < q; b++) prod[base + b] = (prod[base + b] as number) + wa * (row[b] as number);
      }
    }
  }
  out.n = n;
  if (n === 0) {
    means.fill(0);
    out.meanY = 0;
    sxx.fill(0);
    sxy.fill(0);
    out.syy = 0;
    return;
  }
  for (let a = 0; a < p; a++) means[a] = (shift[a] as number) + (sum[a] as number) / n;
  out.meanY = (shift[p] as number) + (sum[p] as number) / n;
  const centred = (a: number, b: number): number => (prod[a * q + b] as number) - ((sum[a] as number) * (sum[b] as number)) / n;
  for (let a = 0; a < p; a++) {
    for (let b = a; b < p; b++) {
      const v = centred(a, b);
      sxx[a * p + b] = v;
      sxx[b * p + a] = v;
    }
    sxy[a] = centred(a, p);
  }
  out.syy = centred(p, p);
}

/**
 * The two-group ANCOVA estimate of the programme effect with several
 * covariates and common slopes, by the normal equations on pooled
 * within-group moments (Huitema 2011, "The Analysis of Covariance and
 * Alternatives", 2nd ed., ch. 10, multiple ANCOVA; Searle 1971 for the OLS
 * algebra; from memory). With a correction matrix Λ it is the multivariate
 * reliability-corrected ANCOVA: each member's covariates are replaced by
 * X̄_g + Λ (X − X̄_g) (own group's means; Λ = Σ_T'[m, m] Σ_X[m, m]^-1, the
 * several-variable Kelley estimate; Porter 1967 in one variable), then ordinary
 * ANCOVA. With W, w the pooled within-group products:
 *
 *   A = Λ W Λ',  c = Λ w,  b = A^-1 c
 *   estimate = (Ȳ_P − Ȳ_C) − b'(X̄_P − X̄_C)
 *   s² = (S_yy − b'c) / (n_P + n_C − 2 − p)
 *   SE = s · sqrt(1/n_P + 1/n_C + (X̄_P − X̄_C)' A^-1 (X̄_P − X̄_C))
 *
 * (the replacement keeps group means and residuals' form; Λ is treated as
 * known, as the one-covariate engine treats rho'). With p = 1 and Λ = rho'
 * this is exactly ancovaEstimate.
 *
 * @param P programme moments. @param C comparison moments (same p).
 * @param correction Λ, p × p row-major, or null for ordinary ANCOVA.
 * @param out receives [estimate, SE, df].
 * @returns false when it cannot be computed (df < 1, singular covariates, zero
 *   residual variance); `out` is then untouched.
 * @throws never.
 * @example p = 1, no correction: the same numbers as ancovaEstimate (tested).
 */
export function ancovaOnCovariates(P: GroupMoments, C: GroupMoments, correction: Float64Array | null, out: Float64Array): boolean {
  const p = P.p;
  const df = P.n + C.n - 2 - p;
  if (!(df >= 1)) return false;
  const { W, w, A, c, LW, x } = P.work;
  for (let a = 0; a < p * p; a++) W[a] = (P.sxx[a] as number) + (C.sxx[a] as number);
  for (let a = 0; a < p; a++) w[a] = (P.sxy[a] as number) + (C.sxy[a] as number);
  if (correction) {
    const L = correction;
    for (let a = 0; a < p; a++) {
      for (let b = 0; b < p; b++) {
        let s = 0;
        for (let t = 0; t < p; t++) s += (L[a * p + t] as number) * (W[t * p + b] as number);
        LW[a * p + b] = s;
      }
    }
    for (let a = 0; a < p; a++) {
      let s = 0;
      for (let t = 0; t < p; t++) s += (L[a * p + t] as number) * (w[t] as number);
      c[a] = s;
      for (let b = 0; b <= a; b++) {
        let v = 0;
        for (let t = 0; t < p; t++) v += (LW[a * p + t] as number) * (L[b * p + t] as number);
        A[a * p + b] = v;
      }
    }
  } else {
    A.set(W);
    c.set(w);
  }
  const sumsOfProducts = c.slice(); // c is needed after A is factored
  if (!choleskyInPlace(A, p)) return false;
  // b = A^-1 c (in c); A^-1 ΔX̄ (in x).
  choleskySolveInPlace(A, p, c);
  for (let a = 0; a < p; a++) x[a] = (P.means[a] as number) - (C.means[a] as number);
  let bc = 0;
  let bdx = 0;
  for (let a = 0; a < p; a++) {
    bc += (c[a] as number) * (sumsOfProducts[a] as number);
    bdx += (c[a] as number) * (x[a] as number);
  }
  const dx = x.slice();
  choleskySolveInPlace(A, p, x);
  let quad = 0;
  for (let a = 0; a < p; a++) quad += (dx[a] as number) * (x[a] as number);
  const rss = P.syy + C.syy - bc;
  if (!(rss > 0)) return false;
  const estimate = P.meanY - C.meanY - bdx;
  const se = Math.sqrt((rss / df) * (1 / P.n + 1 / C.n + quad));
  if (!Number.isFinite(estimate) || !(se > 0) || !Number.isFinite(se)) return false;
  out[0] = estimate;
  out[1] = se;
  out[2] = df;
  return true;
}
