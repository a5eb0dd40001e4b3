import { comparePlans, type CandidatePlan, type PlanComparisonRow } from '../core/comparePlans';
import { planComparisonChartData, planComparisonChartSize, planComparisonChartSvg, planComparisonChartText } from '../charts/planComparisonChart';
import type { ReportChart } from './buildReportPdf';
import { showControlCharacters } from '../core/visibleText';
import { formatCount, formatProbability, formatShare, formatSignedPoints } from './format';
import type { PdfWriter } from './pdfWriter';

/** The candidate plans to print: comparePlans' rows (figures formatted here, never computed). */
export interface ReportComparison {
  rows: PlanComparisonRow[];
}

/** The section "Candidate plans compared": one table row per variant, then whom each estimate describes. */
export function writeComparison(w: PdfWriter, comparison: ReportComparison): void {
  w.heading('Candidate plans compared');
  w.paragraph(
    'Each variant is judged on the analysis it relies on, from the closed forms. Artefact = expected estimate minus the hoped-for effect; share = artefact / effect; false positives = the chance of a significant result if the programme did nothing.',
    { size: 9 },
  );
  w.table(
    [
      { header: 'Variant', width: 24 },
      { header: 'Analysis', width: 18 },
      { header: 'Artefact', width: 10, align: 'right' },
      { header: 'Share', width: 9, align: 'right' },
      { header: 'False pos.', width: 10, align: 'right' },
      { header: 'Power', width: 9, align: 'right' },
      { header: 'Used', width: 11, align: 'right' },
      { header: 'Discarded', width: 10, align: 'right' },
    ],
    comparison.rows.map((r) => [
      showControlCharacters(r.name),
      r.analysisName,
      formatSignedPoints(r.artefact),
      formatShare(r.artefactShare),
      formatProbability(r.falsePositiveRate),
      formatShare(r.power),
      `${formatCount(Math.round(r.programmeN))} of ${formatCount(r.programmePool)}`,
      formatShare(r.discardedShare),
    ]),
    { fontSize: 8.5, boldFirstColumn: true },
  );
  w.heading('Whom each estimate describes', 3);
  for (const r of comparison.rows) w.item('•', `${showControlCharacters(r.name)}: ${showControlCharacters(r.estimand)}`, 9.5);
}

/**
 * The comparison for the PDF from the chosen variants: comparePlans' rows and
 * the comparison chart as SVG (needs a DOM). Null when fewer than two are chosen.
 */
export function reportComparison(candidates: readonly CandidatePlan[]): (ReportComparison & { chart: ReportChart }) | null {
  if (candidates.length < 2) return null;
  const rows = comparePlans(candidates);
  const data = planComparisonChartData(rows, candidates[0]!.plan.analysis.tolerableBiasShare);
  return {
    rows,
    chart: {
      id: 'comparison',
      title: data.title,
      svg: planComparisonChartSvg(data, planComparisonChartSize(640, rows.length)),
      caption: `${planComparisonChartText(data).sentences.join(' ')} Bars inside the shaded band stay within the tolerable share; the dotted line marks 80% power.`,
    },
  };
}
