import type { ChartText } from './chartTypes';
import type { PretestChartData } from './pretestChartData';
import { fmt } from './svgHelpers';

/** Text alternative to the pretest-distributions chart: sentences and a table (screen readers, PDF). */
export function pretestChartText(data: PretestChartData): ChartText {
  const { programme: p, comparison: c } = data.groups;
  const k = data.kelley;
  const sentences = [
    `Observed pretest: programme (${p.label}) mean ${fmt(p.mean, 1)} points, SD ${fmt(p.observedSD, 1)}, within-group reliability ${fmt(p.reliability, 2)}; ` +
      `comparison (${c.label}) mean ${fmt(c.mean, 1)} points, SD ${fmt(c.observedSD, 1)}, reliability ${fmt(c.reliability, 2)}.`,
  ];
  if (data.region) {
    sentences.push(
      data.region.source === 'example'
        ? `In the example simulated study, matched programme members scored between ${fmt(data.region.lower, 1)} and ${fmt(data.region.upper, 1)} points; ${data.example?.discarded ?? 0} programme members found no partner.`
        : `Partners within the caliper are expected for scores between ${fmt(data.region.lower, 1)} and ${fmt(data.region.upper, 1)} points (approximation; the simulation shows the planned procedure).`,
    );
  } else {
    sentences.push('No pretest score is expected to have partners within the caliper: matching as planned would find almost no pairs.');
  }
  sentences.push(
    `Matched members' mean observed pretest: programme ${fmt(k.observed.programme, 1)}, comparison ${fmt(k.observed.comparison, 1)} points. ` +
      `Their expected true-score means are pulled back toward their own group's mean (Kelley): programme ${fmt(k.trueScore.programme, 1)}, comparison ${fmt(k.trueScore.comparison, 1)}, ` +
      `a hidden gap of ${fmt(k.hiddenGap, 2)} points that matching on the observed score does not remove.`,
  );
  if (data.example) {
    sentences.push(
      `In the example simulated study the matched members' actual true-score means were programme ${fmt(data.example.means.trueScore.programme, 1)} and comparison ${fmt(data.example.means.trueScore.comparison, 1)} points.`,
    );
  }
  const rows = [
    ['Programme', fmt(p.mean, 1), fmt(p.reliability, 2), fmt(k.observed.programme, 1), fmt(k.trueScore.programme, 1)],
    ['Comparison', fmt(c.mean, 1), fmt(c.reliability, 2), fmt(k.observed.comparison, 1), fmt(k.trueScore.comparison, 1)],
  ];
  const columns = ['Group', 'Pretest mean (points)', 'Reliability', 'Matched: observed mean', 'Matched: expected true mean (Kelley)'];
  if (data.example) {
    columns.push('Example study: true mean');
    rows[0]!.push(fmt(data.example.means.trueScore.programme, 1));
    rows[1]!.push(fmt(data.example.means.trueScore.comparison, 1));
  }
  return {
    title: data.title,
    sentences,
    table: { caption: 'Pretest means, and matched members\' observed and true-score means', columns, rows },
  };
}
