import type { ModelParameters } from './modelParameters';
import { requirePositive } from './inputChecks';

/**
 * Caliper half-width in pretest points: caliper × sqrt((s_P² + s_C²)/2), the
 * caliper being given in SDs of the pooled observed pretest.
 *
 * Reference: Cochran, W. G., & Rubin, D. B. (1973). Controlling bias in
 * observational studies: a review. Sankhyā A, 35 (caliper in units of
 * sqrt((s1² + s2²)/2)).
 *
 * @param model model parameters (observed within-group SDs, points).
 * @param caliper caliper in pooled-SD units (> 0).
 * @returns half-width in test points (> 0).
 * @throws Error when caliper ≤ 0.
 * @example SDs 10 and 10, caliper 0.2 → 2 points
 */
export function caliperWidth(model: ModelParameters, caliper: number): number {
  requirePositive(caliper, 'The caliper');
  return caliper * Math.sqrt((model.observedSD.programme ** 2 + model.observedSD.comparison ** 2) / 2);
}
