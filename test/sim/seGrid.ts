import type { Plan } from '../../src/core/plan';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { covariate } from '../fixtures/covariatePlans';
import { covariatePlan } from './multivariateFixtures';
import { testPlan } from './planFixtures';

/**
 * A seeded grid of invented plans (no real study) for the SE coverage checks:
 * with and without replacement, ratio 1–3, unequal group pretest SDs (so
 * unequal within-group reliabilities and residual variances) and group sizes,
 * an assumed reliability that differs from the true one, and two covariate
 * plans (propensity and Mahalanobis matching). The groups' pretest (and
 * covariate) means are equal and there is no growth gap, so every analysis
 * is unbiased whatever the reliabilities: its 95% CI should then cover the
 * true effect 95% of the time if, and only if, its SE and df are right.
 */
export function seGridPlans(count: number, covariatePlans: number, replications: number, seed: number): { name: string; plan: Plan }[] {
  const rng = Xoshiro128StarStar.forReplication(seed, 0);
  const u = (a: number, b: number) => a + (b - a) * rng.nextFloat();
  const pick = <T>(xs: readonly T[]): T => xs[Math.floor(rng.nextFloat() * xs.length)] as T;
  const plans: { name: string; plan: Plan }[] = [];
  for (let i = 0; i < count; i++) {
    const nP = Math.round(u(30, 150));
    const replacement = i % 2 === 1;
    // With replacement the comparison pool may be smaller than the programme pool (heavy reuse).
    const nC = Math.min(600, Math.round(nP * (replacement ? u(0.5, 6) : u(1, 6))));
    const reliability = u(0.65, 0.95);
    const ratio = pick([1, 2, 3] as const);
    const base = {
      nP,
      nC: replacement ? nC : Math.max(nC, ratio * nP), // without replacement: room for every set
      meanP: 50,
      meanC: 50,
      sd: 10,
      reliability,
      assumedReliability: Math.min(0.99, Math.max(0.4, reliability + u(-0.25, 0.1))),
      r: u(0.3, 0.6),
      effect: u(-2, 3),
      matching: { caliper: u(0.05, 0.3), ratio, replacement, method: pick(['nearest', 'random-within-caliper'] as const) },
      replications,
      seed: 100 + i,
    };
    const covariateCase = i >= count - covariatePlans;
    const plan = covariateCase
      ? covariatePlan({
          covariates: [covariate({ programmeMean: 80, comparisonMean: 80, reliability: u(0.6, 0.9) })],
          correlations: [
            [1, 0.4],
            [0.4, 1],
          ],
          base: { ...base, matching: { ...base.matching, distance: i % 2 === 0 ? 'propensity' : 'mahalanobis', caliper: i % 2 === 0 ? 0.2 : 0.5 } },
        })
      : testPlan(base);
    plan.groups.programme.pretestSD = u(9, 16);
    plan.groups.comparison.pretestSD = u(9, 16);
    const m = plan.matching;
    plans.push({
      name:
        `${nP} vs ${plan.groups.comparison.poolSize}, SDs ${plan.groups.programme.pretestSD.toFixed(1)}/${plan.groups.comparison.pretestSD.toFixed(1)}, ` +
        `rel ${reliability.toFixed(2)} (assumed ${plan.analysis.assumedReliability.toFixed(2)}), 1:${m.ratio} ${m.replacement ? 'with' : 'without'} replacement, ` +
        `${m.method}, ${m.distance ?? 'pretest'} caliper ${m.caliper.toFixed(2)}`,
      plan,
    });
  }
  return plans;
}
