// @vitest-environment jsdom
// The PDF and the CLI say what core decides about a growth gap that offsets the
// artefact (the figures themselves are checked against Thorndike 1942 / Lord
// 1960 in test/core/honestVerdicts.test.ts). The PDF is read back with
// pdfjs-dist, an independent reader; no simulation (charts from the closed forms).
import { beforeAll, describe, expect, it } from 'vitest';
import { analysePlan } from '../../src/core/analysePlan';
import { demoPlan } from '../../src/io/demoPlan';
import { buildReportPdf } from '../../src/report/buildReportPdf';
import { formatSignedPoints } from '../../src/report/format';
import { reportCharts } from '../../src/report/reportCharts';
import { formatResultsTable } from '../../src/cli/formatResultsTable';
import { TEST_FONTS } from './fontsFromDisk';
import { readPdfText } from './readPdfText';

describe('demo with an assumed growth gap of +1.5 (invented)', () => {
  const plan = demoPlan();
  plan.outcome.growthGap = 1.5;
  const analytic = analysePlan(plan);
  const md = analytic.analyses.matchedDifference!;
  let flat = '';
  beforeAll(async () => {
    const bytes = await buildReportPdf({
      plan,
      analytic,
      simulation: null,
      charts: reportCharts(plan, analytic, null),
      appVersion: '0.1.0',
      generatedAt: new Date('2026-12-04T10:00:00Z'),
      fonts: TEST_FONTS,
    });
    flat = (await readPdfText(bytes)).body.join(' ').replace(/\s+/g, ' ');
  }, 60_000);

  it('the PDF gives the regression artefact and the growth gap apart, the offset sentence and why it is not tolerable', () => {
    expect(flat).toContain(`a regression-toward-the-mean artefact of ${formatSignedPoints(md.regressionArtefact)} points (80% of the hoped-for effect, in the opposite direction)`);
    expect(flat).toContain(`an assumed growth gap of ${formatSignedPoints(1.5)} points (60%), a net bias of ${formatSignedPoints(md.bias)} points`);
    expect(flat).toContain(md.growthGapNote!);
    expect(flat).toContain(md.tolerability.reason);
    expect(flat).toContain('Assumed growth gap');
    expect(flat).not.toContain('leaves only a tolerable artefact');
  });

  it('the CLI text says the same', () => {
    const text = formatResultsTable(plan, analytic);
    expect(text).toContain(`Matched post-test difference: ${md.tolerability.reason}`);
    expect(text).toContain('Regression artefact -2.00 (-80.0%), growth gap 1.50 (60.0%)');
    expect(text).toContain(md.growthGapNote!);
    expect(text).toContain('n: biased: more people do not help.');
  });
});
