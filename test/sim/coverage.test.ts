import { describe, expect, it } from 'vitest';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { testPlan } from './planFixtures';
import { feasible } from './feasible';

/*
 * With a near-perfect pretest (reliability .999) and no pretest or growth gap
 * there is no artefact, so every analysis's 95% CI should cover the true
 * effect 95% of the time and its two-sided test should reject a true null
 * at rate alpha (Neyman-Pearson; common practice). Tolerance: 3 Monte Carlo
 * SEs of a proportion at the nominal value, sqrt(p (1 - p) / n)
 * (Morris, White & Crowther 2019, Table 6): with n = 1,000, ±2.07 points
 * for coverage and ±2.07 points for the 5% false-positive rate.
 */
describe('no artefact: nominal coverage and false-positive rate', () => {
  const n = 1000;
  const plan = testPlan({
    reliability: 0.999,
    meanP: 50,
    meanC: 50,
    growthGap: 0,
    effect: 0,
    nP: 60,
    nC: 300,
    matching: { caliper: 0.2 },
    replications: n,
    seed: 77,
  });
  const r = simulatePlan(plan);
  const tol = (p: number) => 3 * Math.sqrt((p * (1 - p)) / n);

  for (const id of ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const) {
    it(`${id}: coverage 95% ± 3 MCSE, false-positive rate 5% ± 3 MCSE`, () => {
      const s = feasible(r.analyses[id]!);
      expect(s.replications).toBe(n);
      expect(Math.abs(s.coverage - 0.95)).toBeLessThan(tol(0.95));
      expect(Math.abs(s.rejectionRate - 0.05)).toBeLessThan(tol(0.05));
      // Empirical SE and average model SE agree within 3 MCSE of their difference (Morris et al. 2019),
      // plus 2% of the SE for the finite-df gap between a t-based SE and the spread of estimates.
      const mc = Math.hypot(s.empiricalSEMCSE, s.meanModelSEMCSE);
      expect(Math.abs(s.empiricalSE - s.meanModelSE)).toBeLessThan(3 * mc + 0.02 * s.empiricalSE);
      // With tau = 0 the hoped-for direction is positive: wrong sign = significantly negative,
      // about half the false positives (symmetry; common practice).
      expect(Math.abs(s.wrongSignRate - 0.025)).toBeLessThan(tol(0.025));
    });
  }

  it('ANCOVA in the matched sample also has nominal coverage (± 3 MCSE)', () => {
    expect(Math.abs(feasible(r.ancovaMatchedSample).coverage - 0.95)).toBeLessThan(tol(0.95));
  });

  it('with a true effect, power rises and the wrong-sign rate falls (analytic power by noncentral t, within 3 MCSE)', () => {
    // A 4-point effect, ANCOVA with reliability .999 and r = .6: the ANCOVA SE is about
    // sigma_Y sqrt(1 - r^2) sqrt(1/60 + 1/300) = 10 · 0.8 · 0.1414 = 1.131, so power ≈
    // Φ(4 / 1.131 - 1.96) = Φ(1.576) ≈ 0.942 (normal approximation; Cohen 1988, ch. 2, common practice).
    // Tolerance: 3 binomial MCSE (n = 600) plus 0.01 for the normal approximation (df = 357, so t ≈ z).
    const withEffect = simulatePlan({ ...plan, outcome: { ...plan.outcome, hypothesisedEffect: 4 }, simulation: { replications: 600, seed: 78 } });
    const a = feasible(withEffect.analyses.ancova!);
    expect(Math.abs(a.rejectionRate - 0.942)).toBeLessThan(3 * Math.sqrt((0.942 * 0.058) / 600) + 0.01);
    expect(a.wrongSignRate).toBeLessThan(0.005);
  });
});
