/**
 * The CR2 cluster-robust variance of a difference of two weighted group means
 * (Bell & McCaffrey 2002) when every cluster lies in one group: regressing Y
 * on the group indicator with weights w, the cluster's block of the hat
 * matrix is rank one, and CR2 inflates the cluster's squared weighted
 * residual sum by 1/(1 − s_c), s_c = Σ_c w / W_g its share of its group's
 * weight:
 *   V = Σ_g Σ_{c in g} (Σ_c w (y − ȳ_g))² / (1 − s_c) / W_g².
 * With equal weights and equal cluster sizes this is the textbook variance of
 * the difference of the clusters' means, s²_P/J_P + s²_C/J_C (each s² with
 * divisor J − 1). df = clusters with weight − 2.
 * @param clusterGroup per cluster: 1 programme, 0 comparison. @param sumW per cluster Σw (≥ 0).
 * @param sumWY per cluster Σw·y. @param count clusters. @param out Float64Array(≥ 3) receiving [estimate, SE, df].
 * @returns false (out untouched) when a group has fewer than 2 clusters with weight, or the SE is not positive.
 * @throws never.
 * @example two clusters per group, unit weights, one person each: P 1, 3; C 0, 0 → [2, 1, 2]
 *   (s²_P/2 = 2/2 = 1, hand-worked).
 */
export function clusterRobustDifference(clusterGroup: Uint8Array, sumW: Float64Array, sumWY: Float64Array, count: number, out: Float64Array): boolean {
  let WP = 0, WC = 0, YP = 0, YC = 0, JP = 0, JC = 0;
  for (let c = 0; c < count; c++) {
    const w = sumW[c] as number;
    if (!(w > 0)) continue;
    if (clusterGroup[c] === 1) { WP += w; YP += sumWY[c] as number; JP++; }
    else { WC += w; YC += sumWY[c] as number; JC++; }
  }
  if (JP < 2 || JC < 2) return false;
  const mP = YP / WP, mC = YC / WC;
  let V = 0;
  for (let c = 0; c < count; c++) {
    const w = sumW[c] as number;
    if (!(w > 0)) continue;
    const p = clusterGroup[c] === 1;
    const W = p ? WP : WC;
    const r = (sumWY[c] as number) - (p ? mP : mC) * w;
    const share = w / W;
    if (!(share < 1)) return false;
    V += (r * r) / (1 - share) / (W * W);
  }
  const se = Math.sqrt(V);
  if (!(se > 0) || !Number.isFinite(se)) return false;
  out[0] = mP - mC;
  out[1] = se;
  out[2] = JP + JC - 2;
  return true;
}
