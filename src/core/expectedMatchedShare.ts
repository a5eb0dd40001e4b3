import type { ModelParameters } from './modelParameters';
import { caliperWidth } from './caliperWidth';
import { normalCdf, normalPdf } from './distributions';
import { formatNumber, requirePositive } from './inputChecks';

/** The matching settings the matched share depends on. */
export interface MatchingDemand {
  /** Caliper in pooled observed-pretest SDs (> 0). */
  caliper: number;
  /** Comparison partners wanted per programme member (≥ 1). */
  ratio: number;
  /** Whether a comparison member may serve several programme members. */
  replacement: boolean;
}

/**
 * Approximate share of the programme pool expected to find at least one
 * comparison partner within the caliper. An APPROXIMATION for planning at a
 * glance: the Monte Carlo simulation gives the exact figure for the planned
 * procedure (order, method, finite pools).
 *
 * With observed pretests normal in each group (densities f_P, f_C; pool sizes
 * n_P, n_C; caliper half-width c points; ratio k):
 * - the expected number of comparison members within ±c of x is
 *   λ(x) = n_C·[F_C(x + c) − F_C(x − c)], so the chance of none is e^{−λ(x)}
 *   (Poisson approximation; common practice);
 * - with replacement: share = ∫ f_P(x)·(1 − e^{−λ(x)}) dx;
 * - without replacement, partners are also rationed where demand exceeds
 *   supply: share = ∫ f_P(x)·min(1, λ(x) / (k·n_P·[F_P(x + c) − F_P(x − c)]))·(1 − e^{−λ(x)}) dx,
 *   the supply-versus-demand ratio over the pretest scale (as c → 0 it
 *   becomes n_C f_C(x) / (k n_P f_P(x))).
 * Integrated by Simpson's rule over the programme mean ± 8 SD (400 intervals; the integrand is smooth on the scale of an SD).
 *
 * Reference: caliper units as in Cochran & Rubin (1973); the supply–demand
 * integral and Poisson term are our own approximation (computed).
 *
 * @param m model parameters (observed means and SDs, pool sizes).
 * @param matching caliper (> 0), ratio (≥ 1), replacement.
 * @returns share in [0, 1].
 * @throws Error when caliper ≤ 0 or ratio < 1.
 * @example demo plan (means 44 vs 54, SDs 10, pools 180 and 1200, caliper 0.2, 1:1,
 *   without replacement) → about 0.97
 */
export function expectedMatchedShare(m: ModelParameters, matching: MatchingDemand): number {
  const c = caliperWidth(m, matching.caliper);
  const k = requirePositive(matching.ratio, 'The matching ratio');
  if (k < 1) throw new Error(`The matching ratio must be at least 1; got ${formatNumber(k)}.`);
  const muP = m.mean.programme;
  const sP = m.observedSD.programme;
  const muC = m.mean.comparison;
  const sC = m.observedSD.comparison;
  const nP = m.n.programme;
  const nC = m.n.comparison;
  const windowMass = (x: number, mu: number, s: number): number =>
    normalCdf((x + c - mu) / s) - normalCdf((x - c - mu) / s);
  const integrand = (x: number): number => {
    const fP = normalPdf((x - muP) / sP) / sP;
    if (fP === 0) return 0;
    const lambda = nC * windowMass(x, muC, sC);
    let share = 1 - Math.exp(-lambda);
    if (!matching.replacement) {
      const demand = k * nP * windowMass(x, muP, sP);
      if (demand > 0) share *= Math.min(1, lambda / demand);
    }
    return fP * share;
  };
  const lo = muP - 8 * sP;
  const hi = muP + 8 * sP;
  const steps = 400;
  const h = (hi - lo) / steps;
  let sum = integrand(lo) + integrand(hi);
  for (let i = 1; i < steps; i++) sum += (i % 2 === 1 ? 4 : 2) * integrand(lo + i * h);
  const share = (sum * h) / 3;
  return Math.min(1, Math.max(0, share));
}
