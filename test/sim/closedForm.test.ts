import { describe, expect, it } from 'vitest';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { testPlan } from './planFixtures';
import { feasible } from './feasible';

/*
 * Simulated mean estimates against the closed forms of DESIGN.md / REFERENCES.md,
 * computed here directly from the model parameters (equal within-group SDs, so
 * one within-group reliability rho; Delta = true pretest gap):
 *   matched difference:   tau + delta + beta (1 - rho) Delta      (Thorndike 1942; Campbell & Erlebacher 1970)
 *   ANCOVA, full sample:  tau + delta + beta (1 - rho) Delta      (Lord 1960)
 *   gain score:           tau + delta + (beta - 1) Delta          (computed from the model; Lord 1967)
 *   Porter's corrected ANCOVA with assumed rho':
 *                         tau + delta + beta (1 - rho / rho') Delta (Porter 1967, from memory)
 *   ANCOVA in the matched sample: as the matched difference (the within-group
 *   regression of T on X is Kelley's, so the gap at equal X is (1 - rho) Delta).
 * The closed forms assume exact matching. With a caliper of 0.05 SD a tiny
 * residual observed gap g_obs remains in the matched sets; by the same Kelley
 * regression it adds beta · rho · g_obs, so the matched difference is compared
 * with closed form + beta · rho · g_obs (g_obs is also checked to be tiny).
 * Tolerance: 3 Monte Carlo SEs of the mean estimate (Morris et al. 2019,
 * Table 6); each check alone fails with probability 0.27% if the engine is right.
 */

interface Case {
  name: string;
  plan: ReturnType<typeof testPlan>;
}

const cases: Case[] = [
  {
    name: 'rho .6, programme 1 SD lower, effect 2',
    plan: testPlan({ reliability: 0.6, r: 0.5, meanP: 40, meanC: 50, effect: 2, nP: 150, nC: 3000, replications: 300, seed: 11 }),
  },
  {
    name: 'rho .8, programme 0.8 SD higher, growth gap 1.5, no effect',
    plan: testPlan({ reliability: 0.8, r: 0.7, meanP: 58, meanC: 50, growthGap: 1.5, effect: 0, nP: 150, nC: 3000, replications: 300, seed: 12 }),
  },
  {
    name: 'reliability ≈ 1 (.999): no artefact for matching or ANCOVA',
    plan: testPlan({ reliability: 0.999, r: 0.6, meanP: 40, meanC: 50, effect: 3, nP: 150, nC: 3000, replications: 300, seed: 13 }),
  },
  {
    name: 'rho .7, 1:2 random-within-caliper with replacement, Porter with rho\' = .8',
    plan: testPlan({
      reliability: 0.7,
      r: 0.55,
      meanP: 44,
      meanC: 50,
      effect: 1,
      nP: 150,
      nC: 3000,
      assumedReliability: 0.8,
      matching: { method: 'random-within-caliper', ratio: 2, replacement: true },
      replications: 300,
      seed: 14,
    }),
  },
  {
    name: 'rho .75, highest-first greedy order, beta > 1 (posttest SD 14)',
    plan: testPlan({
      reliability: 0.75,
      r: 0.6,
      posttestSD: 14,
      meanP: 45,
      meanC: 50,
      effect: -1,
      nP: 150,
      nC: 3000,
      matching: { order: 'highest-first' },
      replications: 300,
      seed: 15,
    }),
  },
];

describe('simulated mean estimates agree with the closed forms within 3 Monte Carlo SEs', () => {
  for (const c of cases) {
    it(c.name, () => {
      const m = deriveModelParameters(c.plan);
      const rho = m.reliability.comparison;
      expect(Math.abs(m.reliability.programme - rho)).toBeLessThan(1e-12); // equal SDs ⇒ equal reliabilities
      const tau = m.effect;
      const delta = m.growthGap;
      const gap = m.pretestGap;
      const beta = m.beta;
      const rhoAssumed = c.plan.analysis.assumedReliability;
      const r = simulatePlan(c.plan);

      const gObs = r.matching.observedDifferenceAfter;
      expect(Math.abs(gObs)).toBeLessThan(0.02 * c.plan.groups.comparison.pretestSD); // the caliper is tight

      const expected = {
        matchedDifference: tau + delta + beta * (1 - rho) * gap + beta * rho * gObs,
        ancova: tau + delta + beta * (1 - rho) * gap,
        gainScore: tau + delta + (beta - 1) * gap,
        correctedAncova: tau + delta + beta * (1 - rho / rhoAssumed) * gap,
      } as const;
      for (const id of ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const) {
        const s = feasible(r.analyses[id]!);
        expect(s.replications).toBe(c.plan.simulation.replications);
        expect(Math.abs(s.meanEstimate - expected[id]), `${id}: ${s.meanEstimate} vs ${expected[id]} (MCSE ${s.meanEstimateMCSE})`).toBeLessThan(
          3 * s.meanEstimateMCSE,
        );
        expect(s.bias).toBeCloseTo(s.meanEstimate - tau, 12);
      }
      const ms = feasible(r.ancovaMatchedSample);
      expect(Math.abs(ms.meanEstimate - (tau + delta + beta * (1 - rho) * gap))).toBeLessThan(3 * ms.meanEstimateMCSE);

      // Hidden imbalance: after exact matching on X the true scores still differ by (1 - rho) Delta
      // (Kelley 1947; REFERENCES.md). Tolerance 3 MCSE, plus rho · g_obs for the residual caliper gap.
      const trueExpected = (1 - rho) * gap + rho * gObs;
      expect(Math.abs(r.matching.trueDifferenceAfter - trueExpected)).toBeLessThan(3 * r.matching.trueDifferenceAfterMCSE);
    });
  }
});
