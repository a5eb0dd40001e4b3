// @vitest-environment jsdom
// Every chart (every sensitivity axis the design offers), for every built-in example plan (closed form) and the demo and the covariate
// example with a seeded simulation, at a phone's width, a laptop's, the PDF's and the widest
// drawn: no label's estimated box (test/charts/textExtent.ts; width = characters × font size
// × 0.55, 0.6 bold, from memory) leaves the SVG (1 px slack), and no two labels overlap by
// more than 1 px each way.
import { describe, expect, it } from 'vitest';
import { balanceChartData } from '../../src/charts/balanceChartData';
import { chartSize } from '../../src/charts/chartSize';
import type { ChartId, ChartInput } from '../../src/charts/chartTypes';
import { covariateBalanceChartData, hasCovariateBalance } from '../../src/charts/covariateBalanceChartData';
import { covariateBalanceChartSvgString } from '../../src/charts/covariateBalanceChartRender';
import { estimatesChartData } from '../../src/charts/estimatesChartData';
import { pretestChartData } from '../../src/charts/pretestChartData';
import { renderChartToSvgString } from '../../src/charts/renderChartToSvgString';
import { sensitivityChartData, sensitivityModes } from '../../src/charts/sensitivityChartData';
import { studyDesign } from '../../src/core/design/studyDesign';
import { analysePlan } from '../../src/core/analysePlan';
import { usesCovariateModel } from '../../src/core/multivariate/covariateModel';
import { EXAMPLE_PLANS } from '../../src/io/examplePlans';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { inventedCovariatePlan } from '../inventedCovariatePlan';
import { simulatedInput } from './fixtures';
import { clippedLabels, overlappingLabels } from './textExtent';

/** Widths: the 320 px floor (a phone), a narrow column, the PDF's 720 and the 900 px cap. */
const WIDTHS = [320, 440, 720, 900];

function svgs(input: ChartInput, width: number): [string, string][] {
  const out: [string, string][] = [];
  const draw = (id: ChartId, data: unknown) =>
    out.push([id, renderChartToSvgString(id, data as never, chartSize(id, data as never, width))]);
  draw('pretest', pretestChartData(input));
  draw('estimates', estimatesChartData(input));
  // Every axis the plan's design offers (reliability and the gap; or the cut-off and the screener's reliability).
  for (const mode of sensitivityModes(input.plan)) draw('sensitivity', sensitivityChartData(input, mode));
  if (usesCovariateModel(input.plan)) {
    if (hasCovariateBalance(input)) out.push(['covariateBalance', covariateBalanceChartSvgString(covariateBalanceChartData(input), width)]);
  } else if (studyDesign(input.plan).shape === 'two-groups') {
    draw('balance', balanceChartData(input));
  }
  return out;
}

function problems(input: ChartInput): string[] {
  const found: string[] = [];
  for (const width of WIDTHS) {
    for (const [id, text] of svgs(input, width)) {
      const svg = new DOMParser().parseFromString(text, 'image/svg+xml').documentElement;
      for (const p of clippedLabels(svg)) found.push(`${id} @${width}: clipped ${p}`);
      for (const p of overlappingLabels(svg)) found.push(`${id} @${width}: ${p}`);
    }
  }
  return found;
}

describe('chart labels stay inside the chart and apart', () => {
  for (const ex of EXAMPLE_PLANS) {
    it(`${ex.name}, closed form`, () => {
      const plan = structuredClone(ex.plan);
      expect(problems({ plan, analytic: analysePlan(plan), simulation: null })).toEqual([]);
    });
  }

  it('the demo with a seeded simulation', () => {
    expect(problems(simulatedInput())).toEqual([]);
  });

  it('the covariate example with a seeded simulation (120 replications)', () => {
    const ex = EXAMPLE_PLANS.find((e) => (e.plan.covariates?.length ?? 0) > 0)!;
    const plan = structuredClone(ex.plan);
    const simulation = simulatePlan(plan, { replications: 120, seed: 20260704 });
    expect(problems({ plan, analytic: analysePlan(plan), simulation })).toEqual([]);
  });

  it('the balance chart per covariate with every kind of row (looks balanced but is not, apart, unmeasured) and a spread flag', () => {
    const plan = inventedCovariatePlan({ distance: 'pretest' });
    const analytic = analysePlan(plan);
    // A variance ratio outside 0.5–2 adds a note line to its row; the note must fit too.
    const flagged = { ...analytic, covariateBalance: analytic.covariateBalance!.map((b, i) => (i === 1 ? { ...b, varianceRatioAfter: 2.31 } : b)) };
    expect(covariateBalanceChartData({ plan, analytic: flagged, simulation: null }).rows.map((r) => r.status)).toEqual(['hidden', 'apart', 'unmeasured']);
    expect(problems({ plan, analytic: flagged, simulation: null })).toEqual([]);
  });

  it('the schools example with a seeded simulation (one dot per school, 120 replications)', () => {
    const ex = EXAMPLE_PLANS.find((e) => e.plan.clusters !== undefined)!;
    const plan = structuredClone(ex.plan);
    const simulation = simulatePlan(plan, { replications: 120, seed: 20260704 });
    expect(simulation.example.pairs.length).toBeGreaterThan(0);
    expect(problems({ plan, analytic: analysePlan(plan), simulation })).toEqual([]);
  });
});
