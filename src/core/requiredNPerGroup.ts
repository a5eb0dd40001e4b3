import { normalQuantile } from './distributions';
import { twoSidedPower } from './power';
import { formatNumber, requireFinite, requireOpenInterval } from './inputChecks';

/** The SE and df of an analysis when it has n people per group. */
export type DesignAtN = (n: number) => { se: number; df: number };

/**
 * Smallest whole n per group at which a two-sided t test reaches `targetPower`
 * for an expected estimate `mean` (the hoped-for effect plus the analysis'
 * bias), searched over n with the design's SE and df at each n. null when
 * unreachable: no hoped-for effect (tau = 0), an expected estimate of 0 or of
 * the wrong sign (the power would be for a misleading result), or more than
 * 10 million per group needed.
 * Reference: Cohen (1988), ch. 2, Table 2.4.1 (n per group for the t test).
 * @param mean expected estimate (tau + bias), points. @param tau hoped-for effect, points.
 * @param design SE and df at n per group. @param alpha two-sided level in (0, 1).
 * @param targetPower in (0, 1).
 * @returns n per group (integer ≥ 2) or null.
 * @throws Error on out-of-range input.
 * @example requiredNPerGroup(0.5, 0.5, n => ({ se: Math.sqrt(2 / n), df: 2 * n - 2 }), 0.05, 0.8) // 64
 */
export function requiredNPerGroup(
  mean: number,
  tau: number,
  design: DesignAtN,
  alpha: number,
  targetPower: number,
): number | null {
  requireFinite(mean, 'The expected estimate');
  requireFinite(tau, 'The hoped-for effect');
  requireOpenInterval(alpha, 0, 1, 'The significance level');
  requireOpenInterval(targetPower, 0, 1, 'The target power');
  if (targetPower <= alpha) {
    throw new Error(
      `The target power (${formatNumber(targetPower)}) must exceed the significance level (${formatNumber(alpha)}).`,
    );
  }
  if (tau === 0 || mean === 0 || Math.sign(mean) !== Math.sign(tau)) return null;
  const powerAt = (n: number): number => {
    const { se, df } = design(n);
    return twoSidedPower(mean, se, df, alpha);
  };
  const limit = 1e7;
  // Start from the normal-approximation n (Cohen 1988, eq. 2.4.1 form): with SE ∝ 1/sqrt(n),
  // n ≈ 100·((z_{1−α/2} + z_power)·SE(100)/|mean|)². Then bracket and bisect on the exact power.
  const z = normalQuantile(1 - alpha / 2) + normalQuantile(targetPower);
  const guess = 100 * ((z * design(100).se) / Math.abs(mean)) ** 2;
  if (!(guess < limit * 4)) return null;
  let lo = Math.max(2, Math.floor(guess * 0.8));
  let hi = Math.max(lo + 1, Math.ceil(guess * 1.25) + 2);
  if (powerAt(lo) >= targetPower) {
    // Move down until power falls below the target (or n = 2 suffices).
    hi = lo;
    while (hi > 2) {
      lo = Math.max(2, Math.floor(hi / 2));
      if (powerAt(lo) < targetPower) break;
      hi = lo;
    }
    if (hi === 2 && powerAt(2) >= targetPower) return 2;
  }
  while (powerAt(hi) < targetPower) {
    lo = hi;
    hi *= 2;
    if (hi > limit) return null;
  }
  // Invariant: power(lo) < target ≤ power(hi).
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (powerAt(mid) >= targetPower) hi = mid;
    else lo = mid;
  }
  return hi;
}
