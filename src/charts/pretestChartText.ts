import type { ChartText } from './chartTypes';
import type { PretestChartData } from './pretestChartData';
import { fmt } from './svgHelpers';
import type { SelectionPretestView } from './selectionPretestView';

/** Text alternative to the selection view: the rule, who it selects, and where they score when measured again. */
function selectionText(title: string, v: SelectionPretestView): ChartText {
  const who = v.side === 'below' ? 'below' : 'above';
  const rule =
    v.ruleShape === 'cut-line'
      ? `Everyone whose pretest score is ${who} ${fmt(v.cutOff, 1)} is selected (a sharp cut-off on the pretest itself).`
      : `The rule looked at the ${v.basisWords} with a cut-off at ${fmt(v.cutOff, 1)} (${who}); at a given pretest score the chance of selection is drawn on the right-hand scale, because the pretest and the ${v.basisWords} do not agree person by person.`;
  const sentences = [
    `Population (${v.populationLabel}): mean pretest ${fmt(v.means.population, 1)} points.`,
    rule,
    `About ${fmt(v.share * 100, 0)}% of the population is selected (${v.programmeLabel}); their mean pretest is ${fmt(v.means.selectedPretest, 1)} points.`,
    `Measured again with no programme, the same people are expected to average ${fmt(v.means.selectedRemeasured, 1)} points, nearer the population mean: regression toward the mean alone.`,
    'The selected group is drawn as its share of the population, so its area is the share selected.',
  ];
  const rows = [
    ['Population', fmt(v.means.population, 1), '100%'],
    ['Selected, at the pretest', fmt(v.means.selectedPretest, 1), `${fmt(v.share * 100, 0)}%`],
    ['Selected, measured again with no programme', fmt(v.means.selectedRemeasured, 1), `${fmt(v.share * 100, 0)}%`],
  ];
  return {
    title,
    sentences,
    table: { caption: 'Mean scores of the population and of the selected people', columns: ['Who', 'Mean score (points)', 'Share of the population'], rows },
  };
}

/** Text alternative to the pretest-distributions chart: sentences and a table (screen readers, PDF). */
export function pretestChartText(data: PretestChartData): ChartText {
  if (data.selection) return selectionText(data.title, data.selection);
  const { programme: p, comparison: c } = data.groups;
  const k = data.kelley;
  const clusters = data.units === 'clusters';
  const who = clusters ? 'clusters' : 'members';
  const sentences = clusters
    ? [
        `Observed pretest means of the clusters, one per cluster: programme (${p.label}) mean ${fmt(p.mean, 1)} points, SD of the cluster means ${fmt(p.observedSD, 1)}, reliability of a cluster mean λ ${fmt(p.reliability, 2)}; ` +
          `comparison (${c.label}) mean ${fmt(c.mean, 1)} points, SD ${fmt(c.observedSD, 1)}, λ ${fmt(c.reliability, 2)}.`,
      ]
    : [
    `Observed pretest: programme (${p.label}) mean ${fmt(p.mean, 1)} points, SD ${fmt(p.observedSD, 1)}, within-group reliability ${fmt(p.reliability, 2)}; ` +
      `comparison (${c.label}) mean ${fmt(c.mean, 1)} points, SD ${fmt(c.observedSD, 1)}, reliability ${fmt(c.reliability, 2)}.`,
      ];
  if (data.region) {
    sentences.push(
      data.region.source === 'example'
        ? `In the example simulated study, matched programme ${who} ${clusters ? 'had means' : 'scored'} between ${fmt(data.region.lower, 1)} and ${fmt(data.region.upper, 1)} points; ${data.example?.discarded ?? 0} programme ${who} found no partner.`
        : `Partners within the caliper are expected for ${clusters ? 'cluster means' : 'scores'} between ${fmt(data.region.lower, 1)} and ${fmt(data.region.upper, 1)} points (approximation; the simulation shows the planned procedure).`,
    );
  } else {
    sentences.push(
      clusters
        ? 'No cluster mean is expected to have partners within the caliper: matching as planned would find almost no pairs of clusters.'
        : 'No pretest score is expected to have partners within the caliper: matching as planned would find almost no pairs.',
    );
  }
  sentences.push(
    `Matched ${who}' mean observed pretest: programme ${fmt(k.observed.programme, 1)}, comparison ${fmt(k.observed.comparison, 1)} points. ` +
      `Their expected true-score means are pulled back toward their own group's mean (Kelley): programme ${fmt(k.trueScore.programme, 1)}, comparison ${fmt(k.trueScore.comparison, 1)}, ` +
      `a hidden gap of ${fmt(k.hiddenGap, 2)} points that matching on the observed ${clusters ? 'mean' : 'score'} does not remove.`,
  );
  if (data.example) {
    sentences.push(
      `In the example simulated study the matched ${who}' actual true-score means were programme ${fmt(data.example.means.trueScore.programme, 1)} and comparison ${fmt(data.example.means.trueScore.comparison, 1)} points.`,
    );
  }
  const rows = [
    ['Programme', fmt(p.mean, 1), fmt(p.reliability, 2), fmt(k.observed.programme, 1), fmt(k.trueScore.programme, 1)],
    ['Comparison', fmt(c.mean, 1), fmt(c.reliability, 2), fmt(k.observed.comparison, 1), fmt(k.trueScore.comparison, 1)],
  ];
  const columns = ['Group', 'Pretest mean (points)', clusters ? 'Reliability of a cluster mean (λ)' : 'Reliability', 'Matched: observed mean', 'Matched: expected true mean (Kelley)'];
  if (data.example) {
    columns.push('Example study: true mean');
    rows[0]!.push(fmt(data.example.means.trueScore.programme, 1));
    rows[1]!.push(fmt(data.example.means.trueScore.comparison, 1));
  }
  return {
    title: data.title,
    sentences,
    table: { caption: `Pretest means, and matched ${who}' observed and true-score means`, columns, rows },
  };
}
