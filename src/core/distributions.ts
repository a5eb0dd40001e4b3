import jStat from 'jstat';
import { formatNumber, requireFinite, requireOpenInterval, requirePositive } from './inputChecks';

/*
 * The probability distributions the core uses, in one place, so each is
 * cross-checked once against an independent library (test/core/distributions.test.ts).
 * All wrap jStat 1.9.6 and clamp probabilities to [0, 1].
 */

const clamp01 = (p: number): number => (p < 0 ? 0 : p > 1 ? 1 : p);

/**
 * Standard normal cumulative distribution function Φ(z).
 * Reference: common practice (Abramowitz & Stegun 1964, 26.2, from memory).
 * @param z standard normal deviate (finite).
 * @returns P(Z ≤ z) in [0, 1].
 * @throws Error when z is not finite.
 * @example normalCdf(1.959964) // 0.975
 */
export function normalCdf(z: number): number {
  requireFinite(z, 'The normal deviate');
  return clamp01(jStat.normal.cdf(z, 0, 1));
}

/**
 * Standard normal density φ(z).
 * Reference: common practice.
 * @param z standard normal deviate (finite).
 * @returns density at z (≥ 0).
 * @throws Error when z is not finite.
 * @example normalPdf(0) // 0.3989423
 */
export function normalPdf(z: number): number {
  requireFinite(z, 'The normal deviate');
  return Math.exp(-0.5 * z * z) / Math.sqrt(2 * Math.PI);
}

/**
 * Standard normal quantile Φ⁻¹(p).
 * Reference: common practice.
 * @param p probability in (0, 1).
 * @returns z with Φ(z) = p.
 * @throws Error when p is outside (0, 1).
 * @example normalQuantile(0.975) // 1.959964
 */
export function normalQuantile(p: number): number {
  requireOpenInterval(p, 0, 1, 'The probability');
  return jStat.normal.inv(p, 0, 1) as number;
}

/**
 * Student t cumulative distribution function.
 * Reference: common practice (Student 1908).
 * @param t value (finite). @param df degrees of freedom (> 0).
 * @returns P(T ≤ t) in [0, 1].
 * @throws Error when t is not finite or df ≤ 0.
 * @example studentTCdf(2.228139, 10) // 0.975
 */
export function studentTCdf(t: number, df: number): number {
  requireFinite(t, 'The t value');
  requirePositive(df, 'The degrees of freedom');
  return clamp01(jStat.studentt.cdf(t, df));
}

/**
 * Student t quantile.
 * Reference: common practice (Student 1908).
 * @param p probability in (0, 1). @param df degrees of freedom (> 0).
 * @returns t with P(T ≤ t) = p.
 * @throws Error when p is outside (0, 1) or df ≤ 0.
 * @example studentTQuantile(0.975, 10) // 2.228139
 */
export function studentTQuantile(p: number, df: number): number {
  requireOpenInterval(p, 0, 1, 'The probability');
  requirePositive(df, 'The degrees of freedom');
  const q = jStat.studentt.inv(p, df) as number;
  if (!Number.isFinite(q)) {
    throw new Error(`The t quantile for p = ${formatNumber(p)} and df = ${formatNumber(df)} could not be computed.`);
  }
  return q;
}

/**
 * Noncentral t cumulative distribution function: the distribution of
 * (Z + ncp) / sqrt(V/df), Z standard normal, V chi-square on df.
 * Reference: Cohen, J. (1988), Statistical Power Analysis, ch. 2 (power of the t test);
 * series as in Lenth (1989), Applied Statistics AS 243, from memory.
 * @param t value (finite). @param df degrees of freedom (> 0). @param ncp noncentrality (finite).
 * @returns P(T ≤ t) in [0, 1].
 * @throws Error when an argument is out of range.
 * @example noncentralTCdf(1.9840, 98, 2.5) // ≈ 0.3 (power of d = 0.5 with 50 per group is ≈ 0.70)
 */
export function noncentralTCdf(t: number, df: number, ncp: number): number {
  requireFinite(t, 'The t value');
  requirePositive(df, 'The degrees of freedom');
  requireFinite(ncp, 'The noncentrality parameter');
  const p = jStat.noncentralt.cdf(t, df, ncp) as number;
  if (!Number.isFinite(p)) {
    throw new Error(
      `The noncentral t probability for t = ${formatNumber(t)}, df = ${formatNumber(df)}, ` +
        `noncentrality ${formatNumber(ncp)} could not be computed.`,
    );
  }
  return clamp01(p);
}
