import { describe, expect, it } from 'vitest';
import * as d3 from 'd3';
import { groupsPretestChartData as pretestChartData } from '../../src/charts/pretestChartData';
import { closedFormInput, simulatedInput } from './fixtures';
import { groupsPretestChartData } from '../../src/charts/pretestChartData';
import { analysePlan } from '../../src/core/analysePlan';
import { SCHOOLS_MATCHED_ON_MEANS } from '../../src/io/examplePlans';
import { simulatePlan } from '../../src/sim/simulatePlan';

describe('pretestChartData', () => {
  it('closed form: matched true-score means are mu_g + rho_g (xbar - mu_g) at the programme mean', () => {
    // Kelley 1947: E[T | X = x] = mu_g + rho_g (x - mu_g); exact matching puts both matched groups at mu_P.
    // Demo plan by hand: 44 and 54 + .75 (44 - 54) = 46.5, hidden gap -2.5 (Thorndike 1942 form (1 - rho) Delta).
    // Tolerance 1e-9: exact arithmetic, floating-point rounding only.
    const input = closedFormInput();
    const d = pretestChartData(input);
    const m = input.analytic.model;
    for (const g of ['programme', 'comparison'] as const) {
      const expected = m.mean[g] + m.reliability[g] * (d.kelley.observed[g] - m.mean[g]);
      expect(d.kelley.trueScore[g]).toBeCloseTo(expected, 9);
    }
    expect(d.kelley.observed.comparison).toBeCloseTo(44, 9);
    expect(d.kelley.trueScore.comparison).toBeCloseTo(46.5, 9);
    expect(d.kelley.hiddenGap).toBeCloseTo(-2.5, 9);
    expect(d.kelley.source).toBe('closed-form');
    expect(d.example).toBeNull();
  });

  it('density curves hold 99.95% of each group within the drawn range (+/- 3.5 SD)', () => {
    // Common practice: P(|Z| < 3.5) = 0.999535. Trapezoid rule over 121 points: tolerance 0.002
    // (trapezoid error at this spacing is below 1e-4; the range edge differs per group, up to 3.5 SD or more).
    const d = pretestChartData(closedFormInput());
    for (const g of ['programme', 'comparison'] as const) {
      const pts = d.groups[g].points;
      let area = 0;
      for (let i = 1; i < pts.length; i++) area += ((pts[i]!.x - pts[i - 1]!.x) * (pts[i]!.density + pts[i - 1]!.density)) / 2;
      expect(area).toBeGreaterThan(0.9995 - 0.002);
      expect(area).toBeLessThanOrEqual(1 + 1e-9);
    }
  });

  it('closed-form matched region contains the programme mean and lies inside the drawn range', () => {
    // Common practice: with 1200 comparison members the supply of partners reaches well below the
    // programme mean (44); the upper end is set by the programme pool thinning out (REFERENCES.md caliper unit).
    const d = pretestChartData(closedFormInput());
    expect(d.region?.source).toBe('closed-form');
    expect(d.region!.lower).toBeLessThan(44);
    expect(d.region!.upper).toBeGreaterThan(44);
    expect(d.region!.lower).toBeGreaterThan(d.xDomain[0]);
  });

  it("with a simulation: Kelley's expectation at the example's matched means agrees with the example's true means", () => {
    const input = simulatedInput();
    const d = pretestChartData(input);
    const pairs = input.simulation.example.pairs;
    // Means recomputed with the independent d3-array library (partners averaged within sets; Stuart 2010).
    const obsP = d3.mean(pairs, (p) => p.programme.observed)!;
    const obsC = d3.mean(pairs, (p) => d3.mean(p.comparison, (c) => c.observed)!)!;
    expect(d.kelley.observed.programme).toBeCloseTo(obsP, 9);
    expect(d.kelley.observed.comparison).toBeCloseTo(obsC, 9);
    const m = input.analytic.model;
    for (const g of ['programme', 'comparison'] as const) {
      // Kelley 1947 at the example's own observed means.
      expect(d.kelley.trueScore[g]).toBeCloseTo(m.mean[g] + m.reliability[g] * (d.kelley.observed[g] - m.mean[g]), 9);
      // One example study: its true-score mean scatters around Kelley's expectation with SE
      // sqrt(trueVar (1 - rho) / n) (residual SD of T given X; Lord & Novick 1968). Tolerance 4 SE
      // (two-sided chance of failing about 6e-5 per check for a correct engine).
      const n = g === 'programme' ? pairs.length : d.example!.comparison.length;
      const se = Math.sqrt((m.trueSD[g] ** 2 * (1 - m.reliability[g])) / n);
      expect(Math.abs(d.example!.means.trueScore[g] - d.kelley.trueScore[g])).toBeLessThan(4 * se);
    }
    // The hidden gap survives matching: the comparison's true mean sits above the programme's.
    expect(d.example!.means.trueScore.comparison).toBeGreaterThan(d.example!.means.trueScore.programme);
    const ext = d3.extent(pairs, (p) => p.programme.observed) as [number, number];
    expect(d.region).toEqual({ lower: ext[0], upper: ext[1], source: 'example' });
    expect(d.example!.programme).toHaveLength(pairs.length);
  });

  it('is deterministic (same input, same data)', () => {
    expect(pretestChartData(simulatedInput())).toEqual(pretestChartData(simulatedInput()));
  });
});

describe('pretest chart of clusters matched on their means (invented schools example)', () => {
  it('draws the cluster means: SD and reliability are those of a cluster mean, and the hidden gap is Thorndike’s (1 − λ)Δ', () => {
    const plan = structuredClone(SCHOOLS_MATCHED_ON_MEANS);
    const data = groupsPretestChartData({ plan, analytic: analysePlan(plan), simulation: null });
    expect(data.units).toBe('clusters');
    // Var of an observed cluster mean = ICC·SD² + (1 − ICC)·SD²/n = 45 + 180/25 = 52.2 (common practice); SD 7.225.
    expect(data.groups.comparison.observedSD).toBeCloseTo(Math.sqrt(52.2), 10);
    // λ = ICC(2) = 25 × .2 / (1 + 24 × .2) = 5/5.8 (Bliese 2000), new cohort.
    expect(data.groups.comparison.reliability).toBeCloseTo(5 / 5.8, 10);
    // Exact matching on the observed mean leaves (1 − λ)Δ of the true gap, Δ = −8 (Thorndike 1942 at cluster level): −1.103.
    expect(data.kelley.hiddenGap).toBeCloseTo((1 - 5 / 5.8) * -8, 10);
    expect(data.xLabel).toMatch(/mean of a cluster/);
  });

  it('with a seeded simulation, one mark per matched school from the example replication', () => {
    const plan = structuredClone(SCHOOLS_MATCHED_ON_MEANS);
    const simulation = simulatePlan(plan, { replications: 20, seed: 3 });
    const data = groupsPretestChartData({ plan, analytic: analysePlan(plan), simulation });
    expect(data.example?.programme.length).toBe(simulation.example.pairs.length);
    // At most the 30 programme schools (ratio 1): marks are schools, not pupils.
    expect(data.example!.programme.length).toBeLessThanOrEqual(30);
    expect(data.example!.programme.length + data.example!.discarded).toBe(30);
  });
});
