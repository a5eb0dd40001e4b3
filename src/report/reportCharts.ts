import type { AnalyticResults } from '../core/analyticResults';
import type { Plan } from '../core/plan';
import type { SimulationResult } from '../sim/types';
import {
  balanceChartData,
  balanceChartText,
  estimatesChartData,
  estimatesChartText,
  pretestChartData,
  pretestChartText,
  renderChartToSvgString,
  sensitivityChartData,
  sensitivityChartText,
  type ChartId,
  type ChartText,
} from '../charts';
import { covariateBalanceChartData, hasCovariateBalance } from '../charts/covariateBalanceChartData';
import { covariateBalanceChartSvgString } from '../charts/covariateBalanceChartRender';
import { covariateBalanceChartText } from '../charts/covariateBalanceChartText';
import { usesCovariateModel } from '../core/multivariate/covariateModel';
import { isSelectionDesign, studyDesign } from '../core/design/studyDesign';
import type { ReportChart } from './buildReportPdf';

/** How to read each chart: one or two plain sentences printed under it in the PDF. */
export const HOW_TO_READ: Record<ChartId, string> = {
  pretest:
    'The curves are the two groups’ observed pretest distributions; the shaded band is where matched pairs can be found. Matched people come from the groups’ facing tails, so their true scores fall back toward their own group’s mean.',
  estimates:
    'Each row is one analysis. The reference line is the hoped-for effect; the marker shows where the analysis is expected to land, and the spread shows the estimates across simulated studies. Distance from the line is the artefact.',
  sensitivity:
    'The horizontal axis varies one input while the others stay as planned; each line is one analysis’ expected artefact. Where a line crosses the tolerance band the artefact becomes acceptable.',
  balance:
    'Standardised mean differences before and after matching, on the observed pretest and on the true score. Balance on the observed pretest can look fine while the true scores still differ.',
};

/** How to read the design explorer's chart (src/report/reportExplorer.ts). */
export const HOW_TO_READ_EXPLORER =
  'Each cell (or point) is one variant of the plan, simulated with the same seed; its figure is the simulated regression artefact as a share of the hoped-for effect, with its Monte Carlo SE. Outlined cells (filled points) keep the artefact within the share you can tolerate; the closed form assumes unlimited pools and exact matching.';

/** How to read the pretest chart when a rule forms the groups (see selectionPretestView). */
export const HOW_TO_READ_SELECTION_PRETEST =
  'The grey curve is the whole population’s observed pretest; the shaded area is the part the rule selects, drawn as its share of the population; the dashed curve is the same people measured again with no programme, nearer the population mean. The dotted line is the cut-off; where the rule did not look at the pretest itself, the curve on the right-hand scale is the chance of selection at each pretest score.';

/** How to read the pretest chart when clusters are matched on their means. */
export const HOW_TO_READ_CLUSTER_PRETEST =
  'The curves are the spread of the clusters’ observed pretest means in each group; the shaded band is where matched clusters can be found, and each dot below is one cluster. Matched clusters come from the groups’ facing tails, so their true means fall back toward their own group’s mean.';

/** How to read the balance chart per covariate (plans with covariates). */
export const HOW_TO_READ_COVARIATE_BALANCE =
  'One block per variable, pretest first, each with two lanes: "as measured" (the observed values) and "true score" (what the matching cannot see). In each lane the pale bar runs from zero to the standardised mean difference (SMD, programme minus comparison) before matching and the solid bar to the SMD after, with both figures written beside it; the shaded band is the zone within 0.1 either way, where a difference is commonly read as balanced. Each block says what its balance amounts to, and notes a variance ratio after matching outside 0.5 to 2 (Rubin 2001; Stuart 2010).';

/** Chart size in the PDF (CSS px, which svg2pdf scales to the page width). */
const SIZE = { width: 720, height: 400 };

/**
 * The planner's charts for the PDF summary: each chart's SVG drawn by the
 * charts module from the same results, with its title and a caption saying
 * how to read it followed by its text alternative. Needs a DOM (browser, or
 * jsdom in Node). A chart that cannot be drawn is left out with a caption
 * saying so rather than failing the whole report.
 */
export function reportCharts(plan: Plan, analytic: AnalyticResults, simulation: SimulationResult | null): ReportChart[] {
  const input = { plan, analytic, simulation };
  const charts: ReportChart[] = [];
  const add = (id: ChartId, draw: () => { svg: string; text: ChartText }) => {
    try {
      const { svg, text } = draw();
      const howToRead =
        id === 'pretest' && isSelectionDesign(plan)
          ? HOW_TO_READ_SELECTION_PRETEST
          : id === 'pretest' && plan.clusters !== undefined && plan.matching.level === 'clusters'
            ? HOW_TO_READ_CLUSTER_PRETEST
            : HOW_TO_READ[id];
      charts.push({ id, title: text.title, svg, caption: `${howToRead} ${text.sentences.join(' ')}` });
    } catch (e) {
      charts.push({
        id,
        title: `Chart “${id}”`,
        svg: '',
        caption: `This chart could not be drawn: ${e instanceof Error ? e.message : String(e)}`,
      });
    }
  };
  add('pretest', () => {
    const d = pretestChartData(input);
    return { svg: renderChartToSvgString('pretest', d, SIZE), text: pretestChartText(d) };
  });
  add('estimates', () => {
    const d = estimatesChartData(input);
    return { svg: renderChartToSvgString('estimates', d, SIZE), text: estimatesChartText(d) };
  });
  add('sensitivity', () => {
    const d = sensitivityChartData(input);
    return { svg: renderChartToSvgString('sensitivity', d, SIZE), text: sensitivityChartText(d) };
  });
  if (usesCovariateModel(plan)) {
    // With covariates, balance is shown per variable (pretest included) instead of the pretest-only
    // chart: simulated when a run of this plan is given, else core's closed form, as on screen.
    if (hasCovariateBalance(input)) {
      try {
        const d = covariateBalanceChartData(input);
        const text = covariateBalanceChartText(d);
        charts.push({
          id: 'covariateBalance',
          title: text.title,
          svg: covariateBalanceChartSvgString(d, SIZE.width),
          caption: `${HOW_TO_READ_COVARIATE_BALANCE} ${text.sentences.join(' ')}`,
        });
      } catch (e) {
        charts.push({
          id: 'covariateBalance',
          title: 'Balance on each covariate',
          svg: '',
          caption: `This chart could not be drawn: ${e instanceof Error ? e.message : String(e)}`,
        });
      }
    }
  } else if (simulation && studyDesign(plan).shape === 'two-groups') {
    // A one-group study matches nobody: it has no balance chart.
    add('balance', () => {
      const d = balanceChartData(input);
      return { svg: renderChartToSvgString('balance', d, SIZE), text: balanceChartText(d) };
    });
  }
  return charts;
}
