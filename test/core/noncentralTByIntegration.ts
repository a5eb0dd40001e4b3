import stdNormalCdf from '@stdlib/stats-base-dists-normal-cdf';
import chisquarePdf from '@stdlib/stats-base-dists-chisquare-pdf';

/**
 * Test helper, independent of jStat: the noncentral t cdf from its definition
 * T = (Z + δ)/sqrt(V/ν), P(T ≤ t) = ∫₀^∞ Φ(t·sqrt(v/ν) − δ) f_χ²ν(v) dv
 * (common practice; Johnson, Kotz & Balakrishnan 1995, ch. 31, from memory),
 * with @stdlib's normal cdf and chi-square pdf, Simpson's rule after v = u²
 * (removes the sqrt(v) kink at 0). Accurate to well under 1e-6 for ν ≥ 2.
 */
export function noncentralTByIntegration(t: number, nu: number, delta: number, steps = 6000): number {
  const sd = Math.sqrt(2 * nu);
  const lo = Math.sqrt(Math.max(0, nu - 14 * sd));
  const hi = Math.sqrt(nu + 14 * sd + 40);
  const h = (hi - lo) / steps;
  const f = (u: number): number => stdNormalCdf((t * u) / Math.sqrt(nu) - delta, 0, 1) * chisquarePdf(u * u, nu) * 2 * u;
  let s = f(lo) + f(hi);
  for (let i = 1; i < steps; i++) s += (i % 2 ? 4 : 2) * f(lo + i * h);
  return (s * h) / 3;
}
