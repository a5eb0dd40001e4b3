import type { ChartText } from './chartTypes';
import type { SensitivityChartData } from './sensitivityChartData';
import { ANALYSIS_STYLES } from './palette';
import { fmt } from './svgHelpers';
import { PLANNING_CAUTION } from '../core/planningCaution';

/** Text alternative to the sensitivity chart: sentences and a table of the curves at a few x values. */
export function sensitivityChartText(data: SensitivityChartData): ChartText {
  const what = data.mode === 'reliability' ? 'pretest reliability' : 'pretest gap';
  const d = data.mode === 'reliability' ? 2 : 1;
  const sentences = [
    `Expected bias of each analysis as the ${what} varies. Biases within +/- ${fmt(data.band.upper, 2)} points (${fmt(data.tolerableShare * 100, 0)}% of the hoped-for effect of ${fmt(data.tau, 2)}) are tolerated.`,
    `This plan: ${what} ${fmt(data.current, d)}; expected biases ${data.series.map((s) => `${s.name} ${fmt(s.currentBias, 2)}`).join(', ')} points.`,
    data.breakEvenX.length > 0
      ? `The matched-difference artefact reaches the edge of the tolerated band at ${what} ${data.breakEvenX.map((v) => fmt(v, d)).join(' and ')}.`
      : 'No break-even value lies on this axis.',
    PLANNING_CAUTION,
    ...data.coincident.map(([a, b]) => `${ANALYSIS_STYLES[a].shortLabel} and ${ANALYSIS_STYLES[b].shortLabel} have the same expected bias all along this axis.`),
  ];
  // Table: every few grid points, so a reader can follow the curves.
  const n = data.series[0]?.points.length ?? 0;
  const step = Math.max(1, Math.round((n - 1) / 10));
  const idx: number[] = [];
  for (let i = 0; i < n; i += step) idx.push(i);
  if (n > 0 && idx[idx.length - 1] !== n - 1) idx.push(n - 1);
  const rows = idx.map((i) => [fmt(data.series[0]!.points[i]!.x, d), ...data.series.map((s) => fmt(s.points[i]!.bias, 2))]);
  return {
    title: data.title,
    sentences,
    table: {
      caption: `Expected bias (posttest points) by ${what}`,
      columns: [data.mode === 'reliability' ? 'Reliability' : 'Pretest gap (points)', ...data.series.map((s) => ANALYSIS_STYLES[s.id].shortLabel)],
      rows,
    },
  };
}
