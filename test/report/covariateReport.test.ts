// @vitest-environment jsdom
// The covariate parts of the PDF summary, read back with pdfjs-dist (an
// independent PDF reader). Figures are compared as exact strings: the PDF
// must show what analysePlan / simulatePlan return, through the shared
// formatters (tolerance: none, formatting is deterministic).
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { parsePlanText } from '../../src/io/planFile';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { planTextFromReportText } from '../../src/report/planJsonBlock';
import { formatPoints, formatSD, formatShare, formatSignedPoints, withMcse } from '../../src/report/format';
import { reportCharts } from '../../src/report/reportCharts';
import { covariateInputTable, correlationMatrixTable, unmeasuredPartText } from '../../src/report/reportCovariates';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { inventedCovariatePlan } from '../inventedCovariatePlan';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText, type PdfText } from './readPdfText';

const GENERATED = new Date('2026-12-02T10:00:00Z');

/** The shared invented plan (a measured covariate and a confounder never measured, Mahalanobis distance), titled for this test. */
function covariatePlan(): Plan {
  return {
    ...inventedCovariatePlan(),
    title: 'Invented example for the report test: two covariates, one never measured',
    simulation: { replications: 200, seed: 424242 },
  };
}

function flat(text: PdfText): string {
  return text.body.join(' ').replace(/\s+/g, ' ');
}

describe('PDF summary of a plan with covariates, with a simulation', () => {
  let plan: Plan;
  let sim: SimulationResult;
  let text: PdfText;
  let all: string;

  beforeAll(async () => {
    plan = covariatePlan();
    const analytic = analysePlan(plan);
    sim = simulatePlan(plan, { replications: plan.simulation.replications, seed: plan.simulation.seed });
    const bytes = await buildReportPdf({
      plan,
      analytic,
      simulation: sim,
      charts: reportCharts(plan, analytic, sim),
      appVersion: '0.1.0',
      generatedAt: GENERATED,
      fonts: TEST_FONTS,
    });
    text = await readPdfText(bytes);
    all = flat(text);
  }, 60_000);

  it('lists the covariates as entered and their correlation matrix in the assumptions', () => {
    expect(all).toContain('Covariates besides the pretest');
    // Rows of the covariate table, as entered (no statistic computed).
    expect(all).toContain('1. Attendance 85 90 10 0.7 0.3 yes no');
    expect(all).toContain('2. Motivation −0.5 0 1 1 0.3 no no');
    expect(all).toContain('Observed correlations within a group (pretest first)');
    expect(all).toContain('Pretest 1 0.3 0.2');
    expect(all).toContain('1. Attendance 0.3 1 0.1');
    // The distance and the caliper's unit follow the plan.
    // (Table cells wrap, so only each cell's first line is matched.)
    expect(all).toContain('Matching distance the Mahalanobis distance');
    expect(all).toMatch(/Caliper 0\.2 Mahalanobis-/);
    expect(all).toContain('within a caliper of 0.2 Mahalanobis-distance units');
  });

  it('states the unmeasured part of the bias exactly as analysePlan gives it', () => {
    const u = analysePlan(plan).unmeasuredBias!;
    expect(u.covariates).toEqual(['Motivation']);
    expect(all).toContain('What was never measured');
    expect(all).toContain(
      `Not measured: Motivation. ${formatSignedPoints(u.points)} post-test points (${formatSD(u.sd)} post-test SD, ${formatShare(Math.abs(u.share!))} of the hoped-for effect) of the expected bias come from this confounder.`,
    );
  });

  it('prints the simulated balance per covariate with Monte Carlo SEs, and the per-covariate chart', () => {
    expect(all).toContain('Balance on each covariate (simulated)');
    const m = sim.balance!.find((b) => b.name === 'Motivation')!;
    const row = [
      'Motivation (not measured)',
      formatSD(m.observedSMDBefore),
      withMcse(formatSD(m.observedSMDAfter), m.observedSMDAfterMCSE, (x) => formatPoints(x)),
      withMcse(formatSD(m.trueSMDAfter), m.trueSMDAfterMCSE, (x) => formatPoints(x)),
    ].join(' ');
    expect(all).toContain(row);
    // The chart is drawn as vector text, with its caption; the pretest-only balance chart is not repeated.
    // Changed on purpose (our own look): the title names both lanes, and the drawn chart labels them.
    expect(all).toMatch(/Figure \d\. Balance on each covariate: as measured, and underneath on the true scores/);
    expect(all).toContain('as measured');
    expect(all).toContain('within 0.1 either way: looks balanced');
    expect(all).not.toContain('Balance: looks balanced on the observed pretest, is not on the true score');
  });

  it('carries the covariates, their matrix and the distance in the plan file printed at the end', () => {
    const recovered = planTextFromReportText(text.body.join('\n'));
    const check = parsePlanText(recovered ?? '');
    expect(check.ok).toBe(true);
    if (!check.ok) return;
    expect(check.plan.covariates).toEqual(plan.covariates);
    expect(check.plan.covariateCorrelations).toEqual(plan.covariateCorrelations);
    expect(check.plan.matching.distance).toBe('mahalanobis');
  });

  it('adds the covariate model and its caution', () => {
    expect(all).toContain('Σ_T = Σ_X − diag(SEM²)');
    expect(all).toContain('Confounders not listed at all (neither measured nor marked unmeasured) are not in these figures.');
    expect(text.all).not.toMatch(/NaN|Infinity|undefined|\[object/);
  });
});

describe('covariate parts of the report for a plan without covariates', () => {
  it('add nothing: no tables, no unmeasured paragraph', () => {
    const plan = demoPlan();
    expect(covariateInputTable(plan).rows).toEqual([]);
    expect(correlationMatrixTable(plan).rows).toEqual([]);
    expect(unmeasuredPartText(plan, analysePlan(plan))).toBeNull();
  });
});

describe('report charts for a plan with covariates', () => {
  it('draw balance per covariate from the closed form before a simulation, and never the pretest-only balance chart', () => {
    const plan = covariatePlan();
    const charts = reportCharts(plan, analysePlan(plan), null);
    expect(charts.map((c) => c.id)).toEqual(['pretest', 'estimates', 'sensitivity', 'covariateBalance']);
    const balance = charts[3]!;
    expect(balance.svg).toContain('Closed form: exact matching from an unlimited comparison pool');
    expect(balance.caption).toContain('Not measured, so matching cannot reach it: Motivation');
  });
});
