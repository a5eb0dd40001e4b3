import { describe, expect, it } from 'vitest';
import { selectionModel, SEL_OUTCOME, SEL_PRETEST } from '../../src/core/design/selectionModel';
import type { AnalysisId, AssignmentSpec } from '../../src/core/plan';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { isFeasible } from '../../src/sim/types';
import { selectionPlan } from './selectionFixtures';

/**
 * 95% CI coverage of the analyses that are unbiased for the effect τ under a
 * selection rule, in the pools engine:
 *  - ANCOVA on the pretest when the rule cut on the pretest (Kenny 1975: adjusting
 *    for the variable assignment used removes the selection bias; here it is also
 *    the regression-discontinuity analysis);
 *  - regression discontinuity on a screener the rule cut on, and on the pretest under
 *    a probability rule (the outcome's regression on the rule's score is the same in
 *    both groups; Cappelleri, Darlington & Trochim 1994);
 *  - the one-group pre–post change only when its regression part is cancelled: the
 *    CI covers τ + growth + E[Y0 − X | selected] (Barnett et al. 2005), so the plan's
 *    growth is set to −E[Y0 − X | selected] from the core's selection model and the
 *    CI then targets τ.
 * Criterion: coverage within 0.95 ± (0.02 + 3 MC SE), MC SE = sqrt(p(1 − p)/R)
 * (Morris, White & Crowther 2019, Table 6); 0.02 allows for the t and delta-method
 * approximations at these sizes (as in test/sim/seCoverage.test.ts).
 */

const REPS = 1000;

const CASES: { name: string; id: AnalysisId; assignment: Partial<AssignmentSpec>; oneGroup?: boolean }[] = [
  { name: 'ANCOVA, cut-off on the pretest', id: 'ancova', assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 44, side: 'below' } },
  { name: 'RD, cut-off on a screener', id: 'regressionDiscontinuity', assignment: { rule: 'cut-off', basis: 'screener', cutOff: 46, side: 'below', screenerReliability: 0.7 } },
  { name: 'RD, probability on the pretest', id: 'regressionDiscontinuity', assignment: { rule: 'probability', basis: 'pretest', cutOff: 52, side: 'above', spread: 5 } },
  { name: 'pre–post change with the regression part cancelled', id: 'prePostChange', oneGroup: true, assignment: { rule: 'cut-off', basis: 'screener', cutOff: 44, side: 'below', screenerReliability: 0.7 } },
];

describe('pools engine: 95% CI coverage of the unbiased analyses under selection rules', () => {
  CASES.forEach((c, k) => {
    it(c.name, () => {
      let plan = selectionPlan({ assignment: c.assignment, design: c.oneGroup ? 'one-group' : 'two-groups', poolSize: 800, effect: 1.5 });
      if (c.oneGroup) {
        const m = selectionModel(plan);
        const regression = (m.programme.mean[SEL_OUTCOME] as number) - (m.programme.mean[SEL_PRETEST] as number);
        expect(Math.abs(regression)).toBeGreaterThan(1); // a real regression part to cancel
        plan = selectionPlan({ assignment: c.assignment, design: 'one-group', poolSize: 800, effect: 1.5, growthGap: -regression });
      }
      const s = simulatePlan(plan, { replications: REPS, seed: 300 + k }).analyses[c.id];
      if (!s || !isFeasible(s)) throw new Error(`${c.id} was not simulated`);
      const mcse = Math.sqrt((0.95 * 0.05) / REPS);
      expect(Math.abs(s.coverage - 0.95), `${c.name}: coverage ${s.coverage}`).toBeLessThanOrEqual(0.02 + 3 * mcse);
      // Unbiased: the mean estimate is within 3 MC SE of τ (the premise of the coverage check).
      expect(Math.abs(s.meanEstimate - 1.5)).toBeLessThanOrEqual(3 * s.meanEstimateMCSE);
    });
  });

  it('a biased analysis does not reach nominal coverage (ANCOVA on the pretest when the rule used a screener)', () => {
    // The same check must be able to fail: Kenny (1975) — the pretest does not carry what the rule looked at.
    const plan = selectionPlan({ assignment: CASES[1]?.assignment, poolSize: 800, effect: 1.5 });
    const s = simulatePlan(plan, { replications: 300, seed: 399 }).analyses.ancova;
    if (!s || !isFeasible(s)) throw new Error('not simulated');
    expect(s.coverage).toBeLessThan(0.95 - 0.02 - 3 * Math.sqrt((0.95 * 0.05) / 300));
  });
});
