import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { TWO_GROUP_ANALYSIS_IDS, type Plan } from '../../src/core/plan';
import { sensitivityCurve } from '../../src/core/sensitivityCurve';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { demoPlan } from '../../src/io/demoPlan';

/** The demo plan plus one covariate that changes nothing: no gap, uncorrelated with the pretest and the outcome. */
function demoWithNeutralCovariate(): Plan {
  const plan = demoPlan();
  plan.covariates = [
    { name: 'Neutral', programmeMean: 5, comparisonMean: 5, sd: 2, reliability: 0.8, outcomeCorrelation: 0, measured: true, exact: false },
  ];
  plan.covariateCorrelations = [
    [1, 0],
    [0, 1],
  ];
  return plan;
}

describe('sensitivity curves for plans with covariates (several-covariate closed form)', () => {
  it('a neutral covariate gives the one-pretest curves, for reliability and for the pretest gap (tolerance 1e-9)', () => {
    // Reference: the one-pretest closed forms (Lord 1960; Porter 1967), already checked against published values.
    for (const variable of ['reliability', 'pretestGap'] as const) {
      const one = sensitivityCurve(demoPlan(), variable);
      const several = sensitivityCurve(demoWithNeutralCovariate(), variable);
      expect(several.current).toBeCloseTo(one.current, 12);
      one.points.forEach((p, i) => {
        const q = several.points[i]!;
        expect(q.x).toBeCloseTo(p.x, 12);
        for (const id of TWO_GROUP_ANALYSIS_IDS) expect(Math.abs(q.bias[id]! - p.bias[id]!)).toBeLessThan(1e-9);
      });
      // Break-even points: interpolated on the 41-point grid vs exact; tolerance 0.01 on the x axis.
      expect(several.breakEvenX.length).toBe(one.breakEvenX.length);
      one.breakEvenX.forEach((x, i) => expect(Math.abs((several.breakEvenX[i] as number) - x)).toBeLessThan(0.01 * Math.max(1, Math.abs(x))));
    }
  });

  it('passes through the plan’s own closed-form bias at the plan’s reliability (tolerance 1e-9)', () => {
    const plan = structuredClone(AFTER_SCHOOL_MATHS);
    const results = analysePlan(plan);
    const curve = sensitivityCurve(plan, 'reliability', 1001);
    // The grid does not contain the plan's x exactly; interpolate linearly between the neighbours
    // (1001 points, spacing 0.0007: linear interpolation error of a smooth curve is far below 1e-3).
    const i = curve.points.findIndex((p) => p.x >= curve.current);
    const a = curve.points[i - 1]!;
    const b = curve.points[i]!;
    const f = (curve.current - a.x) / (b.x - a.x);
    for (const id of TWO_GROUP_ANALYSIS_IDS) {
      const interpolated = a.bias[id]! + f * (b.bias[id]! - a.bias[id]!);
      expect(Math.abs(interpolated - results.analyses[id]!.bias)).toBeLessThan(1e-3);
    }
    const gapCurve = sensitivityCurve(plan, 'pretestGap', 41);
    const mid = gapCurve.points[20]!; // the grid is centred on the plan's gap
    expect(mid.x).toBeCloseTo(gapCurve.current, 9);
    for (const id of TWO_GROUP_ANALYSIS_IDS) expect(Math.abs(mid.bias[id]! - results.analyses[id]!.bias)).toBeLessThan(1e-9);
  });
});
