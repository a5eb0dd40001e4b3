import { normalCdf } from '../core/distributions';

/**
 * Compare two correlations from independent samples (here: the two groups'
 * pre–post correlations) by Fisher's z: z = (atanh r₁ − atanh r₂) /
 * √(1/(n₁ − 3) + 1/(n₂ − 3)), referred to the standard normal.
 *
 * Reference: Fisher (1921), Metron 1, 3–32; the test for two independent
 * correlations as in Cohen, Cohen, West & Aiken (2003), Applied Multiple
 * Regression/Correlation Analysis, 3rd ed., section 2.8 (from memory).
 *
 * @param r1 first correlation, in (−1, 1); @param n1 its pairs (≥ 4).
 * @param r2 second correlation, in (−1, 1); @param n2 its pairs (≥ 4).
 * @returns { difference: r₁ − r₂, z, p } with p two-sided.
 * @example correlationDifference(0.78, 104, 0.64, 136) // { difference: 0.14, z ≈ 2.18, p ≈ .030 }
 */
export function correlationDifference(r1: number, n1: number, r2: number, n2: number): { difference: number; z: number; p: number } {
  if (!(n1 >= 4 && n2 >= 4)) throw new Error(`Comparing two correlations needs at least 4 pairs in each group; got ${n1} and ${n2}.`);
  const clip = (r: number) => Math.max(-0.999999, Math.min(0.999999, r));
  const z = (Math.atanh(clip(r1)) - Math.atanh(clip(r2))) / Math.sqrt(1 / (n1 - 3) + 1 / (n2 - 3));
  return { difference: r1 - r2, z, p: 2 * (1 - normalCdf(Math.abs(z))) };
}
