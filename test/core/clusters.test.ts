import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { newCohortClusterMeanReliability, samePeopleClusterMeanReliability, averagedClusterMeanReliability } from '../../src/core/clusters/clusterMeanReliability';
import { designEffect } from '../../src/core/clusters/designEffect';
import { minimumDetectableEffect } from '../../src/core/clusters/minimumDetectableEffect';
import { clusterModel } from '../../src/core/clusters/clusterModel';
import { clusterSizeForReliability } from '../../src/core/clusters/clusterSizeForReliability';
import { ICC_PRESETS } from '../../src/core/clusters/iccPresets';
import { validatePlan } from '../../src/core/validatePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { clusterPlan } from './clusterFixtures';

describe('cluster-mean reliability', () => {
  it('new cohort: ICC(2) = n·ICC/(1 + (n − 1)·ICC) with worked values (common practice; Bliese 2000)', () => {
    // n 25, ICC .2: 5 / 5.8 = 0.862069 (REFERENCES.md, computed); tolerance 1e-12 (exact arithmetic).
    expect(newCohortClusterMeanReliability(25, 0.2)).toBeCloseTo(5 / 5.8, 12);
    // n 10, ICC .1: 1 / 1.9 = 0.526316 (hand-worked).
    expect(newCohortClusterMeanReliability(10, 0.1)).toBeCloseTo(1 / 1.9, 12);
    // n 1: one person's score, reliability = the ICC itself (Spearman–Brown with k = 1).
    expect(newCohortClusterMeanReliability(1, 0.3)).toBeCloseTo(0.3, 12);
    // n 50, ICC .05: 2.5 / 3.45 = 0.724638 (hand-worked).
    expect(newCohortClusterMeanReliability(50, 0.05)).toBeCloseTo(2.5 / 3.45, 12);
  });

  it('does not depend on the test reliability for a new cohort (Bliese 2000), but does for the same people', () => {
    const a = clusterModel(clusterPlan({ reliability: 0.7, r: 0.7 })).comparison.clusterMeanReliability;
    const b = clusterModel(clusterPlan({ reliability: 0.9, r: 0.8 })).comparison.clusterMeanReliability;
    expect(a).toBeCloseTo(b, 12);
    const c = clusterModel(clusterPlan({ reliability: 0.7, r: 0.7, cohort: 'same' })).comparison.clusterMeanReliability;
    const d = clusterModel(clusterPlan({ reliability: 0.9, r: 0.8, cohort: 'same' })).comparison.clusterMeanReliability;
    expect(d).toBeGreaterThan(c);
  });

  it('same people retested: (τ² + σ²_wT/n)/(τ² + (σ²_wT + SEM²)/n) = .9655 for ICC .2, reliability .8, SD 15, n 25 (REFERENCES.md, computed)', () => {
    // τ² = .2·225 = 45, SEM² = .2·225 = 45, σ²_wT = 225 − 90 = 135: 50.4 / 52.2.
    expect(samePeopleClusterMeanReliability({ betweenTrue: 45, withinTrue: 135, error: 45 }, 25)).toBeCloseTo(50.4 / 52.2, 12);
    expect(50.4 / 52.2).toBeCloseTo(0.9655, 4);
    // Averaging 3 years of a new cohort = ICC(2) with 75 people (Spearman–Brown over years; hand-worked 45/47.4).
    expect(averagedClusterMeanReliability({ betweenTrue: 45, withinTrue: 135, error: 45 }, 25, 3, false)).toBeCloseTo(newCohortClusterMeanReliability(75, 0.2), 12);
  });

  it('people per cluster for a target λ invert the formulas (round trip, hand-worked 36 for λ* .9)', () => {
    const g = clusterModel(clusterPlan()).comparison;
    // New cohort: n = .9·180/(45·.1) = 36 exactly.
    expect(clusterSizeForReliability(g, 0.9, false)).toBe(36);
    for (const target of [0.88, 0.93, 0.97]) {
      for (const same of [false, true]) {
        const n = clusterSizeForReliability(g, target, same) as number;
        expect(averagedClusterMeanReliability(g.components, n, 1, same)).toBeGreaterThanOrEqual(target - 1e-12);
        if (n > 1) expect(averagedClusterMeanReliability(g.components, n - 1, 1, same)).toBeLessThan(target);
      }
    }
  });
});

describe('design effect and minimum detectable effect', () => {
  it('design effect 1 + (n − 1)·ICC: 5.8 for n 25, ICC .2 (Kish 1965)', () => {
    expect(designEffect(25, 0.2)).toBeCloseTo(5.8, 12);
    expect(designEffect(1, 0.4)).toBe(1);
    expect(designEffect(101, 0.01)).toBeCloseTo(2, 12);
  });

  it('MDE multiplier: 2.80 SEs at alpha .05, power .8, large df (Bloom 1995, Table 1, from memory)', () => {
    expect(minimumDetectableEffect(1, 1e7, 0, 0.05, 0.8, 1)).toBeCloseTo(1.96 + 0.8416, 3);
    // With 20 df the multiplier is t_.975 + t_.80 = 2.086 + 0.860 = 2.946 (t table, common practice).
    expect(minimumDetectableEffect(1, 20, 0, 0.05, 0.8, 1)).toBeCloseTo(2.946, 2);
    // A bias against the hoped-for direction raises the MDE by its size.
    expect(minimumDetectableEffect(1, 1e7, -1.1, 0.05, 0.8, 1)).toBeCloseTo(2.8016 + 1.1, 3);
  });
});

describe('analysePlan for clusters (the issue\u2019s invented check values)', () => {
  // Invented plan: 25 pupils per school, ICC .2, reliability .8, programme schools 8 points lower, slope 1.
  it('new cohort: λ .8621 and matched-cluster artefact −1.10 (Thorndike 1942 at cluster level, REFERENCES.md computed)', () => {
    const r = analysePlan(clusterPlan({ cohort: 'new' }));
    expect(r.model.beta).toBeCloseTo(1, 12);
    expect(r.reliability.clusterMean).toBeCloseTo(0.8621, 4);
    expect(r.analyses.matchedDifference?.expectedEstimate).toBeCloseTo(-8 * (1 - 5 / 5.8), 10);
    expect(r.analyses.matchedDifference?.expectedEstimate).toBeCloseTo(-1.10, 2);
    expect(r.clusters?.designEffect.pretest).toBeCloseTo(5.8, 12);
    expect(r.design.kind).toBe('clusters');
  });

  it('same people: λ .9655, artefact −0.28; people matched on their own pretests: −1.6 (one-level Thorndike)', () => {
    const same = analysePlan(clusterPlan({ cohort: 'same' }));
    expect(same.reliability.clusterMean).toBeCloseTo(0.9655, 4);
    expect(same.analyses.matchedDifference?.expectedEstimate).toBeCloseTo(-0.28, 2);
    const people = analysePlan(clusterPlan({ cohort: 'same', level: 'people' }));
    expect(people.analyses.matchedDifference?.expectedEstimate).toBeCloseTo(-8 * 0.2, 10);
    expect(people.clusters?.personMatchingArtefact).toBeCloseTo(-1.6, 10);
  });

  it('gain on cluster means: SE sqrt(2·14.4/20) = 1.2 with 20 clusters a side (hand-worked from the model)', () => {
    const r = analysePlan(clusterPlan({ clustersC: 20, effect: 2 }));
    expect(r.analyses.gainScore?.se).toBeCloseTo(1.2, 10);
    expect(r.analyses.gainScore?.df).toBeCloseTo(38, 8);
    // Clusters needed and people: 20 clusters give power below .8 for 2 points, so more are needed.
    const a = r.analyses.gainScore;
    expect(a?.power).toBeLessThan(0.8);
    expect(a?.clustersPerGroupNeeded).toBeGreaterThan(20);
    expect(a?.requiredNPerGroup).toBe((a?.clustersPerGroupNeeded as number) * 25);
  });

  it('person-level cluster-aware SE exceeds the naive OLS SE that ignores clustering (Kish 1965: variance inflated by the design effect)', () => {
    // New cohort, no gap: the covariate is the cluster mean; residual ICC stays near the outcome's.
    const r = analysePlan(clusterPlan({ gap: 0, clustersC: 20 }));
    const a = r.analyses.personLevelAncova;
    expect(a?.naiveSE).toBeLessThan(a?.se as number);
  });

  it('remedies are ranked and include the cluster-specific ones', () => {
    const r = analysePlan(clusterPlan({ effect: 3 }));
    const ids = r.remedies.map((x) => x.id);
    for (const id of ['more-people-per-cluster', 'several-years-means', 'same-people-cluster-mean', 'person-level-own-pretests', 'pretests-within-matched-clusters']) expect(ids).toContain(id);
    for (let i = 1; i < r.remedies.length; i++) expect(Math.abs(r.remedies[i]!.remainingBias)).toBeGreaterThanOrEqual(Math.abs(r.remedies[i - 1]!.remainingBias) - 1e-9);
    const more = r.remedies.find((x) => x.id === 'more-people-per-cluster');
    // The break-even λ is 1 − .25·3/8 = .90625; 39 people reach it (hand-worked: .90625·180/(45·.09375) = 38.67).
    expect(r.clusters?.breakEvenClusterSize).toBe(39);
    expect(more?.title).toContain('39');
  });

  it('plans without clusters have no cluster figures', () => {
    const r = analysePlan(demoPlan());
    expect(r.clusters).toBeUndefined();
    expect(r.reliability.clusterMean).toBeUndefined();
  });

  it('ICC presets carry a label, a value in (0, 1) and a source marked "from memory"', () => {
    expect(ICC_PRESETS.length).toBeGreaterThan(3);
    for (const p of ICC_PRESETS) {
      expect(p.icc).toBeGreaterThan(0);
      expect(p.icc).toBeLessThan(1);
      expect(p.source).toContain('Hedges & Hedberg (2007)');
      expect(p.source).toContain('from memory');
    }
    // Conditional ICCs (after a pretest) are smaller than unconditional ones (Hedges & Hedberg 2007, from memory).
    const un = ICC_PRESETS.filter((p) => p.conditioning === 'unconditional').map((p) => p.icc);
    const co = ICC_PRESETS.filter((p) => p.conditioning === 'conditional-on-pretest').map((p) => p.icc);
    expect(Math.max(...co)).toBeLessThan(Math.min(...un));
  });
});

describe('validation of the clusters section', () => {
  const problems = (plan: unknown) => {
    const c = validatePlan(plan);
    return c.ok ? [] : c.problems;
  };
  it('accepts the invented plan', () => {
    expect(validatePlan(clusterPlan()).ok).toBe(true);
  });
  it('pool sizes must be whole numbers of clusters, at least 2 per group', () => {
    const p = clusterPlan();
    p.groups.programme.poolSize = 510;
    const out = problems(p);
    expect(out[0]?.field).toBe('groups.programme.poolSize');
    expect(out[0]?.message).toContain('whole number of clusters of 25; got 510 (500 or 525 would do)');
    const q = clusterPlan({ clustersP: 1 });
    expect(problems(q)[0]?.message).toContain('needs at least 2 clusters');
  });
  it('says plainly what clusters cannot yet be combined with', () => {
    const p = clusterPlan() as unknown as Record<string, unknown>;
    const withCov = { ...p, covariates: [{ name: 'Attendance', programmeMean: 1, comparisonMean: 1, sd: 1, reliability: 1, outcomeCorrelation: 0.1, measured: true, exact: false }], covariateCorrelations: [[1, 0], [0, 1]] };
    expect(problems(withCov).some((x) => x.field === 'covariates' && x.message.includes('Covariates cannot yet be combined with clusters'))).toBe(true);
    const withDistance = clusterPlan();
    withDistance.matching.distance = 'propensity';
    expect(problems(withDistance).some((x) => x.field === 'matching.distance' && x.message.includes('With clusters'))).toBe(true);
    const withRule = { ...clusterPlan(), assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 90, side: 'below' }, population: { label: 'All', poolSize: 2000, pretestMean: 100, pretestSD: 15 } };
    expect(problems(withRule).some((x) => x.field === 'clusters' && x.message.includes('cannot yet be combined with a selection rule'))).toBe(true);
  });
  it('matching people needs the same people; matching clusters needs clusters', () => {
    const p = clusterPlan({ level: 'people', cohort: 'new' });
    expect(problems(p)[0]?.field).toBe('matching.level');
    expect(problems(p)[0]?.message).toContain('new cohort');
    const q = demoPlan();
    q.matching.level = 'clusters';
    expect(problems(q)[0]?.message).toContain('Matching clusters needs a clusters section');
  });
  it('ICCs that contradict the reliability or the slope are refused with the limit', () => {
    const p = clusterPlan({ icc: 0.85 });
    expect(problems(p)[0]?.field).toBe('clusters.pretestICC');
    expect(problems(p)[0]?.message).toContain('smaller than the');
    // Slope 1 carries τ² = 45 into the posttest: the posttest ICC must be at least 45/225 = .2.
    const q = clusterPlan({ posttestICC: 0.1 });
    expect(problems(q)[0]?.field).toBe('clusters.posttestICC');
    expect(problems(q)[0]?.message).toContain('at least 0.2');
    const r = clusterPlan() as unknown as { clusters: Record<string, unknown> };
    r.clusters.size = 1;
    expect(problems(r)[0]?.message).toContain('Cluster size must be a whole number from 2 to 10000; got 1.');
  });
});

describe('sensitivity curves for clusters', () => {
  it('the pretest-gap curve re-runs the clusters model: no artefact at no gap, the plan\u2019s own figure at its gap', async () => {
    const { sensitivityCurve } = await import('../../src/core/sensitivityCurve');
    const plan = clusterPlan({ effect: 3 });
    const curve = sensitivityCurve(plan, 'pretestGap', 41);
    const mid = curve.points[20]!; // the grid is symmetric about the gap −8 (± max(8, 15)): x = −8 at the middle
    expect(mid.x).toBeCloseTo(-8, 10);
    expect(mid.bias.matchedDifference).toBeCloseTo(analysePlan(plan).clusters?.matchedClusterArtefact as number, 10);
    const zero = sensitivityCurve({ ...plan, groups: { ...plan.groups, programme: { ...plan.groups.programme, pretestMean: 100 } } }, 'pretestGap', 41);
    expect(zero.points[20]!.bias.matchedDifference).toBeCloseTo(0, 10);
    expect(Object.keys(mid.bias).sort()).toEqual(['ancova', 'gainScore', 'matchedDifference', 'personLevelAncova']);
  });
});
