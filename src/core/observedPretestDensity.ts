import { requireFinite, requirePositive } from './inputChecks';
import { normalPdf } from './distributions';

/**
 * Density of a group's observed pretest at x under the model's normal
 * distribution N(mean, sd^2) (common practice: the normal density
 * exp(-z^2/2) / (sd sqrt(2 pi)), z = (x - mean)/sd).
 *
 * @param x pretest score, test points.
 * @param mean group mean, test points.
 * @param sd group's observed pretest SD, test points (> 0).
 * @returns density per test point.
 * @throws Error when sd ≤ 0 or a value is not finite.
 * @example observedPretestDensity(44, 44, 10) // 0.03989
 */
export function observedPretestDensity(x: number, mean: number, sd: number): number {
  requireFinite(x, 'The pretest score');
  requireFinite(mean, 'The pretest mean');
  requirePositive(sd, 'The pretest SD');
  return normalPdf((x - mean) / sd) / sd;
}
