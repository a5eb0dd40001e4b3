import { requireFinite, requirePositive } from '../core/inputChecks';

/**
 * Cronbach's coefficient alpha from item variances and the variance of their
 * sum: α = k / (k − 1) · (1 − Σ σ²_j / σ²_X).
 *
 * Reference: Cronbach, L. J. (1951). Coefficient alpha and the internal
 * structure of tests. Psychometrika, 16, 297–334 (equation 2). Equal to
 * Hoyt's (1941) ANOVA estimate 1 − MS_residual / MS_persons. Alpha equals the
 * reliability of the sum only when the items are essentially tau-equivalent;
 * otherwise it is a lower bound (Lord & Novick 1968, theorem 4.4.3, from memory).
 *
 * Variances may be given as sums of squares over the same rows (the common
 * divisor cancels), which is how the pilot estimates call it.
 *
 * @param k number of items (≥ 2).
 * @param sumItemVariances Σ of the k item variances (≥ 0).
 * @param totalVariance variance of the item sum (> 0), same divisor as the item variances.
 * @returns alpha, at most 1; may be negative when items correlate negatively.
 * @throws Error when k < 2, totalVariance ≤ 0 or an input is not finite.
 * @example cronbachAlpha(10, 10, 46) // 0.8696: 10 items, variance 1, all correlations .4 (Spearman–Brown of .4)
 */
export function cronbachAlpha(k: number, sumItemVariances: number, totalVariance: number): number {
  requireFinite(k, 'The number of items');
  if (!(Number.isInteger(k) && k >= 2)) throw new Error(`Cronbach's alpha needs at least 2 items; got ${k}.`);
  requireFinite(sumItemVariances, 'The sum of the item variances');
  requirePositive(totalVariance, 'The variance of the item sum');
  return (k / (k - 1)) * (1 - sumItemVariances / totalVariance);
}
