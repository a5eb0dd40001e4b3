import type { ModelParameters } from './modelParameters';
import { requireFinite, requirePositive } from './inputChecks';
import { normalCdf } from './distributions';
import { caliperWidth } from './caliperWidth';

/** An interval of observed pretest scores, test points. */
export interface PretestRange {
  lower: number;
  upper: number;
}

/**
 * The observed-pretest range where matching is expected to happen: scores x
 * at which the programme pool is expected to hold at least one member and the
 * comparison pool at least `ratio` members within ±caliper of x. The caliper
 * is in units of sqrt((s_P^2 + s_C^2) / 2) (Cochran & Rubin 1973). Expected
 * count within the window for group g: n_g [Phi((x + c - mu_g)/s_g) - Phi((x - c - mu_g)/s_g)]
 * (normal observed pretest; common practice). Each count falls off on either
 * side of its group's mean, so each condition holds on one interval, found by
 * bisection; the result is their intersection.
 *
 * An approximation for drawing where partners exist: it ignores competition
 * for partners when matching without replacement. The simulation's example
 * replication shows the planned procedure exactly.
 *
 * @param model model parameters (deriveModelParameters).
 * @param caliper caliper width in pooled observed-pretest SDs (> 0).
 * @param ratio comparison partners wanted per programme member (≥ 1).
 * @returns the range in test points, or null when no score meets both conditions.
 * @throws Error when caliper or ratio is not positive.
 * @example
 *   // means 44 vs 54, SDs 10, pools 180 and 1200, caliper 0.2, ratio 1:
 *   // about 21.4 to 70.1 points.
 */
export function expectedMatchedRegion(model: ModelParameters, caliper: number, ratio: number): PretestRange | null {
  requirePositive(ratio, 'The matching ratio');
  const c = caliperWidth(model, caliper);
  const count = (n: number, mu: number, sd: number) => (x: number) =>
    n * (normalCdf((x + c - mu) / sd) - normalCdf((x - c - mu) / sd));
  const p = interval(count(model.n.programme, model.mean.programme, model.observedSD.programme), 1, model.mean.programme, model.observedSD.programme);
  const q = interval(count(model.n.comparison, model.mean.comparison, model.observedSD.comparison), ratio, model.mean.comparison, model.observedSD.comparison);
  if (!p || !q) return null;
  const lower = Math.max(p.lower, q.lower);
  const upper = Math.min(p.upper, q.upper);
  if (!(lower < upper)) return null;
  requireFinite(lower, 'The lower end of the matched region');
  requireFinite(upper, 'The upper end of the matched region');
  return { lower, upper };
}

/** Interval where f(x) ≥ level for f peaked at mu (symmetric, decreasing away from mu); null if f(mu) < level. */
function interval(f: (x: number) => number, level: number, mu: number, sd: number): PretestRange | null {
  if (f(mu) < level) return null;
  const edge = (dir: 1 | -1): number => {
    let inside = mu;
    let outside = mu + dir * sd;
    // Expand until outside the region (the count vanishes far out, so this ends).
    for (let i = 0; i < 60 && f(outside) >= level; i++) outside = mu + dir * (outside - mu) * 2;
    for (let i = 0; i < 80; i++) {
      const mid = (inside + outside) / 2;
      if (f(mid) >= level) inside = mid;
      else outside = mid;
    }
    return inside;
  };
  return { lower: edge(-1), upper: edge(1) };
}
