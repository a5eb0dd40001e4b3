import jStat from 'jstat';
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { sensitivityCurve } from '../../src/core/sensitivityCurve';
import { validatePlan } from '../../src/core/validatePlan';
import { selectionArtefact } from '../../src/core/design/selectionEstimates';
import { selectionModel } from '../../src/core/design/selectionModel';
import { modelWith, populationWithSem } from '../../src/core/design/selectionVariants';
import { demoPlan } from '../../src/io/demoPlan';
import { rawSelectionPlan, selectionPlan } from './selectionPlanFixture';

const PhiInv = (p: number): number => jStat.normal.inv(p, 0, 1) as number;
const lowestFifth = 50 + 10 * PhiInv(0.2);

/** The problems validatePlan reports for a changed invented selection plan. */
function problems(change: (p: Record<string, any>) => void): { field: string; message: string }[] {
  const p = rawSelectionPlan({ cutOff: 42 }) as Record<string, any>;
  change(p);
  const r = validatePlan(p);
  return r.ok ? [] : r.problems;
}

describe('validation of selection fields: one plain message per missing or contradictory field (plan-file rules; common practice)', () => {
  it.each([
    ['population', (p: any): unknown => delete p.population, /^The population section is missing: with a selection rule/],
    ['assignment.basis', (p: any): unknown => delete p.assignment.basis, /^What the rule looked at is missing; it must be "pretest", "screener" or "true-score"\.$/],
    ['assignment.cutOff', (p: any): unknown => delete p.assignment.cutOff, /^Cut-off is missing/],
    ['assignment.side', (p: any): unknown => delete p.assignment.side, /^Who is selected is missing; it must be "below" or "above"\.$/],
    ['assignment.spread', (p: any): unknown => (p.assignment.rule = 'probability'), /a probability rule needs the spread of its ogive/],
    ['assignment.screenerReliability', (p: any): unknown => (p.assignment.basis = 'screener'), /a rule on a screener needs its reliability/],
    ['assignment.side', (p: any): unknown => (p.assignment.side = 'left'), /^Who is selected must be "below" or "above"; got "left"\.$/],
    ['assignment.spread', (p: any): unknown => Object.assign(p.assignment, { rule: 'probability', spread: -1 }), /got -1\.$/],
    [
      'assignment.screenerReliability',
      (p: any): unknown => Object.assign(p.assignment, { basis: 'screener', screenerReliability: 1.2 }),
      /between 0 and 1 \(exclusive\); got 1\.2\.$/,
    ],
    ['assignment.rule', (p: any): unknown => Object.assign(p, { design: 'one-group', assignment: { rule: 'existing-groups' } }), /^A one-group study needs the rule that selected its people/],
    ['matching.distance', (p: any): unknown => (p.matching.distance = 'propensity'), /matching is on the observed pretest only; got "propensity"/],
    ['assignment.cutOff', (p: any): unknown => (p.assignment.cutOff = 10), /^The rule puts about 0\.633 of the 20000 people in the programme group, and at least 10 are needed/],
    ['pretest.sem', (p: any): unknown => (p.pretest = { sem: 12 }), /smaller than the population's pretest SD.*SEM of 12 points against a population SD of 10/],
    ['outcome.prePostCorrelation', (p: any): unknown => (p.outcome.prePostCorrelation = 0.95), /at most 0\.894 .*\(0\.8 in the population\); got 0\.95\./],
  ] as const)('%s: %s', (field, change, message) => {
    const got = problems(change);
    expect(got).toHaveLength(1);
    expect(got[0]!.field).toBe(field);
    expect(got[0]!.message).toMatch(message);
  });
  it('labels a file gives its groups are kept; the rest of the groups is derived (expected sizes, means, SDs)', () => {
    const r = validatePlan({ ...rawSelectionPlan({ cutOff: lowestFifth }), groups: { programme: { label: 'Tutored' }, comparison: { label: 'Not tutored' } } });
    expect(r.ok).toBe(true);
    if (!r.ok) return;
    expect(r.plan.groups.programme.label).toBe('Tutored');
    expect(r.plan.groups.programme.poolSize).toBe(4000);
    // E[X | X < Φ⁻¹(.2)] = 50 − 10 φ(a)/Φ(a) (Johnson, Kotz & Balakrishnan 1994); tolerance 1e-9.
    const a = PhiInv(0.2);
    expect(r.plan.groups.programme.pretestMean).toBeCloseTo(50 - (10 * (jStat.normal.pdf(a, 0, 1) as number)) / 0.2, 9);
  });
});

describe('remedies for selection designs (re-run selection model; ranked by the artefact left)', () => {
  it('rule on the pretest: adjusting for it leaves nothing (Thistlethwaite & Campbell 1960; Kenny 1975); ranked first', () => {
    const r = analysePlan(selectionPlan({ cutOff: lowestFifth, tau: 2 }));
    expect(r.remedies[0]!.id).toBe('adjust-for-rule-score');
    expect(r.remedies[0]!.remainingBias).toBeCloseTo(0, 9);
    expect(r.remedies[0]!.summary).toMatch(/times that of a randomised study/);
  });
  it('rule on a screener: recording its scores and adjusting for them leaves only the growth gap', () => {
    const r = analysePlan(selectionPlan({ basis: 'screener', screenerReliability: 0.7, cutOff: 42, tau: 2, growth: 0.3 }));
    const ids = r.remedies.map((x) => x.id);
    expect(ids).toEqual(['record-screener', 'more-reliable-pretest']);
    expect(r.remedies[0]!.remainingBias).toBeCloseTo(0.3, 9);
    for (let i = 1; i < r.remedies.length; i++) {
      expect(Math.abs(r.remedies[i]!.remainingBias)).toBeGreaterThanOrEqual(Math.abs(r.remedies[i - 1]!.remainingBias) - 1e-9);
    }
  });
  it('rule on judged need: write it down as a scored rule; a more reliable pretest shrinks, but does not remove, the ANCOVA bias (Lord 1960)', () => {
    const r = analysePlan(selectionPlan({ basis: 'true-score', cutOff: lowestFifth, tau: 2 }));
    const byId = Object.fromEntries(r.remedies.map((x) => [x.id, x]));
    expect(byId['scored-rule']!.remainingBias).toBeCloseTo(0, 9);
    const ancovaNow = r.analyses.ancova!.bias;
    const pretest = byId['more-reliable-pretest']!;
    expect(Math.abs(pretest.remainingBias)).toBeLessThan(Math.abs(ancovaNow));
    expect(Math.abs(pretest.remainingBias)).toBeGreaterThan(0);
  });
  it('one group (Barnett et al. 2005): a separate baseline removes the regression when the measurements are parallel (reliability = r, slope 1); averaged baselines give eq. 1 with m', () => {
    const plan = selectionPlan({ design: 'one-group', mean: 60, sd: 15, posttestSD: 15, r: 0.5, reliability: 0.5, cutOff: 40, tau: 5 });
    const r = analysePlan(plan);
    const byId = Object.fromEntries(r.remedies.map((x) => [x.id, x]));
    expect(byId['separate-baseline']!.remainingBias).toBeCloseTo(0, 9);
    expect(byId['comparison-group']!.remainingBias).toBeCloseTo(0, 9);
    // m = 2: 8.54 points (REFERENCES.md, computed from eq. 1), listed in the summary.
    expect(byId['average-baselines']!.summary).toMatch(/8\.54 points with 2/);
    expect(byId['average-baselines']!.summary).toMatch(/Three or four baselines are about the practical limit/);
    expect(byId['comparison-group']!.summary).toMatch(/variance is \d+\.\d\d times that of a randomised study/);
    expect(r.remedies.at(-1)!.id).toBe('average-baselines');
  });
});

describe('sensitivity curves for selection designs', () => {
  const plan = selectionPlan({ basis: 'screener', screenerReliability: 0.7, cutOff: 42, tau: 2 });
  const r = analysePlan(plan);
  it('screener reliability 1 is a rule on the true score itself (model definition); regression discontinuity stays unbiased throughout; tolerance 1e-9', () => {
    const c = sensitivityCurve(plan, 'screenerReliability', 3);
    expect(c.current).toBe(0.7);
    // Reliability 1 for the screener = a rule on the true score itself (model definition).
    const truth = analysePlan(selectionPlan({ basis: 'true-score', cutOff: 42, tau: 2 }));
    expect(c.points[2]!.bias.ancova).toBeCloseTo(truth.analyses.ancova!.bias, 9);
    for (const p of c.points) expect(p.bias.regressionDiscontinuity).toBeCloseTo(0, 9);
  });
  it('pretest reliability 1: ANCOVA on the pretest adjusts for the true score itself, so its bias is 0 (Lord 1960)', () => {
    const c = sensitivityCurve(plan, 'reliability', 11);
    expect(c.current).toBeCloseTo(0.8, 12);
    expect(c.points.at(-1)!.x).toBe(1);
    expect(c.points.at(-1)!.bias.ancova).toBeCloseTo(0, 9);
    // x = 0.79 on the curve equals the model with the SEM for that reliability (population true variance 80 held).
    const m = selectionModel(plan);
    const x = c.points[7]!.x;
    const sem = Math.sqrt((80 * (1 - x)) / x);
    expect(c.points[7]!.bias.gainScore).toBeCloseTo(selectionArtefact('gainScore', modelWith(m, { population: populationWithSem(m.population, sem) }), 0.8), 12);
  });
  it('cut-off curve includes the plan\u2019s cut-off and, there, analysePlan\u2019s biases; tolerance 1e-9', () => {
    const c = sensitivityCurve(plan, 'cutOff', 41);
    expect(c.current).toBe(42);
    const lo = c.points[0]!.x;
    const hi = c.points.at(-1)!.x;
    expect(lo).toBeLessThanOrEqual(42);
    expect(hi).toBeGreaterThanOrEqual(42);
    expect(c.points[0]!.bias.ancova).toBeCloseTo(analysePlan(selectionPlan({ basis: 'screener', screenerReliability: 0.7, cutOff: lo, tau: 2 })).analyses.ancova!.bias, 9);
  });
  it('the pretest gap is refused in plain words; a cut-off or screener curve is refused for existing groups', () => {
    expect(() => sensitivityCurve(plan, 'pretestGap')).toThrow(/^In a selection design the pretest gap between the groups is not a setting/);
    expect(() => sensitivityCurve(demoPlan(), 'cutOff')).toThrow(/^This plan's groups already existed, so it has no cut-off to vary/);
    expect(() => sensitivityCurve(selectionPlan({ cutOff: 42 }), 'screenerReliability')).toThrow(/does not use a screener/);
  });
  it('a sharp cut on the pretest leaves the matched difference out of every curve (no overlap at any point)', () => {
    const c = sensitivityCurve(selectionPlan({ cutOff: 42 }), 'reliability', 5);
    for (const p of c.points) expect(p.bias.matchedDifference).toBeUndefined();
    expect(c.points[0]!.bias.ancova).toBeCloseTo(0, 9);
  });
  it('one group: the pre–post change curve against the cut-off, and its band crossings', () => {
    const one = selectionPlan({ design: 'one-group', cutOff: 42, tau: 2 });
    const c = sensitivityCurve(one, 'cutOff', 21);
    expect(Object.keys(c.points[0]!.bias)).toEqual(['prePostChange']);
    for (const x of c.breakEvenX) expect(x).toBeGreaterThanOrEqual(c.points[0]!.x);
  });
});
