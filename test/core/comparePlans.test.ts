import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { applyRemedy, APPLICABLE_REMEDY_IDS } from '../../src/core/applyRemedy';
import { comparePlans } from '../../src/core/comparePlans';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import type { Plan } from '../../src/core/plan';

/*
 * The demo plan (invented): groups' pretest SDs equal the reference SD, so
 * the within-group reliability is .75 in both groups; r = .6 and posttest SD
 * 10 give beta = r·SD_Y/(SD_X·rho) = 0.8 (Lord & Novick 1968, ch. 3, from
 * memory); the observed gap is Delta = 44 − 54 = −10; effect 2.5.
 */
const BETA = 0.8;
const DELTA = -10;
const RHO = 0.75;
const TAU = 2.5;

/** Spearman (1910), Brown (1910): reliability of the mean of k parallel forms. */
const spearmanBrownByHand = (rho: number, k: number): number => (k * rho) / (1 + (k - 1) * rho);

function applied(plan: Plan, id: Parameters<typeof applyRemedy>[1]) {
  const r = applyRemedy(plan, id);
  if (!r.ok) throw new Error(r.reason);
  return r;
}

describe('applyRemedy: the changed plan gives the artefact the remedy promised', () => {
  it('averaged parallel forms: matched-difference artefact beta(1 − rho_k)Delta with Spearman–Brown rho_k (Cochran & Rubin 1973, from memory)', () => {
    const r = applied(demoPlan(), 'more-reliable-pretest');
    expect(validatePlan(r.plan).ok).toBe(true);
    const res = analysePlan(r.plan);
    const bias = res.analyses.matchedDifference!.bias;
    expect(bias).toBeCloseTo(r.remedy.remainingBias, 9);
    // Break-even by hand: 0.8·(1 − rho)·10 ≤ 0.25·2.5 needs rho ≥ .921875; Spearman–Brown reaches it at k = 4 (12/13 = .923).
    const k = 4;
    expect(spearmanBrownByHand(RHO, k - 1)).toBeLessThan(1 - (0.25 * TAU) / (BETA * -DELTA));
    expect(spearmanBrownByHand(RHO, k)).toBeGreaterThanOrEqual(1 - (0.25 * TAU) / (BETA * -DELTA));
    expect(res.reliability.comparison).toBeCloseTo(spearmanBrownByHand(RHO, k), 12);
    expect(bias).toBeCloseTo(BETA * (1 - spearmanBrownByHand(RHO, k)) * DELTA, 9);
    // The outcome model is unchanged: the same slope on the true score.
    expect(res.model.beta).toBeCloseTo(BETA, 12);
  });

  it('corrected ANCOVA at the assumed reliability leaves beta(1 − rho/rho′)·Delta (Porter 1967); the input plan is untouched', () => {
    const plan = demoPlan();
    plan.analysis.assumedReliability = 0.85;
    const r = applied(plan, 'corrected-ancova');
    expect(plan.analysis.assumedReliability).toBe(0.85);
    expect(r.analysisId).toBe('correctedAncova');
    // The researcher's assumption is kept, and the variant shows what the remedy promised at it.
    expect(r.plan.analysis.assumedReliability).toBe(0.85);
    const bias = analysePlan(r.plan).analyses.correctedAncova!.bias;
    expect(bias).toBeCloseTo(r.remedy.remainingBias, 9);
    expect(bias).toBeCloseTo(BETA * (1 - RHO / 0.85) * DELTA, 9);
    // At the pooled within-group reliability itself the correction leaves nothing.
    const exact = applied({ ...demoPlan(), analysis: { ...demoPlan().analysis, assumedReliability: RHO } }, 'corrected-ancova');
    expect(analysePlan(exact.plan).analyses.correctedAncova!.bias).toBeCloseTo(0, 9);
  });

  it('gain score: artefact (beta − 1)·Delta = +2.0 points (Lord 1967)', () => {
    const r = applied(demoPlan(), 'gain-score');
    expect(r.analysisId).toBe('gainScore');
    const bias = analysePlan(r.plan).analyses.gainScore!.bias;
    expect(bias).toBeCloseTo(r.remedy.remainingBias, 9);
    expect(bias).toBeCloseTo((BETA - 1) * DELTA, 9);
  });

  it('caliper and pool remedies change the discarded share, not the artefact beta(1 − rho)Delta = −2.0', () => {
    for (const id of ['tighter-caliper', 'looser-caliper', 'larger-pools'] as const) {
      const r = applied(demoPlan(), id);
      const a = analysePlan(r.plan).analyses.matchedDifference!;
      expect(a.bias, id).toBeCloseTo(r.remedy.remainingBias, 9);
      expect(a.bias, id).toBeCloseTo(BETA * (1 - RHO) * DELTA, 9);
    }
    expect(applied(demoPlan(), 'tighter-caliper').plan.matching.caliper).toBeCloseTo(0.1, 12);
    expect(applied(demoPlan(), 'larger-pools').plan.groups.comparison.poolSize).toBe(2400);
  });

  it('with covariates: matching on all measured ones, and measuring the unmeasured confounder, give the promised artefact', () => {
    const base = structuredClone(AFTER_SCHOOL_MATHS);
    base.matching.distance = 'pretest';
    for (const id of ['match-all-measured', 'measure-confounders', 'more-reliable-pretest', 'gain-score'] as const) {
      const r = applied(base, id);
      expect(validatePlan(r.plan).ok, id).toBe(true);
      const a = analysePlan(r.plan).analyses[r.analysisId]!;
      expect(a.bias, id).toBeCloseTo(r.remedy.remainingBias, 6);
    }
    expect(applied(base, 'measure-confounders').plan.covariates!.every((c) => c.measured)).toBe(true);
  });

  it('says plainly when a remedy cannot be expressed as a plan, and lists only the applicable ones', () => {
    const r = applyRemedy(demoPlan(), 'comparison-group');
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain('comparison-group');
    expect(APPLICABLE_REMEDY_IDS).toContain('gain-score');
  });
});

describe('comparePlans', () => {
  it('gives one row per plan with the analysis each relies on, from analysePlan', () => {
    const demo = demoPlan();
    const gain = applied(demo, 'gain-score');
    const forms = applied(demo, 'more-reliable-pretest');
    const rows = comparePlans([
      { name: 'As planned', plan: demo },
      { name: 'Gain score', plan: gain.plan, analysisId: gain.analysisId },
      { name: 'Four forms', plan: forms.plan },
    ]);
    expect(rows.map((r) => r.name)).toEqual(['As planned', 'Gain score', 'Four forms']);
    expect(rows.map((r) => r.analysisId)).toEqual(['matchedDifference', 'gainScore', 'matchedDifference']);
    // Artefacts by hand (see the constants above).
    expect(rows[0]!.artefact).toBeCloseTo(BETA * (1 - RHO) * DELTA, 9);
    expect(rows[0]!.artefactShare).toBeCloseTo((BETA * (1 - RHO) * DELTA) / TAU, 9);
    expect(rows[1]!.artefact).toBeCloseTo((BETA - 1) * DELTA, 9);
    expect(rows[1]!.discardedShare).toBe(0);
    expect(rows[1]!.estimand).toContain('All members');
    const a = analysePlan(demo).analyses.matchedDifference!;
    expect(rows[0]!.power).toBe(a.power);
    expect(rows[0]!.falsePositiveRate).toBe(a.falsePositiveRate);
    expect(rows[0]!.programmeN).toBe(a.nProgramme);
    expect(rows[0]!.discardedShare).toBeCloseTo(1 - a.nProgramme / 180, 12);
    expect(rows[0]!.discardedShare).toBeGreaterThan(0);
    expect(rows[0]!.estimand).toContain('matched members');
    // A rate is a probability strictly between 0 and 1 here.
    expect(rows[0]!.falsePositiveRate!).toBeGreaterThan(0);
    expect(rows[0]!.falsePositiveRate!).toBeLessThan(1);
  });

  it('refuses fewer than two or more than six plans', () => {
    const c = { name: 'x', plan: demoPlan() };
    expect(() => comparePlans([c])).toThrow('2 to 6');
    expect(() => comparePlans(Array.from({ length: 7 }, () => c))).toThrow('2 to 6');
  });
});

describe('applyRemedy and provenance', () => {
  it('drops the source note of a changed field and keeps the others (common practice: a note must describe its value)', () => {
    const plan = demoPlan();
    plan.provenance = {
      'matching.caliper': { source: 'entered', note: 'from our usual practice' },
      'outcome.posttestSD': { source: 'entered', note: 'from a pilot' },
    };
    const r = applied(plan, 'tighter-caliper');
    expect(r.plan.matching.caliper).not.toBe(plan.matching.caliper);
    expect(Object.keys(r.plan.provenance!)).toEqual(['outcome.posttestSD']);
    // A remedy that changes no field keeps every note (corrected ANCOVA keeps the assumed reliability).
    const kept = applied({ ...plan, provenance: { 'analysis.assumedReliability': { source: 'entered', note: 'from the manual' } } }, 'corrected-ancova');
    expect(Object.keys(kept.plan.provenance!)).toEqual(['analysis.assumedReliability']);
  });
});
