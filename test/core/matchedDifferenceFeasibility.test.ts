import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { expectedMatchedShare } from '../../src/core/expectedMatchedShare';
import { matchedDifferenceFeasibility } from '../../src/core/matchedDifferenceFeasibility';
import { validatePlan } from '../../src/core/validatePlan';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';

/** Invented: the demo plan with the groups 6 pretest SDs apart and a 0.05 SD caliper, so almost nobody can be matched. */
function unmatchablePlan(): Plan {
  const p = demoPlan();
  p.groups.programme.pretestMean = 20;
  p.groups.comparison.pretestMean = 80;
  p.matching.caliper = 0.05;
  return p;
}

describe('matched difference with fewer than 2 expected matched programme members', () => {
  // Common practice: a paired-difference t test needs at least 2 pairs (df = n − 1 ≥ 1).
  const plan = unmatchablePlan();
  it('the invented plan is valid and expects under 2 matched programme members (closed-form matched share)', () => {
    expect(validatePlan(plan).ok).toBe(true);
    const m = deriveModelParameters(plan);
    expect(m.n.programme * expectedMatchedShare(m, plan.matching)).toBeLessThan(2);
  });
  for (const covariatePath of [false, true]) {
    it(`${covariatePath ? 'covariate path (propensity distance)' : 'one-pretest path'}: not feasible, with a reason and no power, error rates or required n; the full-sample analyses stay finite`, () => {
      const p = unmatchablePlan();
      if (covariatePath) p.matching.distance = 'propensity';
      const r = analysePlan(p);
      const md = r.analyses.matchedDifference!;
      expect(md.feasible).toBe(false);
      expect(md.infeasibleReason).toMatch(/widen the caliper/);
      expect(md.infeasibleReason).toMatch(/enlarge the comparison pool/);
      for (const key of ['se', 'df', 'power', 'powerWithoutBias', 'falsePositiveRate', 'wrongSignRate', 'requiredNPerGroup'] as const) {
        expect(md[key], key).toBeNull();
      }
      expect(md.nProgramme).toBeLessThan(2);
      // The expected estimate is still the infinite-pool figure (Thorndike 1942), so it stays reported.
      expect(Number.isFinite(md.expectedEstimate)).toBe(true);
      for (const id of ['ancova', 'gainScore', 'correctedAncova'] as const) {
        const a = r.analyses[id]!;
        expect(a.feasible).toBe(true);
        expect(a.infeasibleReason).toBeNull();
        for (const key of ['se', 'df', 'power', 'powerWithoutBias', 'falsePositiveRate'] as const) {
          expect(Number.isFinite(a[key]), `${id}.${key}`).toBe(true);
        }
      }
    });
  }
  it('the demo plan (invented) is feasible: reason null, power a number', () => {
    const md = analysePlan(demoPlan()).analyses.matchedDifference!;
    expect(md.feasible).toBe(true);
    expect(md.infeasibleReason).toBeNull();
    expect(typeof md.power).toBe('number');
  });
});

describe('matchedDifferenceFeasibility: the threshold and the advice', () => {
  const noReuse = { replacement: false, ratio: 1 };
  it('2 expected matched members is enough, 1.99 is not (common practice: n − 1 ≥ 1 df)', () => {
    expect(matchedDifferenceFeasibility(2, 100, noReuse)).toBeNull();
    expect(matchedDifferenceFeasibility(1.99, 100, noReuse)).toMatch(/^Fewer than 2 of the 100 programme members/);
    expect(matchedDifferenceFeasibility(1.5, 100, noReuse)).toMatch(/^About 1\.5 of the 100 programme members are expected/);
  });
  it('none or a non-number reads "None"; a tiny count reads "Almost none"', () => {
    expect(matchedDifferenceFeasibility(0, 50, noReuse)).toMatch(/^None of the 50/);
    expect(matchedDifferenceFeasibility(Number.NaN, 50, noReuse)).toMatch(/^None of the 50/);
    expect(matchedDifferenceFeasibility(0.01, 50, noReuse)).toMatch(/^Almost none of the 50/);
  });
  it('suggests reuse only without replacement, and fewer partners only when k > 1', () => {
    expect(matchedDifferenceFeasibility(0.5, 50, noReuse)).toMatch(/with replacement/);
    expect(matchedDifferenceFeasibility(0.5, 50, { replacement: true, ratio: 1 })).not.toMatch(/with replacement|fewer partners/);
    expect(matchedDifferenceFeasibility(0.5, 50, { replacement: true, ratio: 3 })).toMatch(/fewer partners per programme member/);
  });
});
