import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import type { Remedy } from '../../src/core/analyticResults';
import type { Plan } from '../../src/core/plan';
import { MAX_REALISTIC_PARALLEL_FORMS, rankRemedies, rankRemedyList } from '../../src/core/rankRemedies';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { deriveCovariateModel } from '../../src/core/multivariate/covariateModel';
import { mahalanobisCaliperSuggestion } from '../../src/core/multivariate/mahalanobisCaliperSuggestion';
import { demoPlan } from '../../src/io/demoPlan';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';

function demoWith(change: (p: Plan) => void): Plan {
  const p = demoPlan();
  change(p);
  return p;
}

const byId = (list: Remedy[], id: Remedy['id']): Remedy => {
  const r = list.find((x) => x.id === id);
  if (!r) throw new Error(`no remedy ${id}`);
  return r;
};

describe('the corrected-ANCOVA remedy at the researcher’s own assumed reliability', () => {
  it('leaves beta(1 − rho/rho′)Delta, not 0, when the assumed figure is above the pooled within-group reliability (Porter 1967)', () => {
    const plan = demoWith((p) => { p.analysis.assumedReliability = 0.85; });
    const r = byId(rankRemedies(plan), 'corrected-ancova');
    // Demo: beta 0.8, pooled within-group rho .75, Delta −10 → 0.8·(1 − .75/.85)·(−10) = −0.941 (hand computation).
    expect(r.remainingBias).toBeCloseTo(0.8 * (1 - 0.75 / 0.85) * -10, 10);
    expect(r.neededReliability).toBeCloseTo(0.75, 12);
    expect(r.summary).toContain('At the reliability you assumed (0.850) the artefact left is −0.94 points');
    expect(r.summary).toContain('pooled within-group reliability of these groups, 0.750');
    // And the remedy agrees with the corrected-ANCOVA analysis itself.
    expect(r.remainingBias).toBeCloseTo(analysePlan(plan).analyses.correctedAncova!.bias, 12);
  });
});

describe('unrealistic remedies are flagged with what is feasible', () => {
  it('more than 4 parallel forms is called unrealistic, with the 4-form figures (Spearman 1910; Brown 1910)', () => {
    const plan = demoWith((p) => { p.analysis.tolerableBiasShare = 0.05; });
    const r = byId(rankRemedies(plan), 'more-reliable-pretest');
    const k = Number(/Average (\d+) parallel/.exec(r.title)?.[1]);
    expect(k).toBeGreaterThan(MAX_REALISTIC_PARALLEL_FORMS);
    // Four forms (Spearman–Brown): rho_4 = 4·.75/(1 + 3·.75) = 0.923; the slope on the true score
    // (0.8) is unchanged by averaging, so the artefact is 0.8·(1 − 0.923)·(−10) = −0.62 (hand computation).
    const rho4 = (4 * 0.75) / (1 + 3 * 0.75);
    expect(r.feasibility).toMatch(/^Unrealistic: few tests have more than 3–4 parallel forms/);
    expect(r.feasibility).toContain(`4 forms raise the within-group reliability to ${rho4.toFixed(2)}`);
    expect(r.feasibility).toContain(`leave −${Math.abs(0.8 * (1 - rho4) * -10).toFixed(2)} points`);
    // An unrealistic remedy ranks after realistic ones that leave a tolerable artefact.
    const list = rankRemedies(plan);
    expect(list.findIndex((x) => x.id === 'more-reliable-pretest')).toBeGreaterThan(list.findIndex((x) => x.id === 'corrected-ancova'));
    // The demo as it is (4 forms) is not flagged.
    expect(byId(rankRemedies(demoPlan()), 'more-reliable-pretest').feasibility).toBeNull();
  });
});

describe('remedies are ranked with the discarded share counted, and state the estimand', () => {
  const r = (id: Remedy['id'], remainingBias: number, discardedShare: number, feasibility: string | null = null): Remedy => ({
    id, title: id, summary: '', remainingBias, remainingBiasShare: remainingBias / 2.5, discardedShare, assumption: '', feasibility,
  });

  it('a remedy leaving no artefact but discarding 66% of the programme ranks after one leaving a tolerable artefact and discarding 5%', () => {
    const ranked = rankRemedyList([r('measure-confounders', 0, 0.66), r('more-reliable-pretest', 0.3, 0.05), r('gain-score', 2, 0)], 2.5, 0.25);
    expect(ranked.map((x) => x.id)).toEqual(['more-reliable-pretest', 'measure-confounders', 'gain-score']);
  });

  it('names the matched programme members as whom the estimate describes', () => {
    const list = rankRemedies(demoPlan());
    const pool = byId(list, 'more-reliable-pretest');
    expect(pool.discardedShare).toBeGreaterThan(0);
    expect(pool.estimand).toMatch(/^The estimate would describe the matched programme members \(about \d+% of the programme pool\), not the programme as a whole/);
    expect(byId(list, 'gain-score').estimand).toBeNull();
  });
});

describe('switching to Mahalanobis matching puts the caliper in a new unit', () => {
  it('with the pretest as the only measured variable the suggestion keeps the caliper (the distance is then the standardised difference; Rubin 1980)', () => {
    const plan = demoWith((p) => { p.matching.distance = 'mahalanobis'; });
    const res = analysePlan(plan);
    expect(res.caliperSuggestion).toBeDefined();
    expect(res.caliperSuggestion!.value).toBeCloseTo(0.2, 1);
    expect(res.caliperSuggestion!.note).toMatch(/no longer SDs of the pretest/);
  });

  it('with more measured covariates the suggestion is wider than the pretest caliper and keeps the matched share', () => {
    const example = EXAMPLE_PLANS.find((e) => (e.plan.covariates?.filter((c) => c.measured !== false).length ?? 0) >= 1);
    expect(example).toBeDefined();
    const plan = structuredClone(example!.plan) as Plan;
    const m = deriveModelParameters(plan);
    const cm = deriveCovariateModel(plan, m);
    const s = mahalanobisCaliperSuggestion(cm, m, plan.matching);
    // A distance over several standardised variables is larger than over one (common practice), so a wider caliper is needed.
    expect(s.value).toBeGreaterThan(plan.matching.caliper);
    expect(s.note).toContain(`as ${plan.matching.caliper} pretest SDs did`);
    const remedy = rankRemedies(plan).find((x) => x.id === 'match-all-measured');
    if (remedy) expect(remedy.caliperSuggestion?.value).toBe(s.value);
  });
});

describe('an assumed growth gap does not lift a remedy', () => {
  it('with the demo and a growth gap of +1.5, remedies that leave the −2.00 artefact rank after the corrected ANCOVA', () => {
    const plan = demoWith((p) => { p.outcome.growthGap = 1.5; });
    const list = rankRemedies(plan);
    // Corrected ANCOVA at the pooled reliability leaves no regression artefact (Porter 1967): it ranks first.
    expect(list[0]!.id).toBe('corrected-ancova');
    const pool = list.findIndex((x) => x.id === 'larger-pools');
    expect(pool).toBeGreaterThan(list.findIndex((x) => x.id === 'more-reliable-pretest'));
  });
});
