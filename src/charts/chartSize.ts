import type { ChartSize, DrawableChartId } from './chartTypes';
import type { BalanceChartData } from './balanceChartData';
import type { EstimatesChartData } from './estimatesChartData';
import type { PretestChartData } from './pretestChartData';
import type { SensitivityChartData } from './sensitivityChartData';
import { balanceChartMinHeight } from './renderBalanceChart';
import type { ChartDataById } from './renderChartToSvgString';
import { estimatesChartMinHeight } from './renderEstimatesChart';
import { pretestChartMinHeight } from './renderPretestChart';
import { sensitivityChartMinHeight } from './renderSensitivityChart';
import type { ExplorerChartData } from './explorerChartData';
import { explorerChartMinHeight } from './renderExplorerChart';

/** Narrowest and widest a chart is drawn (CSS px): a phone's column, and a wide screen's. */
export const CHART_WIDTH_RANGE = [320, 900] as const;

/**
 * The size to draw a chart at for the width it has: the width clamped to
 * CHART_WIDTH_RANGE, and a height that keeps text at its designed size and
 * gives every row its room at that width (narrow charts stack their labels,
 * so they grow taller). Layout only: no figure is computed here.
 * @example chartSize('estimates', data, 1200).width === 900
 */
export function chartSize<K extends DrawableChartId>(chartId: K, data: ChartDataById[K], width: number): ChartSize {
  const w = Math.max(CHART_WIDTH_RANGE[0], Math.min(CHART_WIDTH_RANGE[1], Math.round(width)));
  const base = Math.round(Math.max(300, Math.min(420, w * 0.55)));
  const least = (): number => {
    switch (chartId) {
      case 'pretest':
        return pretestChartMinHeight(data as PretestChartData, w);
      case 'estimates':
        return estimatesChartMinHeight(data as EstimatesChartData, w);
      case 'sensitivity':
        return sensitivityChartMinHeight(data as SensitivityChartData, w);
      case 'balance':
        return balanceChartMinHeight(data as BalanceChartData, w);
      case 'explorer':
        return explorerChartMinHeight(data as ExplorerChartData, w);
      default:
        return 0;
    }
  };
  return { width: w, height: Math.max(base, least()) };
}
