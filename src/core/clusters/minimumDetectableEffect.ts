import { studentTQuantile } from '../distributions';
import { requireFinite, requireOpenInterval, requirePositive } from '../inputChecks';

/**
 * The minimum detectable effect of a two-sided t test with the analysis'
 * artefact included: the smallest true effect (in the hoped-for direction)
 * for which the expected estimate, effect plus bias, reaches the multiplier
 * M = t_{1−α/2, df} + t_{power, df} times the SE (Bloom 1995, Evaluation
 * Review 19, 547–556; Raudenbush 1997 for clustered designs):
 *   MDE = M·SE − bias (direction +), or −M·SE − bias (direction −).
 * A bias in the hoped-for direction lowers it (the artefact does part of the
 * "detecting"), a bias against it raises it; an MDE of 0 or beyond it in the
 * wrong direction means the artefact alone would be declared an effect.
 * @param se standard error, points (> 0). @param df degrees of freedom (> 0).
 * @param bias the analysis' expected artefact, points. @param alpha two-sided level in (0, 1).
 * @param power target power in (0, 1). @param direction +1 or −1 (the hoped-for effect's sign; +1 when it is 0).
 * @returns the MDE, posttest points (signed).
 * @throws Error on out-of-range input.
 * @example se 1, df 1e6, bias 0, alpha .05, power .8 → 2.80 (Bloom 1995: 1.96 + 0.84)
 */
export function minimumDetectableEffect(se: number, df: number, bias: number, alpha: number, power: number, direction: 1 | -1): number {
  requirePositive(se, 'The standard error');
  requirePositive(df, 'The degrees of freedom');
  requireFinite(bias, 'The bias');
  requireOpenInterval(alpha, 0, 1, 'The significance level');
  requireOpenInterval(power, 0, 1, 'The target power');
  const multiplier = studentTQuantile(1 - alpha / 2, df) + studentTQuantile(power, df);
  return direction * multiplier * se - bias;
}
