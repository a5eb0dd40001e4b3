import { describe, expect, it } from 'vitest';
import stdNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdTQuantile from '@stdlib/stats-base-dists-t-quantile';
import { analysePlan } from '../../src/core/analysePlan';
import { BIASED_REQUIRED_N_NOTE } from '../../src/core/analyticAnalysisRecord';
import { judgeTolerable } from '../../src/core/judgeTolerable';
import { growthGapNote } from '../../src/core/artefactParts';
import { requiredNCounts } from '../../src/core/requiredNCounts';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { noncentralTByIntegration } from './noncentralTByIntegration';

/** The invented demo with some fields changed. */
function demoWith(change: (p: Plan) => void): Plan {
  const p = demoPlan();
  change(p);
  return p;
}

/** Two-sided power of a t test from the noncentral t by integration (independent of the project's jStat path). */
function powerByIntegration(mean: number, se: number, df: number, alpha: number): number {
  const c = stdTQuantile(1 - alpha / 2, df);
  const d = mean / se;
  return 1 - noncentralTByIntegration(c, df, d) + noncentralTByIntegration(-c, df, d);
}

describe('a growth gap is reported apart and cannot make the verdict tolerable', () => {
  // Regression artefact of matching on a fallible pretest: beta·(1 − rho)·Delta
  // (Thorndike 1942; Lord 1960; common practice). Demo: beta = 0.8 (r = .6, SDs 10 and
  // 10 divided by rho = .75), rho = .75, Delta = −10 → −2.00 points.
  const plan = demoWith((p) => {
    p.outcome.growthGap = 1.5;
  });
  const r = analysePlan(plan);
  const m = r.analyses.matchedDifference!;

  it('keeps the regression artefact (−2.00, 80% of the effect) and the growth gap (+1.50, 60%) as separate parts', () => {
    expect(m.regressionArtefact).toBeCloseTo(0.8 * (1 - 0.75) * -10, 10);
    expect(m.regressionArtefactShare).toBeCloseTo(-0.8, 10);
    expect(m.growthGap).toBe(1.5);
    expect(m.growthGapShare).toBeCloseTo(0.6, 12);
    // The net shift is their sum, as before.
    expect(m.bias).toBeCloseTo(-0.5, 10);
  });

  it('is not tolerable: the verdict is judged on the regression artefact alone', () => {
    expect(m.verdict).not.toBe('negligible');
    expect(m.verdict).toBe('hides');
    expect(m.tolerability.tolerable).toBe(false);
    expect(m.tolerability.failed).toContain('artefact');
    expect(m.tolerability.reason).toMatch(/^Not tolerable \(artefact too large/);
  });

  it('says plainly that the assumed growth gap offsets the artefact', () => {
    expect(m.growthGapNote).toMatch(/growth gap you assumed \(1\.50 points\) offsets most of the regression artefact \(−2\.00 points\)/);
    expect(m.growthGapNote).toMatch(/net shift of −0\.50 points/);
    // Same-sign growth gap, or none: no offset sentence.
    expect(growthGapNote(-2, -1, -3)).toBeNull();
    expect(growthGapNote(-2, 0, -2)).toBeNull();
  });

  it('gives no required n for the biased matched difference', () => {
    expect(m.requiredNPerGroup).toBeNull();
    expect(m.requiredNNote).toBe(BIASED_REQUIRED_N_NOTE);
  });
});

describe('tolerable needs the error rates too', () => {
  // Demo at reliability .95: the artefact is a small share of the effect, yet power falls by more than 10 points.
  const r = analysePlan(demoWith((p) => {
    p.pretest = { reliability: 0.95, referenceSD: 10 };
    p.analysis.assumedReliability = 0.95;
  }));
  const m = r.analyses.matchedDifference!;

  it('the demo at reliability .95 is not tolerable, and says power fell too far', () => {
    const share = Math.abs(m.regressionArtefactShare!);
    expect(share).toBeLessThanOrEqual(0.25); // the artefact alone would pass
    expect(m.tolerability.artefactWithinShare).toBe(true);
    // Power with and without the artefact from an independent noncentral t (Cohen 1988, ch. 2).
    const p1 = powerByIntegration(m.expectedEstimate, m.se!, m.df!, 0.05);
    const p0 = powerByIntegration(2.5, m.se!, m.df!, 0.05);
    expect(m.power).toBeCloseTo(p1, 4);
    expect(m.powerWithoutBias).toBeCloseTo(p0, 4);
    expect(p0 - p1).toBeGreaterThan(0.1);
    expect(m.tolerability.tolerable).toBe(false);
    expect(m.tolerability.failed).toContain('power-drop');
    expect(m.verdict).toBe('hides');
    expect(m.tolerability.reason).toMatch(/power falls too far/);
  });

  it('judgeTolerable applies each limit at its edge (project rule: FPR ≤ 1.5α, power drop ≤ 10 points)', () => {
    const base = { tau: 2, regressionArtefact: 0.2, tolerableShare: 0.25, alpha: 0.05, falsePositiveRate: 0.075, power: 0.7, powerWithoutBias: 0.8 };
    expect(judgeTolerable(base).tolerable).toBe(true);
    expect(judgeTolerable({ ...base, falsePositiveRate: 0.0751 }).failed).toEqual(['false-positive']);
    expect(judgeTolerable({ ...base, power: 0.699 }).failed).toEqual(['power-drop']);
    expect(judgeTolerable({ ...base, regressionArtefact: -0.51 }).failed).toEqual(['artefact']);
    // The invented tutoring figures of the report: 9.2% against 5% and 78% → 58%.
    const t = judgeTolerable({ ...base, falsePositiveRate: 0.092, power: 0.58, powerWithoutBias: 0.78 });
    expect(t.failed).toEqual(['false-positive', 'power-drop']);
    expect(t.reason).toContain('the false-positive rate is 9.2% (above 1.5 × α = 7.5%)');
    expect(t.reason).toContain('power falls from 78% to 58%');
    // Unknown error rates (not feasible): judged on the artefact, and said so.
    const u = judgeTolerable({ ...base, falsePositiveRate: null, power: null, powerWithoutBias: null });
    expect(u.tolerable).toBe(true);
    expect(u.falsePositiveWithinLimit).toBeNull();
    expect(u.reason).toMatch(/not known/);
  });
});

describe('required n only for analyses whose artefact is tolerable', () => {
  const r = analysePlan(demoPlan());

  it('gives none for the biased analyses of the demo', () => {
    for (const id of ['matchedDifference', 'ancova', 'gainScore'] as const) {
      const a = r.analyses[id]!;
      expect(Math.abs(a.regressionArtefactShare!)).toBeGreaterThan(0.25);
      expect(a.requiredNPerGroup).toBeNull();
      expect(a.requiredNNote).toBe('biased: more people do not help');
    }
  });

  it('gives it for the unbiased corrected ANCOVA, near the normal-approximation n (Cohen 1988, eq. 2.4.1 form)', () => {
    const a = r.analyses.correctedAncova!;
    expect(a.requiredNNote).toBeNull();
    expect(a.requiredNPerGroup).not.toBeNull();
    // n ≈ (z_.975 + z_.80)² · SE(n)²·n / tau², with SE at the planned sizes scaled to equal groups.
    const z = stdNormalQuantile(0.975, 0, 1) + stdNormalQuantile(0.8, 0, 1);
    // SE² ≈ σ²(1/180 + 1/1200) at the planned pools, so with n in each group SE² ≈ 2σ²/n.
    const sigma2 = a.se! ** 2 / (1 / 180 + 1 / 1200);
    const nApprox = (2 * sigma2 * z ** 2) / 2.5 ** 2;
    expect(a.requiredNPerGroup!).toBeGreaterThan(nApprox * 0.8);
    expect(a.requiredNPerGroup!).toBeLessThan(nApprox * 1.25);
  });

  it('changing the target power changes the required n', () => {
    const higher = analysePlan(demoWith((p) => { p.analysis.targetPower = 0.9; }));
    expect(higher.analyses.correctedAncova!.requiredNPerGroup!).toBeGreaterThan(r.analyses.correctedAncova!.requiredNPerGroup!);
  });

  it('says what "per group" counts when pools and ratio differ', () => {
    expect(r.requiredNCounts).toContain('not your pools of 180 and 1200');
    const two = requiredNCounts(demoWith((p) => { p.matching.ratio = 2; }));
    expect(two).toContain('2 comparison partners each');
  });
});

describe('one break-even scale in the text and the chart', () => {
  it('the sensitivity chart marks the break-even on the within-group scale the text uses, and says what it holds fixed', async () => {
    const { sensitivityCurve } = await import('../../src/core/sensitivityCurve');
    // A reference population wider than the groups, so the two scales would differ (.922 within vs higher in the reference).
    const plan = demoWith((p) => { p.pretest = { reliability: 0.8, referenceSD: 12 }; });
    const r = analysePlan(plan);
    const curve = sensitivityCurve(plan, 'reliability');
    expect(r.breakEven.reliability).not.toBeNull();
    expect(curve.breakEvenX).toHaveLength(1);
    expect(curve.breakEvenX[0]).toBeCloseTo(r.breakEven.reliability!, 12);
    expect(curve.current).toBeCloseTo(r.reliability.comparison, 12);
    expect(curve.xLabel).toBe('Within-group pretest reliability (comparison group)');
    expect(curve.holdsFixed).toMatch(/true scores.*stay fixed/);
    // At the break-even x the curve's matched-difference bias is at the band's edge: beta(1 − x)Delta = −share·tau
    // (Thorndike 1942; common practice), checked on a fine grid by interpolation.
    const fine = sensitivityCurve(plan, 'reliability', 1001);
    const i = fine.points.findIndex((p) => p.x >= curve.breakEvenX[0]!);
    const a = fine.points[i - 1]!;
    const b = fine.points[i]!;
    const t = (curve.breakEvenX[0]! - a.x) / (b.x - a.x);
    const biasAt = a.bias.matchedDifference! + t * (b.bias.matchedDifference! - a.bias.matchedDifference!);
    expect(Math.abs(biasAt)).toBeCloseTo(0.25 * 2.5, 3);
  });
});
