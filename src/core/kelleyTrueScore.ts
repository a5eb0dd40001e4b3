import { requireFinite, requireReliability } from './inputChecks';

/**
 * Kelley's estimated true score: the regression of true on observed score
 * within a group, T̂ = ρ·x + (1 − ρ)·groupMean. The estimate is pulled back
 * toward the group's own mean: the root of regression toward the mean in
 * matched groups.
 *
 * Reference: Kelley, T. L. (1947). Fundamentals of Statistics.
 *
 * @param x observed score, test points.
 * @param reliability within-group reliability, in (0, 1].
 * @param groupMean the group's mean, test points.
 * @returns estimated true score, test points.
 * @throws Error when reliability is outside (0, 1] or a value is not finite.
 * @example kelleyTrueScore(85, 0.48, 105) // 95.4
 */
export function kelleyTrueScore(x: number, reliability: number, groupMean: number): number {
  requireFinite(x, 'The observed score');
  requireReliability(reliability);
  requireFinite(groupMean, 'The group mean');
  return reliability * x + (1 - reliability) * groupMean;
}
