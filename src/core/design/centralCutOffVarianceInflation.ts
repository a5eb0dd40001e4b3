/**
 * The variance of a regression-discontinuity estimate relative to a
 * randomised design of the same size, when the cut-off sits at the mean of a
 * normally distributed selection score (half the people on each side):
 * 1 / (1 − 2/π) ≈ 2.75 (Goldberger 1972, from memory; also in Cappelleri,
 * Darlington & Trochim 1994). The group indicator then correlates with the
 * score by sqrt(2/π), the share of its variance the score explains.
 * Used beside a plan's own inflation as the usual reference point.
 * @returns 2.7519… (dimensionless, > 1).
 * @throws never.
 * @example centralCutOffVarianceInflation() // 2.7519
 */
export function centralCutOffVarianceInflation(): number {
  return 1 / (1 - 2 / Math.PI);
}
