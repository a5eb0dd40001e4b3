/**
 * The matched difference and its matching-weights standard error (Abadie &
 * Imbens 2006, Econometrica 74, 235–267, the variance of the matching
 * estimator with replacement). With D_i = Y_i − mean of its partners' Y over
 * the m matched programme members, K_j and K'_j the comparison members'
 * matching weights (MatchingWeights) and σ²_C the comparison group's
 * conditional variance of Y given the matching variables:
 *
 *   V = Σ (D_i − D̄)² / (m (m − 1)) + σ²_C Σ_j (K_j² − K'_j) / m²,   df m − 1.
 *
 * The first term is the matched-sets variance, which counts each partner's
 * residual in each set it serves (Σ K'_j) but not the covariance between
 * sets sharing a partner; the second adds exactly that covariance
 * (conditional on the covariates, Var(Σ_j K_j Y_j) = σ²_C Σ K_j²). Without
 * replacement K_j² = K'_j, the second term is 0 and V is the first term
 * exactly, bit for bit. Shared by both engines.
 *
 * @param m matched programme members (≥ 2).
 * @param sumD Σ D_i, points. @param sumD2 Σ D_i², points².
 * @param sigma2C σ²_C, points² (≥ 0; only used when reuseExcess > 0).
 * @param reuseExcess Σ_j (K_j² − K'_j) (≥ 0; MatchingWeights.reuseExcess).
 * @param out Float64Array(≥ 3) receiving [estimate, SE, df].
 * @returns false (out untouched) when m < 2 or the SE is not positive and finite.
 * @throws never.
 * @example
 *   // D = 1, 3 (m 2), one comparison member shared by both 1:1 sets (K 2, K' 2, excess 2), σ²_C 4:
 *   // V = 2/(2·1) + 4·2/4 = 3 → [2, 1.732, 1] (hand-worked).
 */
export function matchedDifferenceEstimate(
  m: number,
  sumD: number,
  sumD2: number,
  sigma2C: number,
  reuseExcess: number,
  out: Float64Array,
): boolean {
  if (!(m >= 2)) return false;
  const mean = sumD / m;
  const v = (sumD2 - sumD * mean) / (m - 1);
  let v2 = v / m;
  if (reuseExcess > 0 && sigma2C > 0) v2 += (sigma2C * reuseExcess) / (m * m);
  const s = Math.sqrt(v2);
  if (!(s > 0) || !Number.isFinite(s) || !Number.isFinite(mean)) return false;
  out[0] = mean;
  out[1] = s;
  out[2] = m - 1;
  return true;
}
