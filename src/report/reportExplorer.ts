import type { jsPDF } from 'jspdf';
import type { ExploreResult } from '../core/explore/exploreTypes';
import { EXPLORE_TOLERANCE_NOTE } from '../core/explore/exploreCells';
import { PLANNING_CAUTION } from '../core/planningCaution';
import { explorerChartData } from '../charts/explorerChartData';
import { explorerChartText } from '../charts/explorerChartText';
import { renderChartToSvgString } from '../charts/renderChartToSvgString';
import { chartSize } from '../charts/chartSize';
import { HOW_TO_READ_EXPLORER } from './reportCharts';
import { chartBoxOnPage, drawSvgChart, parseChartSvg } from './drawSvgChart';
import { FONT_SANS } from './reportFonts';
import type { PdfWriter } from './pdfWriter';

/** The chart's width in the PDF (CSS px; svg2pdf scales it to the page width), as the other charts. */
const EXPLORER_PDF_WIDTH = 720;

/** The caution printed under the explorer's table. */
export const EXPLORER_CAUTION =
  'These are simulations of the planned procedure, one per variant, each with its Monte Carlo SE: a difference between neighbouring cells smaller than about two MC SEs may be chance. ' +
  'The grid shows what the model implies for the inputs you chose to vary; the other inputs stay as planned. ' +
  'The tool informs research design; it does not replace a statistician or an ethics board.';

/**
 * The section "Design explorer": what was varied and how, the explorer chart
 * (heat map or curves, drawn as vector graphics), a table with one row per
 * variant (simulated share ± MC SE, closed form, discarded share, power,
 * tolerable; the chart's own text alternative, so every figure is the core's
 * or the engine's), how cells are judged and the cautions.
 * @param w the report's writer. @param doc its jsPDF document. @param result the exploration (cells in any state).
 * @throws never: a chart that cannot be drawn is replaced by a sentence saying so.
 */
export async function writeExplorer(w: PdfWriter, doc: jsPDF, result: ExploreResult): Promise<void> {
  const data = explorerChartData(result);
  const alt = explorerChartText(data);
  w.heading('Design explorer');
  const sentences = [...alt.sentences];
  // The caution closes the section (below); the chart text's own copy is dropped here.
  const caution = sentences.indexOf(PLANNING_CAUTION);
  if (caution >= 0) sentences.splice(caution, 1);
  w.paragraph(sentences.join(' '), { size: 9.5 });
  try {
    const svgText = renderChartToSvgString('explorer', data, chartSize('explorer', data, EXPLORER_PDF_WIDTH));
    const svg = parseChartSvg(svgText, FONT_SANS);
    const { width: cw, height: ch } = chartBoxOnPage(w, svg);
    w.ensure(ch + 40);
    await drawSvgChart(doc, svg, { x: w.left + (w.width - cw) / 2, y: w.y, width: cw, height: ch });
    w.gap(ch + 6);
    doc.setFont(FONT_SANS, 'normal');
    w.paragraph(`How to read it: ${HOW_TO_READ_EXPLORER}`, { size: 9, muted: true, after: 10 });
  } catch (e) {
    doc.setFont(FONT_SANS, 'normal');
    w.paragraph(`The explorer chart could not be drawn in the PDF (${e instanceof Error ? e.message : String(e)}); the table below has every figure.`, { size: 9, muted: true });
  }
  w.heading(alt.table.caption, 3);
  const axisCount = data.axes.length;
  w.table(
    alt.table.columns.map((header, i) => {
      const k = i - axisCount; // 0 simulated, 1 MC SE, 2 closed form, 3 discarded, 4 power, 5 tolerable
      const width = k < 0 ? 12 : [11, 8, 11, 13, 13, 15][k]!;
      return { header, width, align: k < 0 || k === 5 ? ('left' as const) : ('right' as const) };
    }),
    alt.table.rows,
    { fontSize: 8 },
  );
  w.paragraph(EXPLORE_TOLERANCE_NOTE, { size: 9 });
  w.paragraph(EXPLORER_CAUTION, { size: 9 });
}
