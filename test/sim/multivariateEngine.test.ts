import { describe, expect, it } from 'vitest';
import { createSimulation } from '../../src/sim/createSimulation';
import { createMultivariateSimulation } from '../../src/sim/multivariate/createMultivariateSimulation';
import { runSimulationInSteps } from '../../src/sim/runSimulationInSteps';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { simulationJson } from '../../src/cli/simulationJson';
import { demoPlan } from '../../src/io/demoPlan';
import type { MatchingDistance, Plan } from '../../src/core/plan';
import { AGE, ATTENDANCE, MOTIVATION, covariatePlan } from './multivariateFixtures';
import { testPlan } from './planFixtures';

const R3 = [
  [1, 0.4, 0.3, 0.2],
  [0.4, 1, 0.2, 0.1],
  [0.3, 0.2, 1, 0.1],
  [0.2, 0.1, 0.1, 1],
];

function smallPlan(distance: MatchingDistance, matching: Partial<Plan['matching']> = {}): Plan {
  return covariatePlan({
    covariates: [ATTENDANCE, MOTIVATION, AGE],
    correlations: R3,
    base: { nP: 40, nC: 400, replications: 30, seed: 5, matching: { distance, caliper: distance === 'mahalanobis' ? 0.8 : 0.3, ...matching } },
  });
}

function runWhole(plan: Plan) {
  const run = createSimulation(plan);
  run.runChunk(0, run.total);
  return run.finish();
}

describe('a plan without covariates runs the one-pretest engine, unchanged', () => {
  // Exact equality (bit for bit): the issue requires the one-covariate plan to give exactly the previous results.
  const plans: [string, Plan][] = [
    ['the demo plan', { ...demoPlan(), simulation: { replications: 40, seed: 3 } }],
    ['distance "pretest" and an empty covariate list', { ...testPlan({ nP: 40, nC: 200, replications: 30, matching: { distance: 'pretest', ratio: 2 } }), covariates: [] }],
  ];
  for (const [name, plan] of plans) {
    it(name, async () => {
      const direct = runWhole(plan);
      const viaPlan = simulatePlan(plan, { chunkSize: 7 });
      expect(viaPlan).toEqual(direct);
      expect(viaPlan.balance).toBeUndefined();
      const stepped = await runSimulationInSteps(plan, {}, { progress: () => undefined, yieldTick: () => Promise.resolve(), cancelled: () => false, now: () => 0 });
      expect(stepped).toEqual(direct);
    });
  }
});

describe('the several-covariate engine is deterministic across chunkings', () => {
  // Replication i always draws from stream (seed, i) (common practice for parallel Monte Carlo). Exact equality.
  const variants: [MatchingDistance, Partial<Plan['matching']>][] = [
    ['pretest', { method: 'random-within-caliper', ratio: 2 }],
    ['propensity', { ratio: 2, replacement: true }],
    ['propensity', { order: 'highest-first' }],
    ['mahalanobis', { method: 'random-within-caliper', ratio: 3, order: 'lowest-first' }],
  ];
  for (const [distance, matching] of variants) {
    it(`${distance}, ${JSON.stringify(matching)}`, async () => {
      const plan = smallPlan(distance, matching);
      const whole = simulatePlan(plan, { chunkSize: 1000 });
      expect(whole.balance?.length).toBe(4);
      expect(simulatePlan(plan, { chunkSize: 1 })).toEqual(whole);
      expect(simulatePlan(plan, { chunkSize: 7 })).toEqual(whole);
      const run = createMultivariateSimulation(plan);
      run.runChunk(20, 30);
      run.runChunk(0, 10);
      run.runChunk(10, 20);
      run.runChunk(5, 15);
      expect(run.finish()).toEqual(whole);
      const stepped = await runSimulationInSteps(plan, {}, { progress: () => undefined, yieldTick: () => Promise.resolve(), cancelled: () => false, now: () => 0 });
      expect(stepped).toEqual(whole);
      const other = simulatePlan(plan, { seed: 6 });
      expect(other.estimates.matchedDifference!).not.toEqual(whole.estimates.matchedDifference!);
    });
  }
});

describe('the several-covariate engine', () => {
  it('reports balance per variable, pretest first, with exact matching exact on the categories', () => {
    const plan = smallPlan('propensity');
    const r = simulatePlan(plan);
    expect(r.balance?.map((b) => [b.name, b.measured, b.exact])).toEqual([
      ['Pretest', true, false],
      ['Attendance', true, false],
      ['Motivation', false, false],
      ['Age', true, true],
    ]);
    const age = r.balance![3]!;
    // Matched exactly: the observed (= true) age difference after matching is 0 in every replication.
    expect(age.observedSMDAfter).toBe(0);
    expect(age.observedSMDAfterMCSE).toBe(0);
    expect(age.trueSMDAfter).toBe(0);
    for (const b of r.balance!) {
      for (const v of Object.values(b)) if (typeof v === 'number') expect(Number.isFinite(v)).toBe(true);
    }
    // The pretest's matching summary is the pretest's balance.
    expect(r.matching.observedSMDAfter).toBeCloseTo(r.balance![0]!.observedSMDAfter, 12);
    expect(r.example.pairs.length + r.example.discarded.length).toBe(40);
    // The command line's JSON carries the same balance records (formatting only).
    const json = simulationJson(r, false);
    expect(json.balance).toEqual(r.balance);
    expect(Object.keys(json.balance![0]!)).toEqual(
      expect.arrayContaining(['name', 'observedSMDBefore', 'observedSMDAfter', 'trueSMDAfter', 'varianceRatioAfter']),
    );
  });

  it('matches on the propensity logit exactly as on the pretest when the pretest is the only covariate', () => {
    // With one covariate the fitted logit is a + b·x, a monotone function of the pretest, and the caliper in
    // SDs of the logit equals the same number of pretest SDs (|b| cancels): the same matched sets (definition;
    // Rosenbaum & Rubin 1985). Nearest-neighbour matching, so the direction of the score does not matter.
    // Tolerance 1e-9 on each replication's matched difference (rounding of the logit only).
    const base = testPlan({ nP: 60, nC: 500, replications: 20, seed: 8, matching: { caliper: 0.2 } });
    const onPretest = createMultivariateSimulation({ ...base, matching: { ...base.matching, distance: 'pretest' } });
    const onLogit = createMultivariateSimulation({ ...base, matching: { ...base.matching, distance: 'propensity' } });
    onPretest.runChunk(0, 20);
    onLogit.runChunk(0, 20);
    const a = onPretest.finish();
    const b = onLogit.finish();
    expect(b.matching.meanMatchedProgramme).toBe(a.matching.meanMatchedProgramme);
    expect(b.estimates.matchedDifference!.length).toBe(a.estimates.matchedDifference!.length);
    a.estimates.matchedDifference!.forEach((v, i) => expect(Math.abs(v - b.estimates.matchedDifference![i]!)).toBeLessThan(1e-9));
    // ANCOVA, gain score and corrected ANCOVA do not depend on the distance at all.
    expect(b.estimates.ancova!).toEqual(a.estimates.ancova!);
  });

  it('says which replication and which covariates when the propensity score cannot be fitted', () => {
    // An error-free covariate whose group means lie 12 SDs apart separates the groups completely.
    const plan = covariatePlan({
      covariates: [{ ...AGE, name: 'Referral score', exact: false, programmeMean: 100, comparisonMean: 4, sd: 8 }],
      correlations: [[1, 0.1], [0.1, 1]],
      base: { nP: 30, nC: 60, replications: 5, matching: { distance: 'propensity' } },
    });
    expect(() => simulatePlan(plan)).toThrow(
      /^The propensity score cannot be fitted \(simulated replication 1\): the measured covariates \(Pretest, Referral score\) separate the programme and comparison groups completely or almost completely/,
    );
  });

  it('rejects impossible covariate inputs with the core\'s message', () => {
    const plan = covariatePlan({
      covariates: [{ ...ATTENDANCE, outcomeCorrelation: 0.95 }],
      correlations: [[1, 0.4], [0.4, 1]],
      base: { replications: 5, matching: { distance: 'mahalanobis' } },
    });
    expect(() => createMultivariateSimulation(plan)).toThrow("Attendance's correlation with the outcome (0.95) is too high for its reliability (0.7)");
  });
});
