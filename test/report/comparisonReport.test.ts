// @vitest-environment jsdom
// The PDF with three candidate plans compared, read back with pdfjs-dist (an
// independent PDF reader, not the library that wrote it).
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { applyRemedy } from '../../src/core/applyRemedy';
import { comparePlans, type PlanComparisonRow } from '../../src/core/comparePlans';
import { demoPlan } from '../../src/io/demoPlan';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { formatProbability, formatShare, formatSignedPoints } from '../../src/report/format';
import { planComparisonChartData, planComparisonChartSize, planComparisonChartSvg, planComparisonChartText } from '../../src/charts/planComparisonChart';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText, type PdfText } from './readPdfText';

/*
 * Demo plan (invented): reliability .75, beta 0.8, observed gap −10, effect
 * 2.5. Matched-difference artefact beta(1 − rho)Delta = −2.00 (Cochran & Rubin
 * 1973, from memory); gain score (beta − 1)Delta = +2.00 (Lord 1967); four
 * averaged forms (Spearman 1910; Brown 1910) rho = 12/13: −0.62.
 */
let text: PdfText;
let rows: PlanComparisonRow[];
beforeAll(async () => {
  const plan = demoPlan();
  const gain = applyRemedy(plan, 'gain-score');
  const forms = applyRemedy(plan, 'more-reliable-pretest');
  if (!gain.ok || !forms.ok) throw new Error('remedy not applicable');
  rows = comparePlans([
    { name: 'As planned (invented)', plan },
    { name: 'Gain scores', plan: gain.plan, analysisId: gain.analysisId },
    { name: 'Four parallel forms', plan: forms.plan },
  ]);
  const data = planComparisonChartData(rows, plan.analysis.tolerableBiasShare);
  const chart = {
    id: 'comparison',
    title: data.title,
    svg: planComparisonChartSvg(data, planComparisonChartSize(640, rows.length)),
    caption: planComparisonChartText(data).sentences.join(' '),
  };
  const bytes = await buildReportPdf({
    plan,
    analytic: analysePlan(plan),
    simulation: null,
    charts: [],
    appVersion: 'test',
    generatedAt: new Date(Date.UTC(2026, 0, 2, 3, 4)),
    fonts: TEST_FONTS,
    comparison: { rows, chart },
  });
  text = await readPdfText(bytes);
}, 60_000);

describe('PDF: candidate plans compared', () => {
  it('prints the section with one row per variant and the artefacts by hand', () => {
    const all = text.all.replace(/\s+/g, ' ');
    expect(all).toContain('Candidate plans compared');
    for (const name of ['As planned (invented)', 'Gain scores', 'Four parallel forms']) expect(all).toContain(name);
    expect(formatSignedPoints(rows[0]!.artefact)).toBe(formatSignedPoints(-2));
    expect(formatSignedPoints(rows[1]!.artefact)).toBe(formatSignedPoints(2));
    expect(formatSignedPoints(rows[2]!.artefact)).toBe(formatSignedPoints(-0.8 * 10 / 13));
    for (const r of rows) {
      expect(all).toContain(formatSignedPoints(r.artefact));
      expect(all).toContain(formatShare(r.power));
      expect(all).toContain(formatProbability(r.falsePositiveRate));
    }
    expect(all).toContain('Whom each estimate describes');
    expect(all).toContain('matched members');
    // The chart joins the figures with its title.
    expect(all).toContain('Candidate plans: artefact as a share of the effect, and power');
  });
});
