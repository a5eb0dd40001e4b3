// @vitest-environment jsdom
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import type { Plan } from '../../src/core/plan';
import { pretestChartData } from '../../src/charts/pretestChartData';
import { estimatesChartData } from '../../src/charts/estimatesChartData';
import { sensitivityChartData } from '../../src/charts/sensitivityChartData';
import { balanceChartData } from '../../src/charts/balanceChartData';
import { renderChartToSvgString } from '../../src/charts/renderChartToSvgString';

const variants: [string, (p: Plan) => void][] = [
  ['no hoped-for effect', (p) => (p.outcome.hypothesisedEffect = 0)],
  ['no pretest gap', (p) => (p.groups.programme.pretestMean = p.groups.comparison.pretestMean)],
  ['programme above comparison, effect in SD units', (p) => {
    p.groups.programme.pretestMean = 64;
    p.outcome.effectScale = 'sd';
    p.outcome.hypothesisedEffect = 0.3;
  }],
  ['groups 6 SDs apart, caliper 0.05: the matched difference is not feasible (no SE, so no range)', (p) => {
    p.groups.programme.pretestMean = 20;
    p.groups.comparison.pretestMean = 80;
    p.matching.caliper = 0.05;
  }],
  ['1:3 matching with replacement, tiny comparison pool', (p) => {
    p.matching = { ...p.matching, ratio: 3, replacement: true };
    p.groups.comparison.poolSize = 20;
  }],
];

describe('charts on unusual plans (closed form)', () => {
  for (const [label, change] of variants) {
    it(`${label}: every chart renders finite numbers only`, () => {
      const plan = demoPlan();
      change(plan);
      const input = { plan, analytic: analysePlan(plan), simulation: null };
      const svgs = [
        renderChartToSvgString('pretest', pretestChartData(input), { width: 640, height: 420 }),
        renderChartToSvgString('estimates', estimatesChartData(input), { width: 640, height: 420 }),
        renderChartToSvgString('sensitivity', sensitivityChartData(input, 'reliability'), { width: 640, height: 420 }),
        renderChartToSvgString('sensitivity', sensitivityChartData(input, 'pretestGap'), { width: 640, height: 420 }),
        renderChartToSvgString('balance', balanceChartData(input), { width: 640, height: 300 }),
      ];
      for (const s of svgs) {
        expect(s).toMatch(/^<svg/);
        expect(s).not.toMatch(/NaN|Infinity|undefined/);
      }
    });
  }

  it('no pretest gap: no hidden imbalance, so balance before and after are 0 (Kelley 1947)', () => {
    // With equal group means, E[T | X] for both groups is the same line: no artefact. Tolerance 1e-12.
    const plan = demoPlan();
    plan.groups.programme.pretestMean = plan.groups.comparison.pretestMean;
    const d = balanceChartData({ plan, analytic: analysePlan(plan), simulation: null });
    for (const r of d.rows) {
      expect(Math.abs(r.before)).toBeLessThan(1e-12);
      expect(Math.abs(r.after)).toBeLessThan(1e-12);
    }
  });
});
