import jStat from 'jstat';
import { formatNumber, requireOpenInterval, requirePositive } from '../core/inputChecks';

/**
 * Quantile of the (central) F distribution with df1 and df2 degrees of freedom.
 *
 * Reference: common practice (Snedecor's F; e.g. Abramowitz & Stegun 1964,
 * 26.6, from memory). Wraps jStat 1.9.6 (`centralF.inv`, an inverse of the
 * regularised incomplete beta function); cross-checked against @stdlib in
 * test/pilot/fQuantile.test.ts (agreement within 1e-6 relative).
 *
 * @param p probability in (0, 1).
 * @param df1 numerator degrees of freedom (> 0).
 * @param df2 denominator degrees of freedom (> 0).
 * @returns f with P(F ≤ f) = p (> 0).
 * @throws Error when p is outside (0, 1), a df is not positive, or the
 *   quantile cannot be computed.
 * @example fQuantile(0.95, 4, 30) // 2.690 (F tables: 2.69, from memory); fQuantile(0.95, 1, 10) = t(.975, 10)² = 4.965
 */
export function fQuantile(p: number, df1: number, df2: number): number {
  requireOpenInterval(p, 0, 1, 'The probability');
  requirePositive(df1, 'The numerator degrees of freedom');
  requirePositive(df2, 'The denominator degrees of freedom');
  const q = jStat.centralF.inv(p, df1, df2) as number;
  if (!Number.isFinite(q) || q <= 0) {
    throw new Error(
      `The F quantile for p = ${formatNumber(p)}, df = ${formatNumber(df1)} and ${formatNumber(df2)} could not be computed.`,
    );
  }
  return q;
}
