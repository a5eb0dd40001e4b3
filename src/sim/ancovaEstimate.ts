import type { StackedComparison } from './multivariate/ancovaOnCovariates';
import { welchSatterthwaite } from './welchSatterthwaite';

/**
 * The two-group ANCOVA estimate of the programme effect from within-group
 * moments, one covariate X, common slope (Lord 1960; any regression text,
 * e.g. Maxwell & Delaney 2004, ch. 9), with a standard error that holds for
 * the estimator under unequal group variances. With
 * `reliabilityCorrection` rho' < 1 it is Porter's (1967) corrected ANCOVA:
 * X is replaced within each group by X̄_g + rho' (X − X̄_g), which divides the
 * pooled within-group slope by rho'. With c = 1/rho':
 *
 *   b0 = (Sxy_P + Sxy_C) / (Sxx_P + Sxx_C),   b = c·b0
 *   estimate θ̂ = (Ȳ_P − Ȳ_C) − b (X̄_P − X̄_C)
 *
 * SE — delta method, group-wise (docs/simulation.md, "Standard errors"):
 * θ̂ = Σ_g ±(Ȳ_g − b X̄_g); linearising in the group means and in b0 (under
 * normal scores the sample means are independent of the within-group sums of
 * products, so the two parts add):
 *
 *   Var(θ̂) ≈ Σ_g s²_{D,g} / n_g + c² ΔX̄² Var(b0),
 *   s²_{D,g} = (Syy_g − 2b Sxy_g + b² Sxx_g) / (n_g − 1)   (the variance of Y − bX in group g),
 *   Var(b0) = Σ_g Sxx_g σ̂²_g / Sxx²,   σ̂²_g = (Syy_g − Sxy_g² / Sxx_g) / (n_g − 2)
 *
 * (σ̂²_g is group g's own residual variance of Y given X; the groups'
 * variances differ under the model because their reliabilities differ).
 * Unlike the OLS SE this counts the sampling variance of the group pretest
 * means that the correction multiplies (c ≠ 1), and does not assume equal
 * residual variances (c = 1 too). df: Welch–Satterthwaite (Welch 1947), each
 * group's share u_g = s²_{D,g}/n_g + c² ΔX̄² Sxx_g σ̂²_g / Sxx² taken as a
 * scaled chi-square on n_g − 2 df (welchSatterthwaite). The numbers are the
 * several-covariate ancovaOnCovariates' with p = 1 and Λ = [rho'], bit for bit
 * (its operations written out in scalars, ancovaOneCovariate below: the
 * one-pretest engines call this three times a replication); a group whose X
 * has no spread uses the pooled residual variance instead of its own.
 *
 * Stacked comparison rows (ANCOVA in a matched sample with replacement, a
 * comparison member used n_j times appearing n_j times): pass `stacked`
 * (the use counts, the comparison pretest column and σ²_C) with the
 * comparison moments taken over the stacked rows (n_C = Σ n_j = N); with
 * Q = Σ n_j² (x_j − x̄_C)² the
 * comparison share is then s²_{D,C} Σn_j²/N² + c² ΔX̄² σ²_C Q / Sxx², with
 * s²_{D,C} the weighted variance of Y − bX over distinct members (divisor
 * N − Σn_j²/N, unbiased for independent values under fixed weights), σ²_C the
 * comparison group's conditional variance of Y given X (from the full pool),
 * and df from Kish's (1965) effective size N²/Σn_j² − 2. Without reuse
 * (every n_j = 1) this is the ordinary group-wise form.
 *
 * What a naive analysis would report: the OLS SE s·sqrt(1/n_P + 1/n_C +
 * ΔX̄² / (rho'² Sxx)), s² = (Syy − b0² Sxx)/(n − 3), df n − 3, written to
 * out[3], out[4] when `out` has room (rho' treated as known, equal residual
 * variances, reused rows independent).
 *
 * @param m Float64Array [nP, meanXP, meanYP, SxxP, SxyP, SyyP, nC, meanXC, meanYC, SxxC, SxyC, SyyC];
 *   S.. are within-group sums of squares and cross-products about the group means (points²).
 * @param reliabilityCorrection rho' in (0, 1]; 1 gives ordinary ANCOVA.
 * @param out Float64Array(3 or 5) receiving [estimate, SE, df] (and [naive OLS SE, n − 3]).
 * @param stacked stacked comparison rows' reuse (StackedComparison, one column), or null (each row a distinct person).
 * @returns false when the estimate cannot be computed (fewer than 3 people, or 3 effective, in a
 *   group, no within-group covariate variation, or zero residual variance); `out` is then untouched.
 * @throws never.
 * @example
 *   // P: X̄ 10, Ȳ 12; C: X̄ 12, Ȳ 13; Sxx 10+10, Sxy 5+5 → b = 0.5, estimate = -1 + 1 = 0 (hand-worked).
 */
export function ancovaEstimate(
  m: Float64Array,
  reliabilityCorrection: number,
  out: Float64Array,
  stacked: StackedComparison | null = null,
): boolean {
  return ancovaOneCovariate(m, reliabilityCorrection === 1 ? null : reliabilityCorrection, out, stacked);
}

/**
 * ancovaOnCovariates with p = 1 written out in scalars: the same floating-point
 * operations in the same order (a 1 × 1 Cholesky factor is sqrt(A), each solve
 * divides by it twice, each length-1 sum starts from 0), so the same bits, without
 * the general routine's loops over typed-array work space (the engine calls this
 * three times a replication). test/sim/ancovaOneCovariate.test.ts checks it
 * against ancovaOnCovariates bit for bit.
 * @param m moments in ancovaEstimate's layout. @param lambda rho', or null for none (rho' = 1).
 * @param out [estimate, SE, df] (and the naive figures when it has room 5). @param stacked as ancovaEstimate.
 * @returns as ancovaOnCovariates (false leaves `out` untouched). @throws never.
 * @example ancovaOneCovariate(Float64Array.of(20, 10, 12, 10, 5, 30, 20, 12, 13, 10, 5, 30), null, out) // out[0] = 0 (hand-worked, as ancovaEstimate)
 */
function ancovaOneCovariate(m: Float64Array, lambda: number | null, out: Float64Array, stacked: StackedComparison | null): boolean {
  const nP = m[0] as number, mxP = m[1] as number, myP = m[2] as number;
  const sxxP = m[3] as number, sxyP = m[4] as number, syyP = m[5] as number;
  const nC = m[6] as number, mxC = m[7] as number, myC = m[8] as number;
  const sxxC = m[9] as number, sxyC = m[10] as number, syyC = m[11] as number;
  const df = nP + nC - 2 - 1;
  if (!(df >= 1) || !(nP > 1 + 1) || !(nC > 1 + 1)) return false;
  const W = sxxP + sxxC;
  const w = sxyP + sxyC;
  let A: number;
  let c: number;
  if (lambda !== null) {
    const LW = 0 + lambda * W;
    c = 0 + lambda * w;
    A = 0 + LW * lambda;
  } else {
    A = W;
    c = w;
  }
  // Cholesky of the 1 × 1 matrix A (choleskyInPlace's test), then b = A^-1 c and x = A^-1 ΔX̄.
  if (!(A > 1e-12 * Math.abs(A)) || !(A > 0)) return false;
  const L = Math.sqrt(A);
  const b = c / L / L;
  const dx = mxP - mxC;
  const bc = 0 + b * c;
  const bdx = 0 + b * dx;
  const x = dx / L / L;
  const quad = 0 + dx * x;
  const rss = syyP + syyC - bc;
  if (!(rss > 0)) return false;
  const estimate = myP - myC - bdx;
  if (!Number.isFinite(estimate)) return false;
  const h = lambda !== null ? 0 + lambda * x : x;
  const pooled2 = rss / df;
  const sigma2P = residualVariance1(nP, sxxP, sxyP, syyP);
  const uP = varianceOfYMinusBX1(sxxP, sxyP, syyP, b) / (nP - 1) / nP + (Number.isNaN(sigma2P) ? pooled2 : sigma2P) * quadraticForm1(sxxP, h);
  let uC: number;
  let dfC: number;
  if (stacked === null) {
    const sigma2C = residualVariance1(nC, sxxC, sxyC, syyC);
    uC = varianceOfYMinusBX1(sxxC, sxyC, syyC, b) / (nC - 1) / nC + (Number.isNaN(sigma2C) ? pooled2 : sigma2C) * quadraticForm1(sxxC, h);
    dfC = nC - 1 - 1;
  } else {
    const { weights, columns, from, sigma2 } = stacked;
    const n2 = weights.sumUses2();
    const N = nC;
    const effective = (N * N) / n2;
    if (!(effective > 1 + 1)) return false;
    const { uses, touched } = weights;
    const column = columns[0] as Float64Array;
    let q = 0;
    for (let t = 0; t < weights.touchedCount; t++) {
      const j = touched[t] as number;
      const z = 0 + h * ((column[from + j] as number) - mxC);
      const u = uses[j] as number;
      q += u * u * z * z;
    }
    uC = (varianceOfYMinusBX1(sxxC, sxyC, syyC, b) / (N - n2 / N)) * (n2 / (N * N)) + Math.max(0, sigma2) * q;
    dfC = effective - 1 - 1;
  }
  if (!welchSatterthwaite(Math.max(0, uP), nP - 1 - 1, Math.max(0, uC), dfC, out)) return false;
  out[0] = estimate;
  if (out.length >= 5) {
    out[3] = Math.sqrt(pooled2 * (1 / nP + 1 / nC + quad));
    out[4] = df;
  }
  return true;
}

/** residualVariance (ancovaOnCovariates.ts) with p = 1. */
function residualVariance1(n: number, sxx: number, sxy: number, syy: number): number {
  const df = n - 1 - 1;
  if (!(df > 0)) return NaN;
  if (!(sxx > 1e-12 * Math.abs(sxx)) || !(sxx > 0)) return NaN;
  const L = Math.sqrt(sxx);
  const g = sxy / L / L;
  const fit = 0 + g * sxy;
  return Math.max(0, syy - fit) / df;
}

/** varianceOfYMinusBX (ancovaOnCovariates.ts) with p = 1: Σ (Y − bX − mean)². */
function varianceOfYMinusBX1(sxx: number, sxy: number, syy: number, b: number): number {
  const bw = 0 + b * sxy;
  return Math.max(0, syy - 2 * bw + quadraticForm1(sxx, b));
}

/** quadraticForm (ancovaOnCovariates.ts) with p = 1: v S v. */
function quadraticForm1(S: number, v: number): number {
  const r = 0 + S * v;
  return 0 + v * r;
}
