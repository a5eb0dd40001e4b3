// @vitest-environment jsdom
// The PDF summary, read back with pdfjs-dist (an independent PDF reader, not
// the library that wrote it). Figures are compared as exact strings: the PDF
// must show the very numbers analysePlan / simulatePlan return, formatted by
// the shared formatters the planner uses (tolerance: none, the formatting is
// deterministic).
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { TWO_GROUP_ANALYSIS_IDS, type Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { canonicalPlan, parsePlanText } from '../../src/io/planFile';
import { buildReportPdf, REPORT_HEADING, type ReportChart } from '../../src/report/buildReportPdf';
import {
  formatPoints,
  formatProbability,
  formatSignedPoints,
  withMcse,
} from '../../src/report/format';
import { planTextFromReportText } from '../../src/report/planJsonBlock';
import { reportCharts } from '../../src/report/reportCharts';
import { CAUTION_LINE } from '../../src/report/reportText';
import { simulatePlan } from '../../src/sim/simulatePlan';
import type { SimulationResult } from '../../src/sim/types';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText, type PdfText } from './readPdfText';
import { feasible } from '../sim/feasible';
import type { SimAnalysisSummary } from '../../src/sim/types';

const GENERATED = new Date('2026-12-01T09:30:00Z');
const MARKUP_TITLE = '<script>alert("x")</script> & <b>bold</b> trial';

/** A small vector chart with text in it, so its words can be found in the PDF (vector, not a picture). */
const CHART_SVG =
  '<svg xmlns="http://www.w3.org/2000/svg" width="600" height="300" viewBox="0 0 600 300">' +
  '<rect x="40" y="20" width="200" height="240" fill="#4a78b5"/>' +
  '<text x="300" y="290" font-family="sans-serif" font-size="12" text-anchor="middle">Observed pretest, ρ = 0.75 &lt;b&gt;</text>' +
  '<script>document.title = "ran"</script></svg>';
const CHARTS: ReportChart[] = [
  { id: 'pretest', title: 'Pretest in both groups', svg: CHART_SVG, caption: 'Each bar is one group’s pretest mean.' },
];

function flat(text: PdfText): string {
  return text.body.join(' ').replace(/\s+/g, ' ');
}

describe('PDF summary of the invented demo plan, with a simulation', () => {
  let plan: Plan;
  let sim: SimulationResult;
  let text: PdfText;
  let bytes: Uint8Array;
  let planner: ReportChart[];

  beforeAll(async () => {
    plan = demoPlan();
    // 300 replications keep the test quick; the figures only need to match the result object.
    plan.simulation.replications = 300;
    sim = simulatePlan(plan, { replications: plan.simulation.replications, seed: plan.simulation.seed });
    planner = reportCharts(plan, analysePlan(plan), sim);
    bytes = await buildReportPdf({
      plan,
      analytic: analysePlan(plan),
      simulation: sim,
      charts: [...CHARTS, ...planner],
      appVersion: '0.1.0',
      generatedAt: GENERATED,
      fonts: TEST_FONTS,
    });
    text = await readPdfText(bytes);
  });

  it('is a PDF with a title, the plan title, the date and a visible caution line', () => {
    expect(new TextDecoder().decode(bytes.slice(0, 5))).toBe('%PDF-');
    expect(text.body[0]).toBe(REPORT_HEADING);
    expect(flat(text)).toContain(plan.title);
    expect(flat(text)).toContain('Generated 1 December 2026, 09:30 UTC by Meanward 0.1.0.');
    expect(flat(text)).toContain(`Caution: ${CAUTION_LINE}`);
  });

  it('shows the closed-form figures exactly as analysePlan gives them', () => {
    const a = analysePlan(plan).analyses;
    const line = (values: string[]) => text.body.find((l) => l.includes(values.join(' ')));
    // Each row's four values appear side by side, in the planner's analysis order.
    expect(line(TWO_GROUP_ANALYSIS_IDS.map((id) => formatSignedPoints(a[id]!.expectedEstimate)))).toMatch(/^Expected estimate/);
    expect(line(TWO_GROUP_ANALYSIS_IDS.map((id) => formatSignedPoints(a[id]!.bias)))).toMatch(/^Expected bias \(points\)/);
    expect(line(TWO_GROUP_ANALYSIS_IDS.map((id) => formatProbability(a[id]!.power)))).toMatch(/^Power /);
    expect(line(TWO_GROUP_ANALYSIS_IDS.map((id) => formatProbability(a[id]!.falsePositiveRate)))).toBeDefined();
    // The matched-difference bias of the demo plan is the textbook artefact: beta (1 - rho) Delta
    // (Thorndike 1942; Campbell & Erlebacher 1970; computed), so it is negative here (programme starts lower).
    expect(a.matchedDifference!.bias).toBeLessThan(0);
    expect(flat(text)).toContain(`a regression-toward-the-mean artefact of ${formatSignedPoints(a.matchedDifference!.regressionArtefact)} points`);
    // Core's tolerability reason and the biased analysis' note are in the summary.
    expect(flat(text)).toContain(a.matchedDifference!.tolerability.reason);
    expect(flat(text)).toContain('power: biased: more people do not help.');
  });

  it('shows the simulated figures exactly as simulatePlan gives them, with their Monte Carlo SEs', () => {
    const row = (f: (s: SimAnalysisSummary) => string) => [
      ...TWO_GROUP_ANALYSIS_IDS.map((id) => f(feasible(sim.analyses[id]!))),
      f(feasible(sim.ancovaMatchedSample)),
    ];
    const find = (values: string[]) => text.body.find((l) => l.includes(values.join(' ')));
    expect(find(row((s) => withMcse(formatSignedPoints(s.bias), s.biasMCSE, (x) => formatPoints(x))))).toMatch(/^Simulated bias/);
    expect(find(row((s) => withMcse(formatPoints(s.rmse), s.rmseMCSE, (x) => formatPoints(x))))).toMatch(/^RMSE/);
    expect(find(row((s) => withMcse(formatProbability(s.coverage), s.coverageMCSE, formatProbability)))).toMatch(/coverage/);
    expect(find(row((s) => withMcse(formatProbability(s.rejectionRate), s.rejectionRateMCSE, formatProbability)))).toMatch(/^Power/);
    expect(find(row((s) => withMcse(formatProbability(s.wrongSignRate), s.wrongSignRateMCSE, formatProbability)))).toMatch(/^Wrong-sign/);
    // Balance after matching: the hidden true-score gap is printed as simulated.
    const m = sim.matching;
    expect(flat(text)).toContain(withMcse(formatSignedPoints(m.trueDifferenceAfter), m.trueDifferenceAfterMCSE, (x) => formatPoints(x)));
    expect(flat(text)).toContain(withMcse(formatSignedPoints(m.observedDifferenceAfter), m.observedDifferenceAfterMCSE, (x) => formatPoints(x)));
    expect(flat(text)).not.toContain('No simulation has been run');
  });

  it('lists every input with its unit and source, and the ranked remedies with their assumptions', () => {
    const all = flat(text);
    expect(all).toContain('Inputs and where they came from');
    expect(all).toMatch(/Programme group: people available 180 people example/);
    expect(all).toMatch(/Pretest reliability \(as published\) 0\.75 coefficient, 0–1 example/);
    const remedies = analysePlan(plan).remedies;
    expect(remedies.length).toBeGreaterThan(0);
    for (const r of remedies) {
      expect(all).toContain(r.title);
      expect(all).toContain(`Assumes: ${r.assumption}`.replace(/\s+/g, ' '));
    }
  });

  it('draws the chart as vector text and drops its script', () => {
    const all = flat(text);
    expect(all).toContain('Pretest in both groups');
    // Chart words are PDF text (svg2pdf), with the Greek letter from the embedded font.
    expect(all).toContain('Observed pretest, ρ = 0.75 <b>');
    expect(all).toContain('Figure 1. Pretest in both groups');
    expect(all).toContain('How to read it: Each bar is one group’s pretest mean.');
  });

  it('includes the planner’s four charts with their titles and reading guides', () => {
    const all = flat(text);
    expect(planner.map((c) => c.id)).toEqual(['pretest', 'estimates', 'sensitivity', 'balance']);
    planner.forEach((c, i) => {
      expect(c.svg).not.toBe('');
      expect(all).toContain(`Figure ${i + 2}. ${c.title}`.replace(/\s+/g, ' '));
    });
  });

  it('gives the model, the references and the cautions', () => {
    const all = flat(text);
    expect(all).toContain('How this was computed');
    expect(all).toContain('X = T + E');
    // Sources named in REFERENCES.md (author, year).
    for (const ref of [
      'Thorndike, R. L. (1942)',
      'Campbell, D. T., & Erlebacher, A. (1970)',
      'Cochran, W. G., & Rubin, D. B. (1973)',
      'Porter, A. C. (1967)',
      'Cohen, J. (1988)',
      'Lord, F. M. (1960)',
      'Kelley, T. L. (1947)',
      'Spearman, C. (1910)',
      'Brown, W. (1910)',
    ]) {
      expect(all).toContain(ref);
    }
    expect(all).toContain('not a substitute for a statistician’s review, an ethics board’s judgement');
    for (const omitted of ['non-normal', 'non-linear relations', 'attrition', 'clustering', 'confounder not listed in the plan']) {
      expect(all).toContain(omitted);
    }
  });

  it('records version, seed and replications, and the plan file round-trips through the PDF text', () => {
    const all = flat(text);
    expect(all).toContain('Meanward version 0.1.0');
    expect(all).toContain(`Random seed ${sim.seed}`);
    expect(all).toContain('Replications 300');
    const recovered = planTextFromReportText(text.body.join('\n'));
    expect(recovered).not.toBeNull();
    const check = parsePlanText(recovered ?? '');
    expect(check.ok).toBe(true);
    if (check.ok) expect(canonicalPlan(check.plan)).toEqual(canonicalPlan(plan));
  });

  it('numbers every page "Page n of N" and keeps all text inside the page', () => {
    expect(text.pages).toBeGreaterThan(2);
    text.footers.forEach((f, i) => expect(f.join(' ')).toContain(`Page ${i + 1} of ${text.pages}`));
    // Every text item lies within the page with at least 30 pt to spare (A4, margins 54 pt).
    for (const it of text.items) {
      const size = text.sizes[it.page - 1]!;
      expect(it.x).toBeGreaterThanOrEqual(30);
      expect(it.x + it.width).toBeLessThanOrEqual(size.width - 30);
      expect(it.y).toBeGreaterThan(20);
      expect(it.y).toBeLessThan(size.height - 30);
    }
  });

  it('never prints NaN, Infinity or undefined', () => {
    expect(text.all).not.toMatch(/NaN|Infinity|undefined|\[object/);
  });
});

describe('PDF summary without a simulation, with markup in user text and a long title', () => {
  let plan: Plan;
  let text: PdfText;

  beforeAll(async () => {
    plan = demoPlan();
    // A 200-character title (the plan file's limit) with markup and no spaces in its tail, so
    // the plan file's title line must be cut and rejoined.
    plan.title = `${MARKUP_TITLE} ${'x'.repeat(200 - MARKUP_TITLE.length - 1)}`;
    plan.groups.programme.label = '=HYPERLINK("http://example.invalid") <img src=x onerror=alert(1)>';
    text = await readPdfText(
      await buildReportPdf({ plan, analytic: analysePlan(plan), simulation: null, charts: [], appVersion: '9.9.9', generatedAt: GENERATED, fonts: TEST_FONTS }),
    );
  });

  it('shows user text verbatim, as text', () => {
    const all = flat(text);
    expect(all).toContain(MARKUP_TITLE);
    expect(all).toContain('=HYPERLINK("http://example.invalid") <img src=x onerror=alert(1)>');
  });

  it('says there is no simulation yet and shows the analytic figures only', () => {
    const all = flat(text);
    expect(all).toContain('No simulation has been run for this plan yet');
    expect(all).not.toContain('Simulated bias');
    expect(all).toContain(`Random seed ${plan.simulation.seed} (simulation not yet run)`);
    const a = analysePlan(plan).analyses;
    expect(text.body.some((l) => l.includes(TWO_GROUP_ANALYSIS_IDS.map((id) => formatSignedPoints(a[id]!.bias)).join(' ')))).toBe(true);
  });

  it('round-trips the plan file even when its lines had to be cut', () => {
    expect(text.body.some((l) => l.endsWith('\u21B5'))).toBe(true);
    const check = parsePlanText(planTextFromReportText(text.body.join('\n')) ?? '');
    expect(check.ok).toBe(true);
    if (check.ok) expect(check.plan.title).toBe(plan.title);
    if (check.ok) expect(canonicalPlan(check.plan)).toEqual(canonicalPlan(plan));
  });

  it('keeps every line of the long title inside the page', () => {
    for (const it of text.items) {
      expect(it.x + it.width).toBeLessThanOrEqual(text.sizes[it.page - 1]!.width - 30);
    }
  });
});

describe('PDF summary with a simulation run for another plan', () => {
  it('leaves the stale simulation out and says why', async () => {
    const plan = demoPlan();
    const other = demoPlan();
    other.matching.caliper = 0.5;
    const sim = simulatePlan(other, { replications: 50, seed: 7 });
    const text = await readPdfText(
      await buildReportPdf({ plan, analytic: analysePlan(plan), simulation: sim, charts: [], appVersion: '0.1.0', generatedAt: GENERATED, fonts: TEST_FONTS }),
    );
    expect(flat(text)).toContain('was run for a different version of this plan');
    expect(flat(text)).not.toContain('Simulated bias');
  });
});

describe('PDF summary of a plan with values from a pilot file', () => {
  it('shows "pilot data" and the pilot note in the assumptions table', async () => {
    const plan = demoPlan();
    plan.pretest.reliability = 0.81;
    plan.provenance = {
      'pretest.reliability': {
        source: 'pilot',
        note: 'from pilot file wave1.csv (invented), alpha = .81 (95% CI .76–.85), n = 212',
        interval: { lower: 0.76, upper: 0.85, level: 0.95 },
      },
    };
    const text = await readPdfText(
      await buildReportPdf({ plan, analytic: analysePlan(plan), simulation: null, charts: [], appVersion: '0.1.0', generatedAt: GENERATED, fonts: TEST_FONTS }),
    );
    const all = flat(text);
    expect(all).toMatch(/Pretest reliability 0\.81 coefficient, 0–1 pilot data/);
    expect(all).toContain('from pilot file wave1.csv (invented), alpha = .81 (95% CI .76–.85), n = 212');
    expect(all).not.toContain('Pretest reliability (as published)');
  });
});

describe('PDF summary of a plan whose matching nobody survives (invented: groups 6 SDs apart, caliper 0.05)', () => {
  it('says the matched difference is not feasible and gives its reason instead of power', async () => {
    const plan = demoPlan();
    plan.groups.programme.pretestMean = 20;
    plan.groups.comparison.pretestMean = 80;
    plan.matching.caliper = 0.05;
    const analytic = analysePlan(plan);
    const text = await readPdfText(
      await buildReportPdf({ plan, analytic, simulation: null, charts: reportCharts(plan, analytic, null), appVersion: '0.1.0', generatedAt: GENERATED, fonts: TEST_FONTS }),
    );
    const all = flat(text);
    expect(all).toContain('not feasible');
    expect(all).toContain(`${analytic.analyses.matchedDifference!.name}, not feasible: About 0.3 of the 180 programme members`);
  });
});

describe('PDF summary when nobody can be matched', () => {
  it('prints "not computed" and the reason for the matched analyses, and the other analyses as usual', async () => {
    // No numbers checked: the report must carry the engine's reason instead of figures (docs/simulation.md).
    const plan = demoPlan();
    plan.matching.caliper = 0.0001;
    plan.groups.comparison.pretestMean = 150; // 10 SD away: no one is ever matched
    const sim = simulatePlan(plan, { replications: 20, seed: 1 });
    const analytic = analysePlan(plan);
    const bytes = await buildReportPdf({
      plan,
      analytic,
      simulation: sim,
      charts: reportCharts(plan, analytic, sim),
      appVersion: '0.1.0',
      generatedAt: GENERATED,
      fonts: TEST_FONTS,
    });
    const all = flat(await readPdfText(bytes));
    expect(all).toContain('not computed');
    expect(all).toMatch(/could be computed in only 0 of 20 simulated studies/);
    const ancova = feasible(sim.analyses.ancova!);
    expect(all).toContain(withMcse(formatSignedPoints(ancova.bias), ancova.biasMCSE, (x) => formatPoints(x)));
  });
});
