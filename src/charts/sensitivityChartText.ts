import type { ChartText } from './chartTypes';
import type { SensitivityChartData } from './sensitivityChartData';
import { ANALYSIS_STYLES } from './palette';
import { fmt } from './svgHelpers';
import { PLANNING_CAUTION } from '../core/planningCaution';

const WHAT: Record<SensitivityChartData['mode'], string> = {
  reliability: 'pretest reliability',
  pretestGap: 'pretest gap',
  cutOff: 'cut-off',
  screenerReliability: 'screener reliability',
};
const COLUMN: Record<SensitivityChartData['mode'], string> = {
  reliability: 'Reliability',
  pretestGap: 'Pretest gap (points)',
  cutOff: 'Cut-off (points)',
  screenerReliability: 'Screener reliability',
};

/** Text alternative to the sensitivity chart: sentences and a table of the curves at a few x values. */
export function sensitivityChartText(data: SensitivityChartData): ChartText {
  const what = WHAT[data.mode];
  const d = data.mode === 'reliability' || data.mode === 'screenerReliability' ? 2 : 1;
  // Whose artefact the break-even marks (core's sensitivityCurve): the matched difference's, else ANCOVA's
  // (a sharp cut-off on the pretest leaves nobody to match), or the one analysis of a one-group study.
  const whose =
    data.series.length === 1
      ? `The ${data.series[0]!.name.toLowerCase()} artefact`
      : data.series.some((s) => s.id === 'matchedDifference')
        ? 'The matched-difference artefact'
        : 'The ANCOVA artefact';
  const sentences = [
    `Expected bias of each analysis as the ${what} varies. Biases within +/- ${fmt(data.band.upper, 2)} points (${fmt(data.tolerableShare * 100, 0)}% of the hoped-for effect of ${fmt(data.tau, 2)}) are tolerated.`,
    `This plan: ${what} ${fmt(data.current, d)}; expected biases ${data.series.map((s) => `${s.name} ${fmt(s.currentBias, 2)}`).join(', ')} points.`,
    data.breakEvenX.length > 0
      ? `${whose} reaches the edge of the tolerated band at ${what} ${data.breakEvenX.map((v) => fmt(v, data.mode === 'reliability' ? 3 : d)).join(' and ')}.`
      : 'No break-even value lies on this axis.',
    `Axis: ${data.xLabel}. ${data.holdsFixed}`,
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
      columns: [COLUMN[data.mode], ...data.series.map((s) => ANALYSIS_STYLES[s.id].shortLabel)],
      rows,
    },
  };
}
