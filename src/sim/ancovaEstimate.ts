/**
 * The two-group ANCOVA estimate of the programme effect from within-group
 * moments: OLS of Y on a group indicator and a covariate X with a common slope
 * (Lord 1960; any regression text, e.g. Maxwell & Delaney 2004, ch. 9).
 * With `reliabilityCorrection` rho' < 1 it is Porter's (1967) corrected
 * ANCOVA: X is replaced within each group by mean_g + rho' (X - mean_g), which
 * divides the pooled within-group slope by rho' and leaves the residuals (so
 * the residual variance) unchanged.
 *
 *   b = (Sxy_P + Sxy_C) / (Sxx_P + Sxx_C) / rho'
 *   estimate = (Ybar_P - Ybar_C) - b (Xbar_P - Xbar_C)
 *   s^2 = (Syy_P + Syy_C - rho'^2 b^2 (Sxx_P + Sxx_C)) / (n_P + n_C - 3)
 *   SE = s sqrt(1/n_P + 1/n_C + (Xbar_P - Xbar_C)^2 / (rho'^2 (Sxx_P + Sxx_C)))
 *
 * S.. are within-group sums of squares and cross-products about the group means.
 * The SE is the ordinary OLS one (it treats rho' as known).
 *
 * @param m Float64Array [nP, meanXP, meanYP, SxxP, SxyP, SyyP, nC, meanXC, meanYC, SxxC, SxyC, SyyC].
 * @param reliabilityCorrection rho' in (0, 1]; 1 gives ordinary ANCOVA.
 * @param out Float64Array(3) receiving [estimate, SE, df].
 * @returns false when the estimate cannot be computed (fewer than 4 people,
 *   no within-group covariate variation, or zero residual variance); `out` is then untouched.
 * @example
 *   // P: X̄ 10, Ȳ 12; C: X̄ 12, Ȳ 13; Sxx 10+10, Sxy 5+5 → b = 0.5, estimate = -1 + 1 = 0 (hand-worked).
 */
export function ancovaEstimate(m: Float64Array, reliabilityCorrection: number, out: Float64Array): boolean {
  const nP = m[0] as number;
  const nC = m[6] as number;
  const sxx = (m[3] as number) + (m[9] as number);
  const sxy = (m[4] as number) + (m[10] as number);
  const syy = (m[5] as number) + (m[11] as number);
  const df = nP + nC - 3;
  if (!(df >= 1) || !(sxx > 0)) return false;
  const b0 = sxy / sxx; // pooled within-group slope on the observed X
  const rss = syy - b0 * b0 * sxx;
  if (!(rss > 0)) return false;
  const r = reliabilityCorrection;
  const b = b0 / r;
  const dx = (m[1] as number) - (m[7] as number);
  const estimate = (m[2] as number) - (m[8] as number) - b * dx;
  const s2 = rss / df;
  const se = Math.sqrt(s2 * (1 / nP + 1 / nC + (dx * dx) / (r * r * sxx)));
  if (!Number.isFinite(estimate) || !(se > 0) || !Number.isFinite(se)) return false;
  out[0] = estimate;
  out[1] = se;
  out[2] = df;
  return true;
}
