// @vitest-environment jsdom
// The exports panel offers the balance chart under the id reportCharts draws it with, so "Balance
// after matching" as SVG/PNG works on plans with covariates (it used to ask for "balance", which
// such plans never draw, and failed with "the chart is not available").
import { describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { demoPlan } from '../../src/io/demoPlan';
import { reportCharts } from '../../src/report/reportCharts';
import { exportableBalanceChart } from '../../src/ui/exportableCharts';
import { simulatedInput } from '../charts/fixtures';

describe('the balance chart the exports panel offers can be drawn', () => {
  it('the invented covariate example, before any simulation: the chart per covariate', () => {
    const plan = structuredClone(AFTER_SCHOOL_MATHS);
    const analytic = analysePlan(plan);
    const offered = exportableBalanceChart(plan, analytic, null);
    expect(offered).toEqual([{ id: 'covariateBalance', name: 'Balance after matching' }]);
    const drawn = reportCharts(plan, analytic, null).find((c) => c.id === offered[0]!.id);
    expect(drawn?.svg).toMatch(/^<svg[^>]*xmlns="http:\/\/www.w3.org\/2000\/svg"/);
  });

  it('a plan without covariates: the pretest-only chart, once simulated', () => {
    const plan = demoPlan();
    expect(exportableBalanceChart(plan, analysePlan(plan), null)).toEqual([]);
    const { analytic, simulation } = simulatedInput();
    const offered = exportableBalanceChart(plan, analytic, simulation);
    expect(offered.map((c) => c.id)).toEqual(['balance']);
    expect(reportCharts(plan, analytic, simulation).find((c) => c.id === 'balance')?.svg).not.toBe('');
  });
});
