import type { AnalyticAnalysis, AnalyticResults, BreakEven } from '../analyticResults';
import type { AnalysisId, AnalysisRecord, Plan } from '../plan';
import type { PlannedProcedureEstimates } from '../plannedProcedure';
import type { AnalysisSettings } from '../analyseAnalysis';
import { ANALYSIS_DESCRIPTIONS } from '../analysisDescriptions';
import { analysisSettings } from '../analysisSettings';
import { analyticAnalysisRecord } from '../analyticAnalysisRecord';
import { assertFiniteOutput } from '../assertFiniteOutput';
import { matchedDifferenceFeasibility } from '../matchedDifferenceFeasibility';
import { withPlannedFigures } from '../withPlannedFigures';
import { globalLinearDiscontinuity, selectionArtefact, type RegressionDiscontinuityEstimator } from './selectionEstimates';
import { selectionMatchedFigures, selectionMatchedShare, type SelectionMatchedFigures } from './selectionMatching';
import { selectionModel, type SelectionModel } from './selectionModel';
import { selectionModelParameters } from './selectionModelParameters';
import { selectionRemedies } from './selectionRemedies';
import { selectionStandardError } from './selectionStandardError';
import { selectionSummary } from './selectionSummary';
import { designAnalysisIds } from './studyDesign';

/** Why exact matching is impossible after a sharp cut-off on the pretest (shown as the matched difference's reason). */
export const NO_OVERLAP_REASON =
  'A sharp cut-off on the pretest leaves no overlap: every programme member scored on one side of the cut-off and every comparison member on the other, ' +
  'so nobody can be matched on the same pretest score. Compare the groups by regression discontinuity (adjust for the pretest the rule used) instead, ' +
  'or, if the rule was in fact applied with some leeway, describe it as a probability rule.';

/** Wording beside the matched difference's SE before the quick simulation replaces it. */
export const SELECTION_MATCHED_SE_NOTE =
  'Approximate SE: from the conditional variances of the outcome at exact matching with unlimited pools; it ignores the caliper and the reuse of partners. The quick simulation of the planned procedure replaces it.';

/**
 * Everything the planner shows without simulation for a plan whose groups a
 * selection rule forms (or a one-group study of the people a rule selected):
 * per analysis the expected estimate, bias, verdict, SE, power, error rates
 * and required n; the model parameters filled from the groups; the design
 * summary; ranked remedies. analysePlan dispatches here when
 * isSelectionDesign(plan) (the design seam).
 *
 * Estimates: selectionArtefact (gain, ANCOVA, corrected ANCOVA, regression
 * discontinuity from the group moments; the matched difference by numerical
 * integration of the truncated bivariate normal; the one-group pre–post change),
 * plus tau and outcome.growthGap (two groups: the programme's extra growth; one
 * group: the growth the population shows without the programme). SEs:
 * selectionStandardError. Biases are scaled by the plan's posttest SD (the
 * population's, as entered). The required n is the programme group's size with
 * the population scaled so the rule keeps its split (matched programme members
 * for the matched difference). The break-even reliability belongs to existing
 * groups: null here, with a note saying what to look at instead.
 *
 * With `planned` (quick simulation figures, plain data) the matched difference
 * takes the planned-procedure figures exactly as for existing groups (withPlannedFigures).
 *
 * Reference: Lord (1960); Porter (1967); Kenny (1975); Goldberger (1972);
 * Cappelleri, Darlington & Trochim (1994); Barnett, van der Pols & Dobson (2005).
 * @param plan a validated plan with a selection rule (or a one-group design).
 * @param planned optional quick figures of the planned procedure.
 * @param rd the regression-discontinuity estimator (default: one straight line, OLS).
 * @returns AnalyticResults in which every number is finite.
 * @throws Error with a researcher-readable message when the inputs contradict each other or the rule leaves too few people.
 * @example population mean 50, SD 10, reliability .8, r .7, lowest fifth on the pretest, tau 0:
 *   analyses.ancova.expectedEstimate 0.00, analyses.gainScore.expectedEstimate +5.25
 */
export function analyseSelectionPlan(
  plan: Plan,
  planned?: PlannedProcedureEstimates,
  rd: RegressionDiscontinuityEstimator = globalLinearDiscontinuity,
): AnalyticResults {
  const m = selectionModel(plan);
  const model = selectionModelParameters(m, plan);
  const effects = { tau: model.effect, growth: plan.outcome.growthGap };
  const posttestSD = plan.outcome.posttestSD;
  const ids = designAnalysisIds(plan);
  const matched = ids.includes('matchedDifference') ? selectionMatchedFigures(m) : null;
  const matchedProgramme = matched?.overlap ? m.programme.n * selectionMatchedShare(m, plan.matching) : 0;
  const settings = analysisSettings(plan, matchedProgramme);
  const formula = Object.fromEntries(
    ids.map((id) => [id, selectionAnalysis(id, m, effects, posttestSD, settings, matched, rd)]),
  ) as AnalysisRecord<AnalyticAnalysis>;
  const analyses = withPlannedFigures(formula, planned, effects.tau, posttestSD, settings);
  const results: AnalyticResults = {
    model,
    reliability: { programme: model.reliability.programme, comparison: model.reliability.comparison, sem: model.sem },
    tau: effects.tau,
    analyses,
    breakEven: selectionBreakEven(m),
    remedies: selectionRemedies(m, {
      tau: effects.tau,
      growth: effects.growth,
      tolerableShare: plan.analysis.tolerableBiasShare,
      assumedReliability: plan.analysis.assumedReliability,
    }),
    procedure: planned
      ? { basis: 'planned-procedure', replications: planned.replications, seed: planned.seed }
      : { basis: 'formula', replications: null, seed: null },
    design: selectionSummary(m, formula, effects, posttestSD),
  };
  return assertFiniteOutput(results, 'results');
}

/** One analysis' closed-form record in a selection design. */
function selectionAnalysis(
  id: AnalysisId,
  m: SelectionModel,
  effects: { tau: number; growth: number },
  posttestSD: number,
  s: AnalysisSettings,
  matched: SelectionMatchedFigures | null,
  rd: RegressionDiscontinuityEstimator,
): AnalyticAnalysis {
  const { name, assumption } = ANALYSIS_DESCRIPTIONS[id];
  const estimate = effects.tau + effects.growth + (id === 'matchedDifference' && matched ? matched.artefact : selectionArtefact(id, m, s.assumedReliability, rd));
  const common = { id, name, assumption, estimate, tau: effects.tau, posttestSD };
  if (id === 'matchedDifference') {
    const reason = !matched?.overlap ? NO_OVERLAP_REASON : matchedDifferenceFeasibility(s.matchedProgramme, m.programme.n, s);
    if (reason !== null) {
      const n = Math.max(0, s.matchedProgramme);
      return analyticAnalysisRecord({ ...common, precision: null, infeasibleReason: reason, nProgramme: n, nComparison: n * s.ratio }, s);
    }
  }
  const p = selectionStandardError(id, m, {
    assumedReliability: s.assumedReliability,
    ratio: s.ratio,
    matchedProgramme: s.matchedProgramme,
    matched: matched ?? undefined,
    rd,
  });
  const record = analyticAnalysisRecord(
    { ...common, precision: { se: p.se, df: p.df, design: p.design }, infeasibleReason: null, nProgramme: p.nProgramme, nComparison: p.nComparison },
    s,
  );
  if (id === 'regressionDiscontinuity' && p.varianceInflation !== undefined) return { ...record, varianceInflation: p.varianceInflation };
  if (id === 'matchedDifference') return { ...record, standardErrorNote: SELECTION_MATCHED_SE_NOTE };
  return record;
}

/** The break-even reliability is an existing-groups idea: null here, with what to look at instead. */
function selectionBreakEven(m: SelectionModel): BreakEven {
  return {
    reliability: null,
    alreadyMet: false,
    parallelForms: null,
    note:
      m.design.shape === 'one-group'
        ? 'A break-even pretest reliability belongs to existing groups. In a one-group study of selected people, look at the expected change with no programme and at the remedies: a separate baseline, averaged baselines, or a comparison group.'
        : 'A break-even pretest reliability belongs to existing groups. Here the rule decides which analyses are biased: look at the design summary and the remedies (adjust for the score the rule used, where it was measured).',
  };
}
