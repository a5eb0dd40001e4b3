import type { ChartText } from './chartTypes';
import type { EstimatesChartData } from './estimatesChartData';
import { ANALYSIS_STYLES } from './palette';
import { fmt } from './svgHelpers';
import { PLANNING_CAUTION } from '../core/planningCaution';

/** Text alternative to the estimates chart: sentences and a table (screen readers, PDF). */
export function estimatesChartText(data: EstimatesChartData): ChartText {
  const sentences = [
    `Hoped-for programme effect: ${fmt(data.tau, 2)} posttest points.`,
    ...data.rows.map((r) => {
      const range = r.interval
        ? `95% of studies expected between ${fmt(r.interval.lower, 2)} and ${fmt(r.interval.upper, 2)}`
        : 'no range: too few people are expected to be matched for this analysis';
      const base = `${r.name}: expected estimate ${fmt(r.expected, 2)} points; ${range}.`;
      return r.simulatedMean !== null && r.simulatedMeanMCSE !== null
        ? `${base} Simulated mean ${fmt(r.simulatedMean, 2)} (Monte Carlo SE ${fmt(r.simulatedMeanMCSE, 3)}) over ${r.drawn} studies.`
        : base;
    }),
    data.mode === 'closed-form'
      ? 'These ranges are closed-form approximations; run the simulation to see the planned matching procedure itself.'
      : `Histograms show the estimates from ${data.replications} simulated studies of this plan.`,
    PLANNING_CAUTION,
  ];
  const columns = ['Analysis', 'Expected estimate (points)', '95% range low', '95% range high'];
  if (data.mode === 'simulation') columns.push('Simulated mean', 'Monte Carlo SE', 'Studies drawn');
  const rows = data.rows.map((r) => {
    const row = [ANALYSIS_STYLES[r.id].shortLabel, fmt(r.expected, 2), r.interval ? fmt(r.interval.lower, 2) : '—', r.interval ? fmt(r.interval.upper, 2) : '—'];
    if (data.mode === 'simulation') {
      row.push(r.simulatedMean === null ? 'n/a' : fmt(r.simulatedMean, 2), r.simulatedMeanMCSE === null ? 'n/a' : fmt(r.simulatedMeanMCSE, 3), String(r.drawn));
    }
    return row;
  });
  return { title: data.title, sentences, table: { caption: 'Expected and simulated estimates of the programme effect', columns, rows } };
}
