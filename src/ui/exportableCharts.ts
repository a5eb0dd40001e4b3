import { hasCovariateBalance } from '../charts/covariateBalanceChartData';
import type { AnalyticResults } from '../core/analyticResults';
import { usesCovariateModel } from '../core/multivariate/covariateModel';
import type { Plan } from '../core/plan';
import { studyDesign } from '../core/design/studyDesign';
import type { SimulationResult } from '../sim/types';

/** A chart the exports panel offers: the id reportCharts gives it, and the name on its buttons. */
export interface ExportableChart {
  id: string;
  name: string;
}

/**
 * The balance chart the exports panel offers, under the same id reportCharts
 * draws it with: per covariate ("covariateBalance") for plans with covariates
 * or a multivariate distance, closed form before a simulation; the pretest-only
 * chart ("balance") otherwise, once a simulation of this plan exists. Empty
 * when neither can be drawn.
 */
export function exportableBalanceChart(plan: Plan, analytic: AnalyticResults | null, simulation: SimulationResult | null): ExportableChart[] {
  if (usesCovariateModel(plan)) {
    return analytic && hasCovariateBalance({ plan, analytic, simulation }) ? [{ id: 'covariateBalance', name: 'Balance after matching' }] : [];
  }
  // A one-group study matches nobody: no balance chart.
  return simulation && studyDesign(plan).shape === 'two-groups' ? [{ id: 'balance', name: 'Balance after matching' }] : [];
}
