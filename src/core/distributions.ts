import * as jStat from './jstatSubset';
import { formatNumber, requireFinite, requireOpenInterval, requirePositive } from './inputChecks';

/*
 * The probability distributions the core uses, in one place, so each is
 * cross-checked once against an independent library (test/core/distributions.test.ts).
 * All wrap jStat 1.9.6 (the functions needed, copied verbatim into ./jstatSubset so the page's
 * first screen need not load the whole library) and clamp probabilities to [0, 1].
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
  return clamp01(jStat.normalCdf(z, 0, 1));
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
  return jStat.normalInv(p, 0, 1) as number;
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
  return clamp01(jStat.studenttCdf(t, df));
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
  const q = jStat.studenttInv(p, df) as number;
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
  // Lenth's AS 243 where its Poisson weights do not underflow (|ncp| <= 37.62,
  // Lenth 1989); jStat's series beyond (where the probability is 0 or 1 to
  // double precision for the t values the core uses), and if AS 243 fails.
  let p = Math.abs(ncp) <= AS243_MAX_NCP ? noncentralTCdfLenth(t, df, ncp) : Number.NaN;
  if (!Number.isFinite(p)) p = jStat.noncentraltCdf(t, df, ncp) as number;
  if (!Number.isFinite(p)) {
    throw new Error(
      `The noncentral t probability for t = ${formatNumber(t)}, df = ${formatNumber(df)}, ` +
        `noncentrality ${formatNumber(ncp)} could not be computed.`,
    );
  }
  return clamp01(p);
}

/** Largest |ncp| for which exp(-ncp²/2) stays a normal double (Lenth 1989 uses 37.62). */
const AS243_MAX_NCP = 37.62;
const LOG_SQRT_PI = 0.5 * Math.log(Math.PI);
const SQRT_2_OVER_PI = Math.sqrt(2 / Math.PI);

/**
 * Noncentral t CDF by algorithm AS 243 (Lenth 1989, "Cumulative distribution
 * function of the non-central t distribution", Applied Statistics 38, 185–189):
 * the Poisson-weighted series of incomplete beta functions, with the beta
 * terms updated by recurrence, so only one incomplete beta and two log-gamma
 * evaluations are needed. Stops when the error bound falls below 1e-12.
 * NaN when the series does not converge in 1,000 terms.
 */
function noncentralTCdfLenth(t: number, df: number, ncp: number): number {
  const negative = t < 0;
  const tt = negative ? -t : t;
  const del = negative ? -ncp : ncp;
  let tnc = 0;
  if (tt > 0) {
    const x = (tt * tt) / (tt * tt + df);
    const lambda = del * del;
    let p = 0.5 * Math.exp(-0.5 * lambda);
    let q = SQRT_2_OVER_PI * p * del;
    // s = 0.5 - p, the Poisson mass not yet summed (expm1 keeps it accurate for small ncp).
    let s = -0.5 * Math.expm1(-0.5 * lambda);
    let a = 0.5;
    const b = 0.5 * df;
    const rxb = Math.pow(1 - x, b);
    const albeta = LOG_SQRT_PI + (jStat.gammaln(b) as number) - (jStat.gammaln(0.5 + b) as number);
    let xodd = jStat.ibeta(x, a, b) as number;
    let godd = 2 * rxb * Math.exp(a * Math.log(x) - albeta);
    let xeven = 1 - rxb;
    let geven = b * x * rxb;
    tnc = p * xodd + q * xeven;
    let converged = false;
    for (let en = 1; en <= 1000; en++) {
      a += 1;
      xodd -= godd;
      xeven -= geven;
      godd *= (x * (a + b - 1)) / a;
      geven *= (x * (a + b - 0.5)) / (a + 0.5);
      p *= lambda / (2 * en);
      q *= lambda / (2 * en + 1);
      s -= p;
      tnc += p * xodd + q * xeven;
      if (Math.abs(2 * s * (xodd - godd)) <= 1e-12) {
        converged = true;
        break;
      }
    }
    if (!converged) return Number.NaN;
  }
  tnc += jStat.normalCdf(-del, 0, 1) as number;
  return negative ? 1 - tnc : tnc;
}
