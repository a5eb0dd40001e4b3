import { normalQuantile } from '../core/distributions';
import { requireFinite, requireOpenInterval } from '../core/inputChecks';

/**
 * Confidence interval for a Pearson correlation by Fisher's z
 * transformation: z = atanh(r) is close to normal with SE 1 / √(n − 3 − q),
 * where q is the number of variables partialled out (q = 1 for a pooled
 * within-group correlation of two groups: the group means are removed).
 * The interval is tanh(z ± Φ⁻¹(1 − γ/2) · SE).
 *
 * Reference: Fisher, R. A. (1921). On the "probable error" of a coefficient of
 * correlation deduced from a small sample. Metron, 1, 3–32; for partial
 * correlations Fisher (1924), Metron, 3, 329–332 (n − 3 − q; from memory).
 *
 * @param r the correlation, in [−1, 1] (±1 gives the degenerate interval [r, r]).
 * @param n number of pairs (n − 3 − q ≥ 1).
 * @param partialled q, variables partialled out (integer ≥ 0), default 0.
 * @param level confidence level in (0, 1), default 0.95.
 * @returns { value: r, lower, upper, level, n }.
 * @throws Error when r is outside [−1, 1] or n is too small.
 * @example fisherZInterval(0.5, 103) // { lower: ≈ .339, upper: ≈ .632 } (z = .5493 ± 1.96/10)
 */
export function fisherZInterval(
  r: number,
  n: number,
  partialled = 0,
  level = 0.95,
): { value: number; lower: number; upper: number; level: number; n: number } {
  requireFinite(r, 'The correlation');
  if (!(r >= -1 && r <= 1)) throw new Error(`A correlation must be between -1 and 1; got ${r}.`);
  requireOpenInterval(level, 0, 1, 'The confidence level');
  const df = n - 3 - partialled;
  if (!(Number.isInteger(n) && df >= 1)) {
    throw new Error(`Fisher's z interval needs at least ${4 + partialled} pairs; got ${n}.`);
  }
  if (Math.abs(r) === 1) return { value: r, lower: r, upper: r, level, n };
  const z = Math.atanh(r);
  const half = normalQuantile(1 - (1 - level) / 2) / Math.sqrt(df);
  return { value: r, lower: Math.tanh(z - half), upper: Math.tanh(z + half), level, n };
}
