import { requirePositive, requireReliability } from './inputChecks';

/**
 * Spearman–Brown prophecy: reliability of a test lengthened k-fold (e.g. the
 * mean of k parallel forms): ρ_k = kρ / (1 + (k − 1)ρ).
 *
 * Reference: Spearman, C. (1910); Brown, W. (1910). British Journal of Psychology, 3.
 *
 * @param reliability reliability of one form, in (0, 1].
 * @param k lengthening factor (> 0; may be fractional, < 1 shortens).
 * @returns reliability of the lengthened test, in (0, 1].
 * @throws Error when reliability is outside (0, 1] or k ≤ 0.
 * @example spearmanBrown(0.6, 2) // 0.75
 */
export function spearmanBrown(reliability: number, k: number): number {
  requireReliability(reliability);
  requirePositive(k, 'The lengthening factor k');
  return (k * reliability) / (1 + (k - 1) * reliability);
}
