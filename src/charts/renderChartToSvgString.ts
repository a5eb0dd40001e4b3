import type { AnalysisId } from '../core/plan';
import type { ChartSize, DrawableChartId } from './chartTypes';
import type { BalanceChartData } from './balanceChartData';
import type { EstimatesChartData } from './estimatesChartData';
import type { PretestChartData } from './pretestChartData';
import type { SensitivityChartData } from './sensitivityChartData';
import type { ExplorerChartData } from './explorerChartData';
import { renderBalanceChart } from './renderBalanceChart';
import { renderEstimatesChart } from './renderEstimatesChart';
import { renderPretestChart } from './renderPretestChart';
import { renderSensitivityChart } from './renderSensitivityChart';
import { renderExplorerChart } from './renderExplorerChart';

/** Chart data by chart id. */
export interface ChartDataById {
  pretest: PretestChartData;
  estimates: EstimatesChartData;
  sensitivity: SensitivityChartData;
  balance: BalanceChartData;
  explorer: ExplorerChartData;
}

/** Any chart's data. */
export type ChartData = ChartDataById[DrawableChartId];

/** Draw any chart into an svg element (dispatch on the chart id). */
export function renderChart<K extends DrawableChartId>(
  chartId: K,
  svg: SVGSVGElement,
  data: ChartDataById[K],
  opts: ChartSize & { highlight?: AnalysisId | null; onHighlight?: (id: AnalysisId | null) => void },
): void {
  const o = { width: opts.width, height: opts.height, highlight: opts.highlight ?? null, onHighlight: opts.onHighlight };
  switch (chartId) {
    case 'pretest':
      return renderPretestChart(svg, data as PretestChartData, o);
    case 'estimates':
      return renderEstimatesChart(svg, data as EstimatesChartData, o);
    case 'sensitivity':
      return renderSensitivityChart(svg, data as SensitivityChartData, o);
    case 'balance':
      return renderBalanceChart(svg, data as BalanceChartData, o);
    case 'explorer':
      // Static here (exports, the PDF); the explorer panel calls renderExplorerChart with its hooks.
      return renderExplorerChart(svg, data as ExplorerChartData, { width: o.width, height: o.height });
    default:
      throw new Error(`Unknown chart "${String(chartId)}".`);
  }
}

/**
 * Build a standalone SVG document string for a chart: explicit width, height
 * and viewBox, every appearance set inline (no stylesheet needed), no
 * interactive attributes. For the PDF (svg2pdf.js) and SVG/PNG export; works
 * in the browser and under jsdom (it uses the global `document`).
 *
 * @throws Error when width or height is not a positive finite number, or no DOM is available.
 */
export function renderChartToSvgString<K extends DrawableChartId>(
  chartId: K,
  data: ChartDataById[K],
  size: ChartSize & { highlight?: AnalysisId | null },
): string {
  for (const [k, v] of [['width', size.width], ['height', size.height]] as const) {
    if (!(Number.isFinite(v) && v > 0)) throw new Error(`Chart ${k} must be a positive number of pixels; got ${String(v)}.`);
  }
  if (typeof document === 'undefined') {
    throw new Error('Drawing a chart needs a DOM (a browser, or jsdom in tests and the command line).');
  }
  const svg = document.createElementNS('http://www.w3.org/2000/svg', 'svg');
  renderChart(chartId, svg, data, { width: size.width, height: size.height, highlight: size.highlight ?? null });
  const body = new XMLSerializer().serializeToString(svg);
  return body.includes('xmlns="http://www.w3.org/2000/svg"') ? body : body.replace('<svg', '<svg xmlns="http://www.w3.org/2000/svg"');
}
