// Every design's closed forms (the comparison of candidate plans analyses each), registered in the engine registry.
import '../core/allEngines';
import { FAILURE_WORDS } from '../core/judgeTolerable';
import { jsPDF } from 'jspdf';
import type { AnalyticResults } from '../core/analyticResults';
import type { AnalysisId, Plan } from '../core/plan';
import { presentAnalysisIds, requireAnalysis } from '../core/presentAnalyses';
import { headlineAnalysisId } from '../core/design/studyDesign';
import { selectionModel } from '../core/design/selectionModel';
import { centralCutOffVarianceInflation } from '../core/design/centralCutOffVarianceInflation';
import { serializePlan } from '../io/planFile';
import { isFeasible, type SimAnalysisResult, type SimAnalysisSummary, type SimulationResult } from '../sim/types';
import { quickFiguresAgreement } from '../sim/quickFiguresAgreement';
import { procedureBasisNote } from '../core/procedureBasisNote';
import { showControlCharacters } from '../core/visibleText';
import { chartBoxOnPage, drawSvgChart, parseChartSvg } from './drawSvgChart';
import {
  formatCount,
  formatDateTime,
  formatPoints,
  formatProbability,
  formatReliability,
  formatSD,
  formatShare,
  formatSignedPoints,
  withMcse,
} from './format';
import { PdfWriter, type TableColumn } from './pdfWriter';
import { writeComparison, type ReportComparison } from './reportComparison';
import { writeExplorer } from './reportExplorer';
import type { ExploreResult } from '../core/explore/exploreTypes';
import {
  caliperPhrase,
  COVARIATE_CAUTION,
  COVARIATE_MODEL_LINES,
  writeCovariateBalance,
  writeCovariateInputs,
  writeUnmeasuredPart,
} from './reportCovariates';
import { planInputRows, type InputSource } from './planInputRows';
import { CONTINUATION, PLAN_BEGIN, PLAN_END } from './planJsonBlock';
import { FONT_SANS, loadReportFonts, registerReportFonts, type ReportFonts } from './reportFonts';
import { clusterCaution, CLUSTER_MODEL_LINES, CLUSTER_REFERENCES, clusterPowerCells, clusterSummarySentence, clusterSummaryTable, naiveComparisonTable } from './reportClusters';
import { CAUTION_LINE, CAUTIONS, MODEL_LINES, REFERENCES, SELECTION_MODEL_LINES, SELECTION_REFERENCES, VERDICT_LABEL, VERDICT_TEXT } from './reportText';

/** A chart to include: its SVG text (as rendered on screen) and how to read it. */
export interface ReportChart {
  id: string;
  title: string;
  svg: string;
  caption: string;
}

export interface ReportInput {
  plan: Plan;
  analytic: AnalyticResults;
  /** Monte Carlo results, or null when no simulation has been run for this plan. */
  simulation: SimulationResult | null;
  charts: ReportChart[];
  /** The app's version (package.json). */
  appVersion: string;
  generatedAt: Date;
  /** Where each input came from, by dotted plan path; defaults as in planInputRows. */
  provenance?: Partial<Record<string, InputSource>>;
  /** Embedded fonts; loaded from src/report/fonts when omitted. */
  fonts?: ReportFonts;
  /** Candidate plans compared (comparePlans' rows), printed after the remedies; its chart, when given, joins the charts. */
  comparison?: ReportComparison & { chart?: ReportChart };
  /** A design-explorer grid (the store's last exploration of this plan), printed as the section "Design explorer" after the remedies and candidate plans. */
  explorer?: ExploreResult | null;
}

/** Title printed at the top of every summary. */
export const REPORT_HEADING = 'Meanward planning summary';

function samePlan(a: Plan, b: Plan): boolean {
  return serializePlan(a) === serializePlan(b);
}

/**
 * Build the PDF summary of a plan for an ethics board, a grant panel or a
 * pre-registration: summary and verdict, inputs and their sources, closed-form
 * and simulated results, charts (vector), ranked remedies, the model and
 * references, cautions, and the complete plan file for reproduction.
 *
 * Every figure is taken from `analytic` (analysePlan) and `simulation`
 * (simulatePlan) and formatted with ./format; nothing is recomputed here.
 *
 * @param input see ReportInput. A simulation run for a different plan is left
 *   out (and the PDF says so).
 * @returns the PDF file's bytes.
 * @throws Error when the fonts cannot be loaded. A chart whose SVG cannot be
 *   read is replaced by a sentence saying so, not an exception.
 * @example
 *   const bytes = await buildReportPdf({ plan, analytic: analysePlan(plan), simulation: null,
 *     charts: [], appVersion: '0.1.0', generatedAt: new Date() });
 *   // bytes starts with "%PDF-"
 */
export async function buildReportPdf(input: ReportInput): Promise<Uint8Array> {
  const { plan, analytic, appVersion, generatedAt } = input;
  const charts = input.comparison?.chart ? [...input.charts, input.comparison.chart] : input.charts;
  const simulationForOtherPlan = input.simulation !== null && !samePlan(input.simulation.plan, plan);
  const sim = simulationForOtherPlan ? null : input.simulation;
  const fonts = input.fonts ?? (await loadReportFonts());

  const doc = new jsPDF({ unit: 'pt', format: 'a4', compress: true });
  registerReportFonts(doc, fonts);
  doc.setProperties({
    title: `${REPORT_HEADING}: ${showControlCharacters(plan.title)}`,
    subject: 'Study plan: expected regression-toward-the-mean artefact, power and cautions',
    creator: `Meanward ${appVersion}`,
  });
  doc.setFont(FONT_SANS, 'normal');
  const w = new PdfWriter(doc);
  const A = analytic.analyses;
  const ids = presentAnalysisIds(A);
  const an = (id: AnalysisId) => requireAnalysis(A, id);
  const P = plan.groups.programme;
  const C = plan.groups.comparison;

  // ---- Title, date, caution -------------------------------------------------
  w.heading(REPORT_HEADING, 1);
  w.paragraph(showControlCharacters(plan.title), { size: 13, bold: true, after: 2 });
  w.paragraph(`Generated ${formatDateTime(generatedAt)} by Meanward ${appVersion}.`, { size: 9, muted: true, after: 8 });
  w.note(`Caution: ${CAUTION_LINE}`);

  // ---- Summary -------------------------------------------------------------
  w.heading('Summary');
  const md = requireAnalysis(A, headlineAnalysisId(plan));
  const gap = analytic.model.pretestGap;
  const best = analytic.remedies[0];
  const design = analytic.design;
  const oneGroup = design.shape === 'one-group';
  const pop = plan.population;
  const groupsSentence =
    design.kind === 'existing-groups' || !pop
      ? [
          `This plan compares “${showControlCharacters(P.label)}” (${formatCount(P.poolSize)} people available) with “${showControlCharacters(C.label)}” (${formatCount(C.poolSize)} available).`,
          `How the groups were formed: ${design.rule}`,
        ]
      : [
          `People are drawn from one population, “${showControlCharacters(pop.label)}” (${formatCount(pop.poolSize)} people). ${design.rule}`,
          oneGroup
            ? `About ${formatCount(P.poolSize)} people (${formatShare(design.selectedShare ?? 0)}) are selected, “${showControlCharacters(P.label)}”, and only they are measured again.`
            : `That forms “${showControlCharacters(P.label)}” (about ${formatCount(P.poolSize)} people, ${formatShare(design.selectedShare ?? 0)}) and “${showControlCharacters(C.label)}” (about ${formatCount(C.poolSize)}).`,
          `What the rule means for the analyses: ${design.meaning}`,
        ];
  // With a rule the pretest is described in the whole population (a group cut out by the rule has no reliability of its own).
  const populationReliability = design.kind === 'selection' ? selectionModel(plan).population.reliability : null;
  const reliabilitySentence =
    populationReliability !== null
      ? `The pretest’s reliability in the population is ${formatReliability(populationReliability)} (SEM ${formatPoints(analytic.reliability.sem)} points).`
      : gap === 0
      ? `The two groups have the same pretest mean; the pretest’s within-group reliability is ${formatReliability(analytic.reliability.programme)} in the programme group and ${formatReliability(analytic.reliability.comparison)} in the comparison group (SEM ${formatPoints(analytic.reliability.sem)} points).`
      : `On the pretest the programme group’s mean is ${formatPoints(Math.abs(gap))} points ${gap < 0 ? 'below' : 'above'} the comparison group’s; the pretest’s within-group reliability is ${formatReliability(analytic.reliability.programme)} in the programme group and ${formatReliability(analytic.reliability.comparison)} in the comparison group (SEM ${formatPoints(analytic.reliability.sem)} points).`;
  const clusterLevel = analytic.clusters?.level === 'clusters';
  const planSentence = oneGroup
    ? `The study hopes to detect an effect of ${formatSignedPoints(analytic.tau)} post-test points; with no programme at all the selected people are expected to change by ${formatSignedPoints(design.noProgrammeChange ?? 0)} points.`
    : clusterLevel
    ? `Each programme cluster is to be matched to ${plan.matching.ratio} comparison ${plan.matching.ratio === 1 ? 'cluster' : 'clusters'} on their observed pretest means within a caliper of ${plan.matching.caliper} SDs of the cluster means, and the study hopes to detect an effect of ${formatSignedPoints(analytic.tau)} post-test points.`
    : `Each programme member is to be matched to ${plan.matching.ratio} comparison ${plan.matching.ratio === 1 ? 'person' : 'people'} within a caliper of ${caliperPhrase(plan)}, and the study hopes to detect an effect of ${formatSignedPoints(analytic.tau)} post-test points.`;
  const summary = [
    ...groupsSentence,
    reliabilitySentence,
    clusterSummarySentence(analytic),
    planSentence,
    `Under the model, the ${lowerName(md.name)} is expected to be ${formatSignedPoints(md.expectedEstimate)} points: a regression-toward-the-mean artefact of ${formatSignedPoints(md.regressionArtefact)} points${md.regressionArtefactShare === null ? '' : ` (${formatShare(Math.abs(md.regressionArtefactShare))} of the hoped-for effect${md.regressionArtefactShare < 0 ? ', in the opposite direction' : ''})`}` +
      (md.growthGap === 0
        ? ''
        : ` and an assumed growth gap of ${formatSignedPoints(md.growthGap)} points${md.growthGapShare === null ? '' : ` (${formatShare(Math.abs(md.growthGapShare))})`}, a net bias of ${formatSignedPoints(md.bias)} points`) +
      `, so ${VERDICT_TEXT[md.verdict]}.`,
    md.growthGapNote ?? '',
    md.tolerability.reason,
    md.requiredNNote !== null
      ? `Sample size for ${formatShare(plan.analysis.targetPower ?? 0.8)} power: ${md.requiredNNote}.`
      : md.requiredNPerGroup !== null
        ? `Sample size for ${formatShare(plan.analysis.targetPower ?? 0.8)} power: ${formatCount(md.requiredNPerGroup)} per group. ${analytic.requiredNCounts ?? ''}`
        : '',
    best
      ? `The first-ranked remedy is “${best.title}”, which leaves an expected artefact of ${formatSignedPoints(best.remainingBias)} points (assumption: ${lowerFirst(best.assumption)}).`
      : '',
  ]
    .filter(Boolean)
    .join(' ');
  w.paragraph(summary);

  // ---- Assumptions ---------------------------------------------------------
  w.heading('Inputs and where they came from');
  const inputs = planInputRows(plan, input.provenance);
  w.table(
    [
      { header: 'Input', width: 44 },
      { header: 'Value', width: 26 },
      { header: 'Unit', width: 18 },
      { header: 'Source', width: 12 },
    ],
    inputs.map((r) => [r.label, r.value, r.unit, r.source]),
  );
  writeCovariateInputs(w, plan);
  w.heading('Derived by the planner from these inputs', 3);
  const m = analytic.model;
  w.table(
    [
      { header: 'Quantity', width: 60 },
      { header: 'Value', width: 20, align: 'right' },
      { header: 'Unit', width: 20 },
    ],
    [
      ...(design.kind === 'selection'
        ? [
            ['Share of the population the rule selects', formatShare(design.selectedShare ?? 0), 'share'],
            [`${oneGroup ? 'Selected group' : 'Programme group'} formed by the rule: people (expected)`, formatCount(P.poolSize), 'people'],
            [`${oneGroup ? 'Selected group' : 'Programme group'}: pretest mean, SD`, `${formatPoints(P.pretestMean)}, ${formatPoints(P.pretestSD)}`, 'test points'],
            [`${oneGroup ? 'Not selected (not measured again)' : 'Comparison group'}: people (expected)`, formatCount(C.poolSize), 'people'],
            [`${oneGroup ? 'Not selected' : 'Comparison group'}: pretest mean, SD`, `${formatPoints(C.pretestMean)}, ${formatPoints(C.pretestSD)}`, 'test points'],
          ]
        : []),
      ...(oneGroup ? [['Change expected with no programme', formatSignedPoints(design.noProgrammeChange ?? 0), 'post-test points']] : []),
      ['Standard error of measurement (SEM)', formatPoints(analytic.reliability.sem), 'test points'],
      ...(populationReliability !== null
        ? [['Pretest reliability in the population (ρ)', formatReliability(populationReliability), 'coefficient']]
        : [
            ['Within-group reliability, programme group (ρ_P)', formatReliability(analytic.reliability.programme), 'coefficient'],
            ['Within-group reliability, comparison group (ρ_C)', formatReliability(analytic.reliability.comparison), 'coefficient'],
          ]),
      // With a rule, the model's gap is between the groups' observed pretest means (their true-score gap is smaller).
      ...(oneGroup
        ? []
        : [[design.kind === 'selection' ? 'Observed pretest gap, programme − comparison' : 'True-score gap, programme − comparison (Δ)', formatSignedPoints(m.pretestGap), 'test points']]),
      ['Slope of the outcome on the true pretest (β)', formatPoints(m.beta, 3), 'post-test per test point'],
      ['Residual SD of the outcome (σ_e)', formatPoints(m.residualSD), 'post-test points'],
      ['Programme effect (τ)', formatSignedPoints(analytic.tau), 'post-test points'],
    ],
  );

  const clusterTable = clusterSummaryTable(analytic);
  if (clusterTable.rows.length > 0) {
    w.heading('People in clusters', 3);
    w.table(clusterTable.columns, clusterTable.rows);
  }

  // ---- Results -------------------------------------------------------------
  w.heading('Results by analysis');
  w.paragraph(`${procedureBasisNote(analytic)} “Bias” is the expected estimate minus the programme effect τ.`, {
    size: 9,
    muted: true,
  });
  const analysisCols: TableColumn[] = [
    { header: '', width: 24 },
    ...ids.map((id) => ({ header: an(id).name, width: 19, align: 'right' as const })),
  ];
  const row = (label: string, f: (id: AnalysisId) => string) => [label, ...ids.map(f)];
  const clusterCells = clusterPowerCells(analytic);
  w.table(
    analysisCols,
    [
      row('Expected estimate, procedure as planned (points)', (id) =>
        an(id).expectedEstimateMCSE === null
          ? formatSignedPoints(an(id).expectedEstimate)
          : withMcse(formatSignedPoints(an(id).expectedEstimate), an(id).expectedEstimateMCSE, (x) => formatPoints(x)),
      ),
      row('Formula, unlimited pools (points)', (id) => formatSignedPoints(an(id).formulaEstimate)),
      row('Expected bias (points)', (id) => formatSignedPoints(an(id).bias)),
      row('Expected bias (post-test SDs)', (id) => formatSD(an(id).biasSD)),
      row('Bias as a share of the effect', (id) => (an(id).biasShare === null ? 'no effect hoped for' : formatShare(an(id).biasShare))),
      row('Regression artefact (points; share of the effect)', (id) =>
        `${formatSignedPoints(an(id).regressionArtefact)}${an(id).regressionArtefactShare === null ? '' : `; ${formatShare(an(id).regressionArtefactShare)}`}`,
      ),
      ...(ids.some((id) => an(id).growthGap !== 0)
        ? [row('Assumed growth gap (points; share of the effect)', (id) => `${formatSignedPoints(an(id).growthGap)}${an(id).growthGapShare === null ? '' : `; ${formatShare(an(id).growthGapShare)}`}`)]
        : []),
      row('Verdict', (id) => VERDICT_LABEL[an(id).verdict]),
      row('Tolerable (artefact, false positives ≤ 1.5α, power drop ≤ 10 points)', (id) =>
        an(id).tolerability.tolerable ? 'yes' : `no: ${an(id).tolerability.failed.map((f) => FAILURE_WORDS[f]).join(', ')}`,
      ),
      row('Standard error (points)', (id) => formatPoints(an(id).se)),
      row('Sample sizes assumed (programme / comparison)', (id) => `${formatCount(an(id).nProgramme)} / ${formatCount(an(id).nComparison)}`),
      row('Power', (id) => (an(id).feasible ? formatProbability(an(id).power) : 'not feasible')),
      row('Power if there were no bias', (id) => (an(id).feasible ? formatProbability(an(id).powerWithoutBias) : 'not feasible')),
      row('False-positive rate if the programme does nothing', (id) => (an(id).feasible ? formatProbability(an(id).falsePositiveRate) : 'not feasible')),
      row('Wrong-sign rate (significant, opposite sign)', (id) =>
        !an(id).feasible ? 'not feasible' : an(id).wrongSignRate === null ? 'no effect hoped for' : formatProbability(an(id).wrongSignRate),
      ),
      row(`Per-group n for ${formatShare(plan.analysis.targetPower ?? 0.8)} power`, (id) =>
        an(id).requiredNNote ?? (!an(id).feasible ? 'not feasible' : an(id).requiredNPerGroup === null ? 'not reachable' : formatCount(an(id).requiredNPerGroup)),
      ),
      ...(clusterCells
        ? [
            row(`Clusters per group for ${formatShare(plan.analysis.targetPower ?? 0.8)} power`, clusterCells.needed),
            row('Minimum detectable effect, artefact included (points)', clusterCells.mde),
          ]
        : []),
      ...(ids.some((id) => an(id).varianceInflation !== undefined)
        ? [
            row('Variance against a randomised study of the same size and split', (id) => {
              const v = an(id).varianceInflation;
              return v === undefined ? '—' : `${formatPoints(v)} times`;
            }),
          ]
        : []),
    ],
    { boldRows: [2], boldFirstColumn: true },
  );
  for (const id of ids) {
    w.paragraph(`${an(id).name}, assumption: ${an(id).assumption}`, { size: 8.5, muted: true, after: 2 });
    const v = an(id).varianceInflation;
    if (v !== undefined) {
      w.paragraph(
        `${an(id).name}, cost: its estimate varies about ${formatPoints(v)} times as much as a randomised study’s of the same size and split, so it needs about that many times the sample for the same power (about ${formatPoints(centralCutOffVarianceInflation())} times at a cut-off in the middle of the scores).`,
        { size: 8.5, muted: true, after: 2 },
      );
    }
  }
  for (const id of ids) {
    const reason = an(id).infeasibleReason;
    if (!an(id).feasible && reason !== null) w.note(`${an(id).name}, not feasible: ${reason}`);
  }
  w.gap(6);
  writeUnmeasuredPart(w, plan, analytic);

  w.heading('Simulated studies', 3);
  if (sim === null) {
    w.note(
      simulationForOtherPlan
        ? 'The simulation on record was run for a different version of this plan, so its figures are left out. Run the simulation again in the planner to add simulated bias, RMSE, coverage and balance after matching; the figures above are closed-form only.'
        : 'No simulation has been run for this plan yet: the figures above are closed-form (analytic) only. Run the simulation in the planner to add simulated bias, RMSE, CI coverage, rejection rates and balance after matching.',
    );
  } else {
    w.paragraph(
      oneGroup
        ? `${formatCount(sim.replications)} simulated studies (seed ${sim.seed}). “± x” gives each figure’s Monte Carlo standard error. Each study draws the population, applies the rule and measures the selected people again.`
        : `${formatCount(sim.replications)} simulated studies (seed ${sim.seed}). “± x” gives each figure’s Monte Carlo standard error. The matched difference and “ANCOVA in the matched sample” use the matched people only; the other analyses use everyone available.`,
      { size: 9, muted: true },
    );
    // A one-group study matches nobody: no matched-sample column and no matching table.
    const simCols: { s: SimAnalysisResult; label: string }[] = [
      ...ids.map((id) => ({ s: requireAnalysis(sim.analyses, id), label: an(id).name })),
      ...(oneGroup ? [] : [{ s: sim.ancovaMatchedSample, label: 'ANCOVA in the matched sample' }]),
    ];
    // An analysis the simulation could not summarise has no figures: "not computed", its reason below.
    const srow = (label: string, f: (s: SimAnalysisSummary) => string) => [
      label,
      ...simCols.map(({ s }) => (isFeasible(s) ? f(s) : 'not computed')),
    ];
    const rejectionLabel = sim.tau === 0 ? 'False-positive rate (share significant)' : 'Power (share significant)';
    w.table(
      [{ header: '', width: 22 }, ...simCols.map((s) => ({ header: s.label, width: 15.6, align: 'right' as const }))],
      [
        ['Expected bias before simulation', ...ids.map((id) => formatSignedPoints(an(id).bias)), ...(oneGroup ? [] : ['—'])],
        srow('Simulated bias (points)', (s) => withMcse(formatSignedPoints(s.bias), s.biasMCSE, (x) => formatPoints(x))),
        srow('Mean estimate (points)', (s) => withMcse(formatSignedPoints(s.meanEstimate), s.meanEstimateMCSE, (x) => formatPoints(x))),
        srow('Empirical SE (points)', (s) => withMcse(formatPoints(s.empiricalSE), s.empiricalSEMCSE, (x) => formatPoints(x))),
        srow('RMSE (points)', (s) => withMcse(formatPoints(s.rmse), s.rmseMCSE, (x) => formatPoints(x))),
        srow('95% CI coverage of τ', (s) => withMcse(formatProbability(s.coverage), s.coverageMCSE, formatProbability)),
        srow(rejectionLabel, (s) => withMcse(formatProbability(s.rejectionRate), s.rejectionRateMCSE, formatProbability)),
        srow('Wrong-sign rate', (s) => withMcse(formatProbability(s.wrongSignRate), s.wrongSignRateMCSE, formatProbability)),
        srow('Replications analysed', (s) => formatCount(s.replications)),
      ],
      { boldRows: [1], boldFirstColumn: true, fontSize: 8 },
    );
    for (const { s, label } of simCols) {
      if (!isFeasible(s)) w.paragraph(`${label}: not computed. ${s.reason}`, { size: 9, muted: true });
    }
    for (const d of quickFiguresAgreement(analytic, sim)) w.note(d.note);
    const naive = naiveComparisonTable(analytic, sim);
    if (naive.rows.length > 0) {
      w.heading('What ignoring the clustering costs (simulated)', 3);
      w.paragraph(
        'The same estimates with a person-level SE that ignores the clustering: its reported SE is too small, so its 95% intervals cover the true effect less often than 95%.',
        { size: 9, muted: true },
      );
      w.table(naive.columns, naive.rows, { fontSize: 8 });
    }
  }
  if (sim !== null && !oneGroup) {
    const mt = sim.matching;
    w.heading('Matching and balance (simulated)', 3);
    w.paragraph(
      'Balance on the observed pretest can look fine after matching while the true scores of matched people still differ: that hidden gap is what produces the artefact.',
      { size: 9, muted: true },
    );
    w.table(
      [
        { header: 'Quantity', width: 46 },
        { header: 'Before matching', width: 22, align: 'right' },
        { header: 'After matching', width: 32, align: 'right' },
      ],
      [
        [
          clusterLevel ? 'Programme clusters matched (mean per study)' : 'Programme members matched (mean per study)',
          formatCount(clusterLevel && analytic.clusters ? analytic.clusters.clustersPerGroup.programme : P.poolSize),
          withMcse(formatCount(mt.meanMatchedProgramme), mt.meanMatchedProgrammeMCSE, (x) => formatPoints(x, 1)),
        ],
        ['Share of the programme pool discarded', '—', withMcse(formatProbability(mt.discardedProgrammeShare), mt.discardedProgrammeShareMCSE, formatProbability)],
        [
          'Observed pretest difference (points)',
          formatSignedPoints(mt.observedDifferenceBefore),
          withMcse(formatSignedPoints(mt.observedDifferenceAfter), mt.observedDifferenceAfterMCSE, (x) => formatPoints(x)),
        ],
        ['Observed pretest SMD', formatSD(mt.observedSMDBefore), formatSD(mt.observedSMDAfter)],
        [
          'True-score difference (points): hidden imbalance',
          formatSignedPoints(mt.trueDifferenceBefore),
          withMcse(formatSignedPoints(mt.trueDifferenceAfter), mt.trueDifferenceAfterMCSE, (x) => formatPoints(x)),
        ],
        ['True-score SMD', formatSD(mt.trueSMDBefore), formatSD(mt.trueSMDAfter)],
        ['Variance ratio of the observed pretest (programme / comparison)', '—', formatPoints(mt.varianceRatioAfter)],
      ],
      { boldRows: [4] },
    );
    writeCovariateBalance(w, sim.balance, sim.replications);
  }

  // ---- Charts --------------------------------------------------------------
  if (charts.length > 0) {
    w.heading('Charts');
    let figure = 0;
    for (const chart of charts) {
      figure += 1;
      const label = `Figure ${figure}. ${chart.title}`;
      let svg: SVGSVGElement | null = null;
      let problem = '';
      try {
        svg = parseChartSvg(chart.svg, FONT_SANS);
      } catch (e) {
        problem = e instanceof Error ? e.message : String(e);
      }
      if (!svg) {
        w.paragraph(label, { bold: true, size: 9.5, after: 1 });
        w.paragraph(`This chart could not be drawn in the PDF (${problem}). ${chart.caption}`, { size: 9, muted: true, after: 10 });
        continue;
      }
      const { width: cw, height: ch } = chartBoxOnPage(w, svg);
      // The chart, its label and the first caption lines stay together on one page.
      w.ensure(ch + 60);
      const x = w.left + (w.width - cw) / 2;
      try {
        await drawSvgChart(doc, svg, { x, y: w.y, width: cw, height: ch });
        w.gap(ch + 6);
      } catch (e) {
        w.paragraph(`This chart could not be drawn in the PDF (${e instanceof Error ? e.message : String(e)}).`);
      }
      doc.setFont(FONT_SANS, 'normal');
      w.paragraph(label, { bold: true, size: 9.5, after: 1 });
      w.paragraph(`How to read it: ${chart.caption}`, { size: 9, muted: true, after: 14 });
    }
  }

  // ---- Remedies ------------------------------------------------------------
  w.heading('Recommended design and remedies, ranked');
  const be = analytic.breakEven;
  if (be.reliability !== null && clusterLevel) {
    // Clusters matched on their means: the break-even figure is the reliability of a cluster's mean (core's note says how to reach it).
    w.paragraph(`Break-even reliability of a cluster’s mean (λ): ${formatReliability(be.reliability)}. ${be.note}`);
  } else if (be.reliability !== null) {
    w.paragraph(
      be.alreadyMet
        ? `The pretest’s within-group reliability already meets the level at which the matched artefact stays within ${formatShare(plan.analysis.tolerableBiasShare)} of the hoped-for effect (${formatReliability(be.reliability)}).`
        : `For the matched artefact to stay within ${formatShare(plan.analysis.tolerableBiasShare)} of the hoped-for effect, the within-group reliability would need to reach ${formatReliability(be.reliability)}${be.parallelForms === null ? '' : `, for example by averaging ${be.parallelForms} parallel forms of the pretest (Spearman–Brown)`}.`,
    );
  }
  if (be.note && be.reliability === null) w.paragraph(be.note);
  if (analytic.remedies.length === 0) {
    w.paragraph('No remedy is needed under this model: the planned design already keeps the expected artefact within the tolerable share.');
  }
  analytic.remedies.forEach((r, i) => {
    const parts = [
      `${r.title}${i === 0 ? ' (recommended)' : ''}. ${r.summary}`,
      `Expected artefact with this remedy: ${formatSignedPoints(r.remainingBias)} points${r.remainingBiasShare === null ? '' : ` (${formatShare(r.remainingBiasShare)} of the effect)`}${r.discardedShare === null ? '' : r.discardedShare === 0 ? '; no programme members discarded' : `; about ${formatShare(r.discardedShare)} of the programme pool discarded`}.`,
      r.feasibility ?? '',
      r.estimand ?? '',
      r.neededReliability !== undefined ? `Pooled within-group reliability the correction needs: ${formatReliability(r.neededReliability)}.` : '',
      `Assumes: ${r.assumption}`,
    ].filter(Boolean);
    w.item(`${i + 1}.`, parts.join(' '));
  });

  if (input.comparison && input.comparison.rows.length > 0) writeComparison(w, input.comparison);
  if (input.explorer) {
    // A grid explored from another version of the plan does not describe this one: left out, and said so.
    if (samePlan(input.explorer.plan, plan)) await writeExplorer(w, doc, input.explorer);
    else {
      w.heading('Design explorer');
      w.paragraph('The design-explorer grid was run on another version of this plan, so it is left out of this summary. Run the explorer again on this plan to include it.');
    }
  }

  // ---- Method and references ----------------------------------------------
  w.heading('How this was computed');
  for (const line of MODEL_LINES) w.item('•', line, 9.5);
  if (design.kind === 'selection') for (const line of SELECTION_MODEL_LINES) w.item('•', line, 9.5);
  if (design.kind === 'clusters') for (const line of CLUSTER_MODEL_LINES) w.item('•', line, 9.5);
  if ((plan.covariates?.length ?? 0) > 0) for (const line of COVARIATE_MODEL_LINES) w.item('•', line, 9.5);
  w.heading('References', 3);
  const refs =
    design.kind === 'selection'
      ? [...REFERENCES, ...SELECTION_REFERENCES].sort()
      : design.kind === 'clusters'
        ? [...REFERENCES, ...CLUSTER_REFERENCES.filter((r) => !REFERENCES.includes(r))].sort()
        : REFERENCES;
  for (const ref of refs) w.item('–', ref, 9);

  // ---- Cautions ------------------------------------------------------------
  w.heading('Cautions');
  for (const c of design.kind === 'clusters' ? CAUTIONS.map(clusterCaution) : CAUTIONS) w.item('•', c, 9.5);
  if ((plan.covariates?.length ?? 0) > 0) w.item('•', COVARIATE_CAUTION, 9.5);

  // ---- Reproducibility -----------------------------------------------------
  w.heading('Reproducibility');
  w.table(
    [
      { header: 'Item', width: 40 },
      { header: 'Value', width: 60 },
    ],
    [
      ['Meanward version', appVersion],
      ['Generated', formatDateTime(generatedAt)],
      ['Random seed', String(sim ? sim.seed : plan.simulation.seed) + (sim ? '' : ' (simulation not yet run)')],
      ['Replications', formatCount(sim ? sim.replications : plan.simulation.replications) + (sim ? '' : ' (planned)')],
    ],
  );
  w.paragraph(
    `The complete plan file follows. To recreate the plan, copy the lines between the two marker lines into a text file, join each line ending in ${CONTINUATION} to the next (removing the ${CONTINUATION} and the line break), and open the file in Meanward. The same plan and seed give the same simulated figures.`,
    { size: 9 },
  );
  const json = serializePlan(plan).replace(/\n$/, '');
  w.mono([PLAN_BEGIN, ...json.split('\n'), PLAN_END], CONTINUATION);

  w.footers(`Meanward ${appVersion} · ${REPORT_HEADING} · planning aid, not a statistician’s review`);
  return new Uint8Array(doc.output('arraybuffer'));
}

/** An analysis' name inside a sentence: "Matched post-test difference" → "matched post-test difference" (ANCOVA kept). */
function lowerName(name: string): string {
  return /^[A-Z][a-z]/.test(name) ? name.charAt(0).toLowerCase() + name.slice(1) : name;
}

/** "The groups …." → "the groups …"(for use inside a sentence; no final full stop). */
function lowerFirst(s: string): string {
  const t = s.trim().replace(/\.$/, '');
  return t.length > 1 && /^[A-Z][a-z]/.test(t) ? t.charAt(0).toLowerCase() + t.slice(1) : t;
}
