import { noncentralTCdf, studentTQuantile } from './distributions';
import { formatNumber, requireFinite, requireOpenInterval, requirePositive } from './inputChecks';

/*
 * Power and error rates of a two-sided t test whose estimate has expected
 * value `mean` and standard error `se`: T = estimate/SE ~ noncentral t(df, mean/se).
 * Reference: Cohen, J. (1988). Statistical Power Analysis for the Behavioral
 * Sciences (2nd ed.), ch. 2.
 */

function check(mean: number, se: number, df: number, alpha: number): { tCrit: number; ncp: number } {
  requireFinite(mean, 'The expected estimate');
  requirePositive(se, 'The standard error');
  requirePositive(df, 'The degrees of freedom');
  requireOpenInterval(alpha, 0, 1, 'The significance level');
  return { tCrit: studentTQuantile(1 - alpha / 2, df), ncp: mean / se };
}

/**
 * Probability that a two-sided t test at level alpha rejects when the estimate
 * has expected value `mean`: P(T > t_crit) + P(T < −t_crit), T noncentral t with ncp = mean/se.
 * Reference: Cohen (1988), ch. 2.
 * @param mean expected estimate, points (finite). @param se standard error, points (> 0).
 * @param df degrees of freedom (> 0). @param alpha two-sided level in (0, 1).
 * @returns rejection probability in [0, 1] (alpha when mean = 0).
 * @throws Error on out-of-range input.
 * @example twoSidedPower(0.5, Math.sqrt(2 / 64), 126, 0.05) // ≈ 0.80 (Cohen 1988: d .5, n 64)
 */
export function twoSidedPower(mean: number, se: number, df: number, alpha: number): number {
  const { tCrit, ncp } = check(mean, se, df, alpha);
  const p = 1 - noncentralTCdf(tCrit, df, ncp) + noncentralTCdf(-tCrit, df, ncp);
  return Math.min(1, Math.max(0, p));
}

/**
 * Rate of significant results when the programme does nothing but the
 * analysis' bias remains: twoSidedPower(bias, se, df, alpha).
 * Reference: Cohen (1988), ch. 2 (power with the bias as the only effect).
 * @param bias expected artefact, points. Other parameters as twoSidedPower.
 * @returns probability in [0, 1]; alpha when bias = 0.
 * @throws Error on out-of-range input.
 * @example falsePositiveRate(0, 1, 100, 0.05) // 0.05
 */
export function falsePositiveRate(bias: number, se: number, df: number, alpha: number): number {
  return twoSidedPower(bias, se, df, alpha);
}

/**
 * Probability of a significant result whose sign is opposite to the hoped-for
 * effect tau, when the expected estimate is tau + bias. null when tau = 0 (no
 * hoped-for direction).
 * Reference: Cohen (1988), ch. 2; the "type S" error of Gelman & Carlin (2014), from memory.
 * @param tau hoped-for effect, points. @param bias artefact, points.
 * @param se, df, alpha as twoSidedPower.
 * @returns probability in [0, 1], or null when tau = 0.
 * @throws Error on out-of-range input.
 * @example wrongSignRate(1, -3, 1, 1000, 0.05) // ≈ 0.52 (expected estimate −2, one SE)
 */
export function wrongSignRate(tau: number, bias: number, se: number, df: number, alpha: number): number | null {
  requireFinite(tau, 'The hoped-for effect');
  requireFinite(bias, 'The bias');
  const { tCrit, ncp } = check(tau + bias, se, df, alpha);
  if (tau === 0) return null;
  return tau > 0 ? noncentralTCdf(-tCrit, df, ncp) : 1 - noncentralTCdf(tCrit, df, ncp);
}
