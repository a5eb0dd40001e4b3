import { describe, expect, it } from 'vitest';
import cdf from '@stdlib/stats-base-dists-normal-cdf';
import { expectedMatchedRegion } from '../../src/core/expectedMatchedRegion';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { demoPlan } from '../../src/io/demoPlan';

describe('expectedMatchedRegion', () => {
  it('ends of the region are where an expected count reaches its threshold (demo plan)', () => {
    // Expected count of group g within ±c of x: n_g [Phi((x+c-mu)/s) - Phi((x-c-mu)/s)] (common practice),
    // recomputed with the independent @stdlib normal CDF. c = 0.2 × sqrt((10^2 + 10^2)/2) = 2 points
    // (Cochran & Rubin 1973 caliper unit). Tolerance 1e-6 in the count: bisection runs to ~1e-14 points.
    const m = deriveModelParameters(demoPlan());
    const r = expectedMatchedRegion(m, 0.2, 1);
    expect(r).not.toBeNull();
    const c = 2;
    const count = (x: number, n: number, mu: number) => n * (cdf(x + c, mu, 10) - cdf(x - c, mu, 10));
    // Lower end: the comparison pool (mean 54) runs out of partners; upper end: the programme pool (mean 44) runs out.
    expect(count(r!.lower, 1200, 54)).toBeCloseTo(1, 6);
    expect(count(r!.upper, 180, 44)).toBeCloseTo(1, 6);
    expect(count(r!.lower, 180, 44)).toBeGreaterThan(1);
    expect(count(r!.upper, 1200, 54)).toBeGreaterThan(1);
  });

  it('returns null when a 1:5 ratio cannot be met anywhere', () => {
    // Tiny comparison pool (5 people) and a narrow caliper: the expected count of comparison
    // members within ±0.1 points is at most 5 × 0.008 = 0.04 < 5 (common practice arithmetic).
    const p = demoPlan();
    p.groups.comparison.poolSize = 5;
    expect(expectedMatchedRegion(deriveModelParameters(p), 0.01, 5)).toBeNull();
  });

  it('rejects a caliper of 0 with a readable message', () => {
    expect(() => expectedMatchedRegion(deriveModelParameters(demoPlan()), 0, 1)).toThrow(/caliper must be greater than 0; got 0/);
  });
});
