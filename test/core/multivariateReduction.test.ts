import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyseAnalysis } from '../../src/core/analyseAnalysis';
import { analysePlan, DEFAULT_TARGET_POWER } from '../../src/core/analysePlan';
import { analysisStandardError } from '../../src/core/analysisStandardError';
import { breakEvenReliability } from '../../src/core/breakEvenReliability';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { expectedEstimate } from '../../src/core/expectedEstimate';
import { expectedMatchedShare } from '../../src/core/expectedMatchedShare';
import { covariateBreakEven } from '../../src/core/multivariate/covariateBreakEven';
import { covariateExpectedEstimate } from '../../src/core/multivariate/covariateExpectedEstimate';
import { covariateMatchedShare } from '../../src/core/multivariate/covariateMatchedShare';
import { deriveCovariateModel, usesCovariateModel } from '../../src/core/multivariate/covariateModel';
import { covariateStandardError } from '../../src/core/multivariate/covariateStandardError';
import { unmeasuredBias } from '../../src/core/multivariate/unmeasuredBias';
import { TWO_GROUP_ANALYSIS_IDS, type AnalysisId, type MatchingDistance, type Plan } from '../../src/core/plan';
import { rankRemedies } from '../../src/core/rankRemedies';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { isClusterDesign, isSelectionDesign } from '../../src/core/design/studyDesign';
import { drawnBasePlan, drawnCovariates } from './drawnCovariatePlan';
import { covariate, identity, oneFactor, planWithCovariates } from './multivariateFixture';

// The several-covariate closed forms must reduce to the one-pretest ones (Thorndike 1942;
// Campbell & Erlebacher 1970; Lord 1960; Porter 1967; formulas in REFERENCES.md, computed)
// whenever the extra covariates carry nothing. Tolerances are stated per check: "exact" means
// toStrictEqual / toBe on doubles; otherwise relative 1e-9 (rounding in the matrix solves).

// A figure that is null (an infeasible analysis) must be null on both sides.
const close = (a: number | null, b: number | null, rel = 1e-9): void => {
  if (a === null || b === null) {
    expect(a).toBe(b);
    return;
  }
  expect(Math.abs(a - b)).toBeLessThanOrEqual(rel * Math.max(1, Math.abs(a), Math.abs(b)));
};

const DISTANCES: MatchingDistance[] = ['pretest', 'propensity', 'mahalanobis'];

/** The demo with unequal pretest SDs and pool sizes, so pooled and comparison reliabilities differ. */
function unequalDemo(): Plan {
  const p = demoPlan();
  p.groups.programme.pretestSD = 13;
  p.groups.programme.poolSize = 240;
  p.outcome.growthGap = 0.7;
  p.analysis.assumedReliability = 0.8;
  return p;
}

describe('plans without covariates keep the one-pretest path exactly', () => {
  // Existing groups only: with a rule, matching is on the pretest by design and no covariate path exists.
  const cases: Array<[string, Plan]> = EXAMPLE_PLANS.filter((e) => !e.plan.covariates && !isSelectionDesign(e.plan) && !isClusterDesign(e.plan)).flatMap((e) => {
    const unset = structuredClone(e.plan);
    delete unset.matching.distance;
    const pretest = structuredClone(e.plan);
    pretest.matching.distance = 'pretest';
    const empty = structuredClone(e.plan);
    empty.covariates = [];
    return [
      [`${e.id}, distance unset`, unset],
      [`${e.id}, distance "pretest"`, pretest],
      [`${e.id}, empty covariate list`, empty],
    ] as Array<[string, Plan]>;
  });

  for (const [label, plan] of cases) {
    it(`${label}: bit for bit the one-pretest figures, no covariate fields`, () => {
      expect(usesCovariateModel(plan)).toBe(false);
      const r = analysePlan(plan);
      // Exact (toStrictEqual on doubles): rebuilt from the one-pretest functions alone.
      const m = deriveModelParameters(plan);
      const share = expectedMatchedShare(m, plan.matching);
      const settings = {
        alpha: plan.analysis.alpha,
        assumedReliability: plan.analysis.assumedReliability,
        tolerableBiasShare: plan.analysis.tolerableBiasShare,
        growthGap: plan.outcome.growthGap,
        targetPower: plan.analysis.targetPower ?? DEFAULT_TARGET_POWER,
        ratio: plan.matching.ratio,
        matchedProgramme: m.n.programme * share,
        replacement: plan.matching.replacement,
      };
      for (const id of TWO_GROUP_ANALYSIS_IDS) expect(r.analyses[id]!).toStrictEqual(analyseAnalysis(id, m, settings));
      expect(r.model).toStrictEqual(m);
      expect(r.breakEven).toStrictEqual(breakEvenReliability(m, plan.analysis.tolerableBiasShare));
      expect(r.remedies.map((x) => x.id).sort()).toEqual(
        ['corrected-ancova', 'gain-score', 'larger-pools', 'looser-caliper', 'more-reliable-pretest', 'tighter-caliper'],
      );
      expect(r.remedies).toStrictEqual(rankRemedies(plan, m));
      expect(Object.keys(r).sort()).toEqual(['analyses', 'breakEven', 'design', 'model', 'procedure', 'reliability', 'remedies', 'requiredNCounts', 'tau']);
    });
  }
});

describe('a covariate that carries nothing changes nothing', () => {
  // One covariate with no group gap, uncorrelated with the pretest and with the outcome:
  // every analysis equals the plan without it (relative 1e-9).
  const base = unequalDemo();
  const nullCovariates = [
    covariate({ programmeMean: 85, comparisonMean: 85, outcomeCorrelation: 0, reliability: 0.6, measured: true }),
    covariate({ programmeMean: 85, comparisonMean: 85, outcomeCorrelation: 0, reliability: 0.6, measured: false }),
    covariate({ name: 'Recorded flag', programmeMean: 0.4, comparisonMean: 0.4, sd: 0.5, outcomeCorrelation: 0, reliability: 1, exact: true }),
  ];
  const without = analysePlan(base);
  const m = deriveModelParameters(base);

  for (const c of nullCovariates) {
    for (const distance of DISTANCES) {
      it(`${c.measured ? (c.exact ? 'measured exact' : 'measured') : 'unmeasured'} covariate, distance ${distance}`, () => {
        const plan = planWithCovariates([c], identity(2), base);
        plan.matching.distance = distance;
        const r = analysePlan(plan);
        for (const id of TWO_GROUP_ANALYSIS_IDS) close(r.analyses[id]!.expectedEstimate, without.analyses[id]!.expectedEstimate);
        close(r.unmeasuredBias!.points, 0);
        const cm = deriveCovariateModel(plan, m);
        close(cm.beta[0]!, m.beta);
        close(cm.beta[1]!, 0);
        close(cm.residualSD, m.residualSD);
        // SEs, power and required n: the same wherever the matched sample is the same.
        // Mahalanobis matching counts its caliper in two dimensions, so its matched share differs.
        const sameShare = distance !== 'mahalanobis' || !c.measured || c.exact;
        for (const id of TWO_GROUP_ANALYSIS_IDS) {
          if (id === 'matchedDifference' && !sameShare) continue;
          // One more adjusted covariate costs ANCOVA one df, and power follows the df.
          const lostDf = (id === 'ancova' || id === 'correctedAncova') && c.measured ? 1 : 0;
          close(r.analyses[id]!.df, (without.analyses[id]!.df as number) - lostDf);
          const keys = lostDf ? (['se', 'bias', 'biasSD'] as const) : (['se', 'power', 'powerWithoutBias', 'falsePositiveRate', 'bias', 'biasSD'] as const);
          for (const key of keys) close(r.analyses[id]![key], without.analyses[id]![key]);
        }
      });
    }
  }
});

describe('the covariate model with the pretest alone is the one-pretest model', () => {
  // No covariates but a propensity/Mahalanobis distance: the covariate path, same figures
  // (propensity and Mahalanobis distance on one variable are matching on it).
  const plan = unequalDemo();
  const m = deriveModelParameters(plan);
  const cm = deriveCovariateModel(plan, m);
  const options = { assumedReliability: plan.analysis.assumedReliability, ratio: 2 };

  it('estimates, SEs and matched shares (relative 1e-9)', () => {
    for (const distance of DISTANCES) {
      for (const id of TWO_GROUP_ANALYSIS_IDS) {
        close(covariateExpectedEstimate(id, cm, distance, 0.8), expectedEstimate(id, m, 0.8));
        const sizes = { programme: 150, comparison: id === 'matchedDifference' ? 300 : 1000 };
        const a = covariateStandardError(id, cm, distance, sizes, options);
        const b = analysisStandardError(id, m, sizes, options);
        close(a.se, b.se);
        // Welch–Satterthwaite df (Welch 1947) are not whole numbers: same relative tolerance as the SEs.
        close(a.df, b.df);
      }
      for (const replacement of [false, true]) {
        const spec = { ...plan.matching, replacement };
        close(covariateMatchedShare(cm, m, spec, distance), expectedMatchedShare(m, spec));
      }
    }
  });

  it('break-even reliability (1e-8, the bisection tolerance) and unmeasured part 0', () => {
    for (const share of [0.1, 0.25, 0.5]) {
      const a = covariateBreakEven(cm, m, 'propensity', share);
      const b = breakEvenReliability(m, share);
      expect(a.alreadyMet).toBe(b.alreadyMet);
      expect(a.parallelForms).toBe(b.parallelForms);
      expect(Math.abs((a.reliability ?? -1) - (b.reliability ?? -1))).toBeLessThan(1e-8);
    }
    expect(unmeasuredBias(cm)).toBe(0);
  });
});

describe('property: an unmeasured covariate with no group gap, uncorrelated with the others, changes nothing', () => {
  // Added to random valid plans that already have 0–3 covariates (one-factor correlations).
  // It adds outcome variance the analyses cannot explain, but that variance was already in the
  // residual of the plan without it, so estimates, SEs and the unmeasured part stay (relative 1e-9).
  const arb = fc.record({
    k: fc.integer({ min: 0, max: 3 }),
    loadings: fc.array(fc.double({ min: -0.6, max: 0.6, noNaN: true }), { minLength: 4, maxLength: 4 }),
    gaps: fc.array(fc.double({ min: -1, max: 1, noNaN: true }), { minLength: 3, maxLength: 3 }),
    rels: fc.array(fc.double({ min: 0.5, max: 1, noNaN: true }), { minLength: 3, maxLength: 3 }),
    outs: fc.array(fc.double({ min: -0.3, max: 0.3, noNaN: true }), { minLength: 3, maxLength: 3 }),
    measured: fc.array(fc.boolean(), { minLength: 3, maxLength: 3 }),
    added: fc.record({
      sd: fc.double({ min: 0.5, max: 20, noNaN: true }),
      reliability: fc.double({ min: 0.3, max: 1, noNaN: true }),
      outcome: fc.double({ min: -0.4, max: 0.4, noNaN: true }),
    }),
    distance: fc.constantFrom<MatchingDistance>('pretest', 'propensity', 'mahalanobis'),
    sdP: fc.double({ min: 8, max: 13, noNaN: true }),
  });

  it('holds for 120 random plans', () => {
    fc.assert(
      fc.property(arb, (o) => {
        const base = drawnBasePlan(o.sdP);
        base.matching.distance = o.distance;
        const covs = drawnCovariates(o, 10);
        const R = oneFactor(o.loadings.slice(0, o.k + 1));
        const before = planWithCovariates(covs, R, base);
        fc.pre(validatePlan(before).ok);
        const extra = covariate({
          name: 'Never recorded',
          programmeMean: 3,
          comparisonMean: 3,
          sd: o.added.sd,
          reliability: o.added.reliability,
          outcomeCorrelation: o.added.outcome,
          measured: false,
        });
        const R2 = [...R.map((row) => [...row, 0]), [...R.map(() => 0), 1]];
        const after = planWithCovariates([...covs, extra], R2, base);
        fc.pre(validatePlan(after).ok);
        const a = analysePlan(before);
        const b = analysePlan(after);
        for (const id of TWO_GROUP_ANALYSIS_IDS as readonly AnalysisId[]) {
          for (const key of ['expectedEstimate', 'se', 'power', 'falsePositiveRate'] as const) close(b.analyses[id]![key], a.analyses[id]![key]);
        }
        close(b.unmeasuredBias!.points, a.unmeasuredBias?.points ?? 0);
      }),
      { numRuns: 120, seed: 7 },
    );
  });
});
