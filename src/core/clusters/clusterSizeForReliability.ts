import type { ClusterGroup } from './clusterModel';

/**
 * People per cluster whose observed mean reaches a target cluster-mean
 * reliability λ*, rounded up (Spearman–Brown for cluster means; Spearman 1910, Brown 1910):
 *   new cohort:  n = λ*(σ²_wT + SEM²) / (τ²(1 − λ*))            (ICC(2) = λ* solved for n; Bliese 2000)
 *   same people: n = (λ*(σ²_wT + SEM²) − σ²_wT) / (τ²(1 − λ*)).
 * @param g the group whose clusters are matched against (the comparison group).
 * @param target λ* in (0, 1). @param same whether the pretested people sit the posttest.
 * @returns whole people per cluster (≥ 1), or null when λ* is not below 1.
 * @throws never.
 * @example τ² 45, σ²_wT 135, SEM² 45, new cohort, λ* .9 → n = .9·180/(45·.1) = 36
 */
export function clusterSizeForReliability(g: ClusterGroup, target: number, same: boolean): number | null {
  if (!(target < 1)) return null;
  if (!(target > 0)) return 1;
  const { betweenTrue: t2, withinTrue: w2, error: e2 } = g.components;
  const n = (target * (w2 + e2) - (same ? w2 : 0)) / (t2 * (1 - target));
  // Guard the ceiling against rounding just above a whole number (36.000000001 → 36).
  return Math.max(1, Math.ceil(n - 1e-9));
}
