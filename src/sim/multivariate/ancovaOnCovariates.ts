import type { MatchingWeights } from '../matchingWeights';
import { welchSatterthwaite } from '../welchSatterthwaite';
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
    /** The running sums of one groupMoments sweep (a column's sum and up to five products). */
    block: Float64Array;
    /** The last three columns' nine sums (lastThreeSums). */
    tail: Float64Array;
    /** The covariate columns and the outcome, as groupMoments sweeps them (references only). */
    all: Float64Array[];
    /** The counted rows of a weighted call and their weights (grown on first use). */
    rows: Int32Array;
    rowWeight: Float64Array;
    W: Float64Array;
    w: Float64Array;
    A: Float64Array;
    c: Float64Array;
    LW: Float64Array;
    x: Float64Array;
    G: Float64Array;
    g: Float64Array;
    h: Float64Array;
    b: Float64Array;
    dx: Float64Array;
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
      block: new Float64Array(6),
      tail: new Float64Array(9),
      all: new Array<Float64Array>(q),
      rows: new Int32Array(0),
      rowWeight: new Float64Array(0),
      W: new Float64Array(p * p),
      w: new Float64Array(p),
      A: new Float64Array(p * p),
      c: new Float64Array(p),
      LW: new Float64Array(p * p),
      x: new Float64Array(p),
      G: new Float64Array(p * p),
      g: new Float64Array(p),
      h: new Float64Array(p),
      b: new Float64Array(p),
      dx: new Float64Array(p),
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
    // Weighted: the rows counted (weight ≠ 0) and their weights, in order, listed once.
    let counted = 0;
    if (weight) {
      if (out.work.rows.length < to - first) {
        out.work.rows = new Int32Array(to - first);
        out.work.rowWeight = new Float64Array(to - first);
      }
      const { rows, rowWeight } = out.work;
      for (let i = first; i < to; i++) {
        const w = weight[i - from] as number;
        if (w === 0) continue;
        n += w;
        rows[counted] = i;
        rowWeight[counted++] = w;
      }
    } else n = to - first;
    // Column by column, each sweep summing one column a's shifted values and its products with up
    // to five columns b ≥ a (blockSums), each sum over the rows in order with the same operations
    // per row as a row-by-row sweep (w (x_a − shift_a)) (x_b − shift_b): the same bits, with
    // every running sum of a sweep in a register, in q(q + 1)/2 / 5 sweeps or so instead of one per pair.
    const all = out.work.all;
    for (let a = 0; a < p; a++) all[a] = columns[a] as Float64Array;
    all[p] = y;
    const block = out.work.block;
    // The last three columns (one to three sums of products each) share one sweep (lastThreeSums).
    const single = q >= 3 ? q - 3 : q;
    for (let a = 0; a < single; a++) {
      const xa = all[a] as Float64Array;
      const sa = shift[a] as number;
      for (let b = a; b < q; b += 5) {
        const width = Math.min(5, q - b);
        // Columns b … b + width − 1 (the unused places filled with column a, ignored).
        const x0 = all[b] as Float64Array;
        const x1 = width > 1 ? (all[b + 1] as Float64Array) : xa;
        const x2 = width > 2 ? (all[b + 2] as Float64Array) : xa;
        const x3 = width > 3 ? (all[b + 3] as Float64Array) : xa;
        const x4 = width > 4 ? (all[b + 4] as Float64Array) : xa;
        const s0 = shift[b] as number;
        const s1 = width > 1 ? (shift[b + 1] as number) : sa;
        const s2 = width > 2 ? (shift[b + 2] as number) : sa;
        const s3 = width > 3 ? (shift[b + 3] as number) : sa;
        const s4 = width > 4 ? (shift[b + 4] as number) : sa;
        if (weight) blockSumsWeighted(xa, sa, x0, s0, x1, s1, x2, s2, x3, s3, x4, s4, width, out.work.rows, out.work.rowWeight, counted, block);
        else blockSums(xa, sa, x0, s0, x1, s1, x2, s2, x3, s3, x4, s4, width, first, to, block);
        if (b === a) sum[a] = block[0] as number;
        for (let j = 0; j < width; j++) prod[a * q + b + j] = block[j + 1] as number;
      }
    }
    if (single < q) {
      const a = single;
      const x0 = all[a] as Float64Array;
      const x1 = all[a + 1] as Float64Array;
      const x2 = all[a + 2] as Float64Array;
      const s0 = shift[a] as number;
      const s1 = shift[a + 1] as number;
      const s2 = shift[a + 2] as number;
      const t = out.work.tail;
      if (weight) lastThreeSumsWeighted(x0, s0, x1, s1, x2, s2, out.work.rows, out.work.rowWeight, counted, t);
      else lastThreeSums(x0, s0, x1, s1, x2, s2, first, to, t);
      sum[a] = t[0] as number;
      prod[a * q + a] = t[1] as number;
      prod[a * q + a + 1] = t[2] as number;
      prod[a * q + a + 2] = t[3] as number;
      sum[a + 1] = t[4] as number;
      prod[(a + 1) * q + a + 1] = t[5] as number;
      prod[(a + 1) * q + a + 2] = t[6] as number;
      sum[a + 2] = t[7] as number;
      prod[(a + 2) * q + a + 2] = t[8] as number;
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
 * Σ (x_a − s_a) into out[0] and Σ (x_a − s_a)(x_bj − s_bj) into out[1 + j] for the
 * `width` (1..5) columns b0…b4 (unused ones are ignored), over rows [first, to) in order.
 */
function blockSums(
  xa: Float64Array,
  sa: number,
  x0: Float64Array,
  s0: number,
  x1: Float64Array,
  s1: number,
  x2: Float64Array,
  s2: number,
  x3: Float64Array,
  s3: number,
  x4: Float64Array,
  s4: number,
  width: number,
  first: number,
  to: number,
  out: Float64Array,
): void {
  let s = 0;
  let h0 = 0;
  let h1 = 0;
  let h2 = 0;
  let h3 = 0;
  let h4 = 0;
  if (width === 5) {
    for (let i = first; i < to; i++) {
      const da = (xa[i] as number) - sa;
      s += da;
      h0 += da * ((x0[i] as number) - s0);
      h1 += da * ((x1[i] as number) - s1);
      h2 += da * ((x2[i] as number) - s2);
      h3 += da * ((x3[i] as number) - s3);
      h4 += da * ((x4[i] as number) - s4);
    }
  } else if (width === 4) {
    for (let i = first; i < to; i++) {
      const da = (xa[i] as number) - sa;
      s += da;
      h0 += da * ((x0[i] as number) - s0);
      h1 += da * ((x1[i] as number) - s1);
      h2 += da * ((x2[i] as number) - s2);
      h3 += da * ((x3[i] as number) - s3);
    }
  } else if (width === 3) {
    for (let i = first; i < to; i++) {
      const da = (xa[i] as number) - sa;
      s += da;
      h0 += da * ((x0[i] as number) - s0);
      h1 += da * ((x1[i] as number) - s1);
      h2 += da * ((x2[i] as number) - s2);
    }
  } else if (width === 2) {
    for (let i = first; i < to; i++) {
      const da = (xa[i] as number) - sa;
      s += da;
      h0 += da * ((x0[i] as number) - s0);
      h1 += da * ((x1[i] as number) - s1);
    }
  } else {
    for (let i = first; i < to; i++) {
      const da = (xa[i] as number) - sa;
      s += da;
      h0 += da * ((x0[i] as number) - s0);
    }
  }
  out[0] = s;
  out[1] = h0;
  out[2] = h1;
  out[3] = h2;
  out[4] = h3;
  out[5] = h4;
}

/**
 * The sums of the last three columns a, b, c in one sweep over rows [first, to), in order:
 * out = [Σd_a, Σd_a d_a, Σd_a d_b, Σd_a d_c, Σd_b, Σd_b d_b, Σd_b d_c, Σd_c, Σd_c d_c]
 * with d = x − shift (each sum as blockSums would take it).
 */
function lastThreeSums(xa: Float64Array, sa: number, xb: Float64Array, sb: number, xc: Float64Array, sc: number, first: number, to: number, out: Float64Array): void {
  let a1 = 0; let aa = 0; let ab = 0; let ac = 0;
  let b1 = 0; let bb = 0; let bc = 0;
  let c1 = 0; let cc = 0;
  for (let i = first; i < to; i++) {
    const da = (xa[i] as number) - sa;
    const db = (xb[i] as number) - sb;
    const dc = (xc[i] as number) - sc;
    a1 += da;
    aa += da * da;
    ab += da * db;
    ac += da * dc;
    b1 += db;
    bb += db * db;
    bc += db * dc;
    c1 += dc;
    cc += dc * dc;
  }
  out[0] = a1; out[1] = aa; out[2] = ab; out[3] = ac;
  out[4] = b1; out[5] = bb; out[6] = bc;
  out[7] = c1; out[8] = cc;
}

/** lastThreeSums over the listed rows with weights (each sum as blockSumsWeighted would take it: w d_a, then (w d_a) d_b). */
function lastThreeSumsWeighted(
  xa: Float64Array,
  sa: number,
  xb: Float64Array,
  sb: number,
  xc: Float64Array,
  sc: number,
  rows: Int32Array,
  weight: Float64Array,
  count: number,
  out: Float64Array,
): void {
  let a1 = 0; let aa = 0; let ab = 0; let ac = 0;
  let b1 = 0; let bb = 0; let bc = 0;
  let c1 = 0; let cc = 0;
  for (let t = 0; t < count; t++) {
    const i = rows[t] as number;
    const w = weight[t] as number;
    const da = (xa[i] as number) - sa;
    const db = (xb[i] as number) - sb;
    const dc = (xc[i] as number) - sc;
    const wa = w * da;
    a1 += wa;
    aa += wa * da;
    ab += wa * db;
    ac += wa * dc;
    const wb = w * db;
    b1 += wb;
    bb += wb * db;
    bc += wb * dc;
    const wc = w * dc;
    c1 += wc;
    cc += wc * dc;
  }
  out[0] = a1; out[1] = aa; out[2] = ab; out[3] = ac;
  out[4] = b1; out[5] = bb; out[6] = bc;
  out[7] = c1; out[8] = cc;
}

/** The same over the listed rows rows[0..count), row rows[t] counted weight[t] times (the rows of weight 0 left out, in order): sums of w (x_a − s_a) and of w (x_a − s_a)(x_bj − s_bj). */
function blockSumsWeighted(
  xa: Float64Array,
  sa: number,
  x0: Float64Array,
  s0: number,
  x1: Float64Array,
  s1: number,
  x2: Float64Array,
  s2: number,
  x3: Float64Array,
  s3: number,
  x4: Float64Array,
  s4: number,
  width: number,
  rows: Int32Array,
  weight: Float64Array,
  count: number,
  out: Float64Array,
): void {
  let s = 0;
  let h0 = 0;
  let h1 = 0;
  let h2 = 0;
  let h3 = 0;
  let h4 = 0;
  if (width === 5) {
    for (let t = 0; t < count; t++) {
      const i = rows[t] as number;
      const wa = (weight[t] as number) * ((xa[i] as number) - sa);
      s += wa;
      h0 += wa * ((x0[i] as number) - s0);
      h1 += wa * ((x1[i] as number) - s1);
      h2 += wa * ((x2[i] as number) - s2);
      h3 += wa * ((x3[i] as number) - s3);
      h4 += wa * ((x4[i] as number) - s4);
    }
  } else if (width === 4) {
    for (let t = 0; t < count; t++) {
      const i = rows[t] as number;
      const wa = (weight[t] as number) * ((xa[i] as number) - sa);
      s += wa;
      h0 += wa * ((x0[i] as number) - s0);
      h1 += wa * ((x1[i] as number) - s1);
      h2 += wa * ((x2[i] as number) - s2);
      h3 += wa * ((x3[i] as number) - s3);
    }
  } else {
    for (let t = 0; t < count; t++) {
      const i = rows[t] as number;
      const wa = (weight[t] as number) * ((xa[i] as number) - sa);
      s += wa;
      h0 += wa * ((x0[i] as number) - s0);
      if (width > 1) h1 += wa * ((x1[i] as number) - s1);
      if (width > 2) h2 += wa * ((x2[i] as number) - s2);
    }
  }
  out[0] = s;
  out[1] = h0;
  out[2] = h1;
  out[3] = h2;
  out[4] = h3;
  out[5] = h4;
}

/**
 * A group's own residual variance of Y given its covariates,
 * (S_yy − s_xy' S_xx⁻¹ s_xy) / (n − 1 − p): the conditional variance
 * Var(Y | X) in that group under a linear model (any regression text;
 * common practice). Uses G.work.G and G.work.g as scratch.
 *
 * @param G the group's moments (n > p + 1 for a value).
 * @returns the variance (points², ≥ 0), or NaN when n ≤ p + 1 or the group's
 *   covariates are collinear within it (S_xx not positive definite).
 * @throws never.
 * @example rows x = 1, 2, 3, 4 and y = 1, 3, 2, 4 → (5 − 4²/5)/(4 − 2) = 0.9 (hand-worked).
 */
export function residualVariance(G: GroupMoments): number {
  const p = G.p;
  const df = G.n - 1 - p;
  if (!(df > 0)) return NaN;
  const { G: S, g } = G.work;
  S.set(G.sxx);
  g.set(G.sxy);
  if (!choleskyInPlace(S, p)) return NaN;
  choleskySolveInPlace(S, p, g);
  let fit = 0;
  for (let a = 0; a < p; a++) fit += (g[a] as number) * (G.sxy[a] as number);
  return Math.max(0, G.syy - fit) / df;
}

/**
 * Stacked comparison rows of a matched sample (a member used n_j times
 * appears n_j times): its use counts, its covariate columns (comparison rows
 * at positions from + j) and σ²_C, the comparison group's conditional
 * variance of Y given the covariates (from the full pool).
 */
export interface StackedComparison {
  readonly weights: MatchingWeights;
  readonly columns: readonly Float64Array[];
  readonly from: number;
  readonly sigma2: number;
}

/**
 * The two-group ANCOVA estimate of the programme effect with several
 * covariates and common slopes, by the normal equations on pooled
 * within-group moments (Huitema 2011, "The Analysis of Covariance and
 * Alternatives", 2nd ed., ch. 10, multiple ANCOVA; Searle 1971 for the OLS
 * algebra; from memory), with the group-wise delta-method SE of
 * ancovaEstimate. With a correction matrix Λ it is the multivariate
 * reliability-corrected ANCOVA: each member's covariates are replaced by
 * X̄_g + Λ (X − X̄_g) (own group's means; Λ = Σ_T'[m, m] Σ_X[m, m]^-1, the
 * several-variable Kelley estimate; Porter 1967 in one variable), then
 * ordinary ANCOVA. With W, w the pooled within-group products:
 *
 *   A = Λ W Λ',  c = Λ w,  b = A^-1 c   (= Λ'^-1 b0, b0 = W^-1 w, when Λ is invertible)
 *   estimate θ̂ = (Ȳ_P − Ȳ_C) − b'(X̄_P − X̄_C)
 *
 * SE (delta method; docs/simulation.md): b moves with b0 through
 * ∂b/∂b0 = A^-1 Λ W, so with h = Λ' A^-1 ΔX̄ (h = W^-1 ΔX̄ without Λ) and
 * Var(b0) = W^-1 (Σ_g σ̂²_g W_g) W^-1,
 *
 *   Var(θ̂) ≈ Σ_g [ s²_{D,g} / n_g + σ̂²_g h' W_g h ],
 *   s²_{D,g} = (S_yy,g − 2 b' w_g + b' W_g b) / (n_g − 1)   (variance of Y − b'X in group g),
 *
 * σ̂²_g group g's own residual variance (residualVariance; the pooled OLS
 * residual variance if its covariates are collinear within it). df:
 * Welch–Satterthwaite over the two groups' shares, each on n_g − 1 − p df
 * (Welch 1947). With `stacked` the comparison share is
 * s²_{D,C} Σn_j²/N² + σ²_C Σ_j n_j² (h'(x_j − x̄_C))², s²_{D,C} with divisor
 * N − Σn_j²/N, df N²/Σn_j² − 1 − p (Kish 1965's effective size). With p = 1
 * and Λ = rho' this is exactly ancovaEstimate.
 *
 * What a naive analysis would report (out[3], out[4] when `out` has room):
 * the OLS SE s·sqrt(1/n_P + 1/n_C + ΔX̄' A^-1 ΔX̄), s² = (S_yy − b'c)/(n − 2 − p).
 *
 * @param P programme moments. @param C comparison moments (same p; over the stacked rows when `stacked`).
 * @param correction Λ, p × p row-major, or null for ordinary ANCOVA.
 * @param out receives [estimate, SE, df] (and [naive OLS SE, its df] when length ≥ 5).
 * @param stacked the comparison rows' reuse, or null when each row is a distinct person.
 * @returns false when it cannot be computed (a group with ≤ p + 1 rows (effective rows when
 *   stacked), singular covariates, zero residual variance); `out` is then untouched.
 * @throws never.
 * @example p = 1, Λ = [0.8]: the same numbers as ancovaEstimate(m, 0.8, out) (tested).
 */
export function ancovaOnCovariates(
  P: GroupMoments,
  C: GroupMoments,
  correction: Float64Array | null,
  out: Float64Array,
  stacked: StackedComparison | null = null,
): boolean {
  const p = P.p;
  const df = P.n + C.n - 2 - p;
  if (!(df >= 1) || !(P.n > p + 1) || !(C.n > p + 1)) return false;
  const { W, w, A, c, LW, x, h, b, dx } = P.work;
  for (let a = 0; a < p * p; a++) W[a] = (P.sxx[a] as number) + (C.sxx[a] as number);
  for (let a = 0; a < p; a++) w[a] = (P.sxy[a] as number) + (C.sxy[a] as number);
  if (correction) {
    const L = correction;
    for (let a = 0; a < p; a++) {
      for (let bb = 0; bb < p; bb++) {
        let s = 0;
        for (let t = 0; t < p; t++) s += (L[a * p + t] as number) * (W[t * p + bb] as number);
        LW[a * p + bb] = s;
      }
    }
    for (let a = 0; a < p; a++) {
      let s = 0;
      for (let t = 0; t < p; t++) s += (L[a * p + t] as number) * (w[t] as number);
      c[a] = s;
      for (let bb = 0; bb <= a; bb++) {
        let v = 0;
        for (let t = 0; t < p; t++) v += (LW[a * p + t] as number) * (L[bb * p + t] as number);
        A[a * p + bb] = v;
      }
    }
  } else {
    A.set(W);
    c.set(w);
  }
  b.set(c); // c is needed after A is factored
  if (!choleskyInPlace(A, p)) return false;
  // b = A^-1 c; x = A^-1 ΔX̄.
  choleskySolveInPlace(A, p, b);
  for (let a = 0; a < p; a++) x[a] = (P.means[a] as number) - (C.means[a] as number);
  dx.set(x);
  let bc = 0;
  let bdx = 0;
  for (let a = 0; a < p; a++) {
    bc += (b[a] as number) * (c[a] as number);
    bdx += (b[a] as number) * (dx[a] as number);
  }
  choleskySolveInPlace(A, p, x);
  let quad = 0;
  for (let a = 0; a < p; a++) quad += (dx[a] as number) * (x[a] as number);
  const rss = P.syy + C.syy - bc;
  if (!(rss > 0)) return false;
  const estimate = P.meanY - C.meanY - bdx;
  if (!Number.isFinite(estimate)) return false;
  // h = Λ' A^-1 ΔX̄ (how the slope's noise reaches the estimate).
  if (correction) {
    const L = correction;
    for (let a = 0; a < p; a++) {
      let s = 0;
      for (let t = 0; t < p; t++) s += (L[t * p + a] as number) * (x[t] as number);
      h[a] = s;
    }
  } else {
    h.set(x);
  }
  const pooled2 = rss / df;
  const sigma2P = residualVariance(P);
  const uP = varianceOfYMinusBX(P, b) / (P.n - 1) / P.n + (Number.isNaN(sigma2P) ? pooled2 : sigma2P) * quadraticForm(P.sxx, h, p);
  let uC: number;
  let dfC: number;
  if (stacked === null) {
    const sigma2C = residualVariance(C);
    uC = varianceOfYMinusBX(C, b) / (C.n - 1) / C.n + (Number.isNaN(sigma2C) ? pooled2 : sigma2C) * quadraticForm(C.sxx, h, p);
    dfC = C.n - 1 - p;
  } else {
    const { weights, columns, from, sigma2 } = stacked;
    const n2 = weights.sumUses2();
    const N = C.n;
    const effective = (N * N) / n2;
    if (!(effective > p + 1)) return false;
    const { uses, touched } = weights;
    let q = 0;
    for (let t = 0; t < weights.touchedCount; t++) {
      const j = touched[t] as number;
      let z = 0;
      for (let a = 0; a < p; a++) z += (h[a] as number) * (((columns[a] as Float64Array)[from + j] as number) - (C.means[a] as number));
      const u = uses[j] as number;
      q += u * u * z * z;
    }
    uC = (varianceOfYMinusBX(C, b) / (N - n2 / N)) * (n2 / (N * N)) + Math.max(0, sigma2) * q;
    dfC = effective - 1 - p;
  }
  if (!welchSatterthwaite(Math.max(0, uP), P.n - 1 - p, Math.max(0, uC), dfC, out)) return false;
  out[0] = estimate;
  if (out.length >= 5) {
    out[3] = Math.sqrt(pooled2 * (1 / P.n + 1 / C.n + quad));
    out[4] = df;
  }
  return true;
}

/** Σ (Y − b'X − mean)² over a group's rows: S_yy − 2 b'w + b'W b (≥ 0). */
function varianceOfYMinusBX(G: GroupMoments, b: Float64Array): number {
  const p = G.p;
  let bw = 0;
  for (let a = 0; a < p; a++) bw += (b[a] as number) * (G.sxy[a] as number);
  return Math.max(0, G.syy - 2 * bw + quadraticForm(G.sxx, b, p));
}

/** v' S v for a p × p row-major S. */
function quadraticForm(S: Float64Array, v: Float64Array, p: number): number {
  let s = 0;
  for (let a = 0; a < p; a++) {
    let r = 0;
    for (let t = 0; t < p; t++) r += (S[a * p + t] as number) * (v[t] as number);
    s += (v[a] as number) * r;
  }
  return s;
}
