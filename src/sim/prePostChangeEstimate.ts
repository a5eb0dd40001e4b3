/**
 * The one-group pre–post change: the mean of Y − X over the n people
 * re-measured, with the one-sample SE sd(Y − X)/sqrt(n) and df n − 1 (the
 * paired t; any statistics text, e.g. Snedecor & Cochran 1989, ch. 6; common
 * practice). The estimate includes everything that moves the group between
 * the two measurements: the programme effect, growth without it, and the
 * regression toward the mean of people selected for extreme scores (Barnett,
 * van der Pols & Dobson 2005, eq. 1).
 *
 * @param n people re-measured (≥ 2).
 * @param meanChange mean of Y − X, points.
 * @param ssChange sum of squared deviations of Y − X about its mean, points² (≥ 0).
 * @param out Float64Array(≥ 3) receiving [estimate, SE, df].
 * @returns false (out untouched) when n < 2 or the SE is not positive and finite.
 * @throws never.
 * @example
 *   // changes 1, 3, 5: mean 3, sd 2 → [3, 2 / sqrt(3) = 1.1547, 2] (hand-worked).
 */
export function prePostChangeEstimate(n: number, meanChange: number, ssChange: number, out: Float64Array): boolean {
  if (!(n >= 2) || !Number.isFinite(meanChange)) return false;
  const se = Math.sqrt(Math.max(0, ssChange) / (n - 1) / n);
  if (!(se > 0) || !Number.isFinite(se)) return false;
  out[0] = meanChange;
  out[1] = se;
  out[2] = n - 1;
  return true;
}
