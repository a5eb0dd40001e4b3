/**
 * Combine two independent groups' variance contributions into one standard
 * error and its Welch–Satterthwaite degrees of freedom (Welch 1947,
 * Biometrika 34, 28–35; Satterthwaite 1946): each contribution u_g is
 * treated as a scaled chi-square with df_g degrees of freedom, so
 *
 *   SE = sqrt(u_P + u_C),   df = (u_P + u_C)² / (u_P² / df_P + u_C² / df_C).
 *
 * With u_g = s_g² / n_g and df_g = n_g − 1 this is Welch's unequal-variance
 * t test. The engines use it for the gain score and, with each group's share
 * of the delta-method variance, for ANCOVA (ancovaEstimate, ancovaOnCovariates).
 *
 * @param uP programme contribution to the variance of the estimate, points² (≥ 0, finite).
 * @param dfP its degrees of freedom (> 0).
 * @param uC comparison contribution, points² (≥ 0, finite).
 * @param dfC its degrees of freedom (> 0).
 * @param out receives out[1] = SE (points) and out[2] = df; out[0] is left alone.
 * @returns false (out untouched) when the total is not positive and finite or a df is not positive.
 * @throws never.
 * @example
 *   // s 20 and 10, n 20 and 400: u = 400/20 = 20 and 100/400 = 0.25 → SE = sqrt(20.25) = 4.5,
 *   // df = 20.25² / (20²/19 + 0.25²/399) = 19.47 (Welch 1947, hand-worked).
 */
export function welchSatterthwaite(uP: number, dfP: number, uC: number, dfC: number, out: Float64Array): boolean {
  const v = uP + uC;
  if (!(v > 0) || !Number.isFinite(v) || !(dfP > 0) || !(dfC > 0) || !(uP >= 0) || !(uC >= 0)) return false;
  const denom = (uP * uP) / dfP + (uC * uC) / dfC;
  const df = denom > 0 ? (v * v) / denom : dfP + dfC;
  if (!(df > 0) || !Number.isFinite(df)) return false;
  out[1] = Math.sqrt(v);
  out[2] = df;
  return true;
}
