import type { ChartText } from './chartTypes';
import type { BalanceChartData } from './balanceChartData';
import { fmt } from './svgHelpers';

/** Text alternative to the balance chart: sentences and a table (screen readers, PDF). */
export function balanceChartText(data: BalanceChartData): ChartText {
  const [obs, tru] = data.rows;
  const [strict, lenient] = data.thresholds;
  const verdict = (v: number) =>
    Math.abs(v) < strict ? `within the strict ${fmt(strict, 2)} threshold` : Math.abs(v) < lenient ? `within the ${fmt(lenient, 2)} threshold only` : `beyond the ${fmt(lenient, 2)} threshold`;
  const sentences = [
    `Standardised mean difference on the observed pretest: ${fmt(obs.before, 2)} before matching, ${fmt(obs.after, 2)} after (${verdict(obs.after)}).`,
    `On the true score: ${fmt(tru.before, 2)} before, ${fmt(tru.after, 2)} after (${verdict(tru.after)}). ` +
      (Math.abs(tru.after) >= strict && Math.abs(obs.after) < strict
        ? 'The matched groups look balanced on the pretest but remain unbalanced on what the pretest is meant to measure.'
        : 'Observed and true-score balance tell a similar story here.'),
    data.source === 'simulation'
      ? 'Figures are means over the simulated studies.'
      : 'Figures are closed-form values for exact matching from an unlimited comparison pool.',
  ];
  return {
    title: data.title,
    sentences,
    table: {
      caption: 'Standardised mean differences (programme minus comparison, pooled SD) before and after matching',
      columns: ['Measure', 'Before matching', 'After matching'],
      rows: data.rows.map((r) => [r.label, fmt(r.before, 2), fmt(r.after, 2)]),
    },
  };
}
