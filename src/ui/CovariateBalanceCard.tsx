import { useMemo } from 'react';
import { CHART_WIDTH_RANGE } from '../charts/chartSize';
import type { ChartInput } from '../charts/chartTypes';
import { covariateBalanceChartData, hasCovariateBalance, type CovariateBalanceChartData } from '../charts/covariateBalanceChartData';
import { covariateBalanceChartSize, renderCovariateBalanceChart } from '../charts/covariateBalanceChartRender';
import { covariateBalanceChartText } from '../charts/covariateBalanceChartText';
import { ChartFigure, buildChart, type BuiltChart, type DrawChart } from './ChartFigure';

/** Draw the balance chart at the width shown (320 to 900 px; its height grows with the rows). */
const drawCovariateBalance: DrawChart<CovariateBalanceChartData> = (svg, data, width, link) => {
  const w = Math.max(CHART_WIDTH_RANGE[0], Math.min(CHART_WIDTH_RANGE[1], Math.round(width)));
  renderCovariateBalanceChart(svg, data, { ...covariateBalanceChartSize(data, w), ...link });
};

/**
 * The balance chart per covariate (pretest first): each variable as two
 * lanes, as measured and on the true scores, with the SMD before and after
 * matching, a plain verdict per variable ("looks balanced, is not", ...) and a
 * note where the variance ratio falls outside 0.5–2, with its text and table
 * alternative (the table keeps the trade's terms). Its figures come from the
 * simulation of this plan when there is one, else from core's closed form
 * (exact matching, unlimited pool). Table rows whose variance ratio falls
 * outside 0.5–2 are flagged (the ratio shown in the warning colour).
 */
export function CovariateBalanceCard({ input, simulationOutOfDate }: { input: ChartInput; simulationOutOfDate: boolean }) {
  const built = useMemo(
    (): BuiltChart<CovariateBalanceChartData> =>
      hasCovariateBalance(input)
        ? buildChart(() => covariateBalanceChartData(input), covariateBalanceChartText)
        : { data: null, text: null, error: null },
    [input],
  );
  const { data } = built;
  return (
    <ChartFigure
      chart="covariateBalance"
      {...built}
      draw={drawCovariateBalance}
      fallbackTitle="Balance on each covariate"
      placeholder={
        <p className="chart-placeholder" data-testid="covariate-balance-placeholder">
          Balance on each covariate appears once the plan is complete{simulationOutOfDate ? ' (the last simulation is for an earlier plan)' : ''}.
        </p>
      }
      rowClassName={(i) => (data?.rows[i]?.varianceRatioOutside ? 'is-flagged' : undefined)}
    />
  );
}
