import type { AnalyticAnalysis } from '../core/analyticResults';
import { presentAnalyses } from '../core/presentAnalyses';
import { ANALYSIS_IDS, type AnalysisId } from '../core/plan';
import type { MeanwardState } from './store';

/** Selectors: small reads of the state that components share. */
export const selectDraft = (s: MeanwardState) => s.draft;
export const selectValidPlan = (s: MeanwardState) => s.validPlan;
export const selectProblems = (s: MeanwardState) => s.problems;
export const selectAnalytic = (s: MeanwardState) => s.analytic;
export const selectAnalyticStale = (s: MeanwardState) => s.analyticStale;
export const selectSimulation = (s: MeanwardState) => s.simulation;
export const selectSimulationResult = (s: MeanwardState) => s.simulation.result;
export const selectHighlight = (s: MeanwardState) => s.highlight;
export const selectSetHighlight = (s: MeanwardState) => s.setHighlight;
export const selectNotice = (s: MeanwardState) => s.notice;
export const selectIsValid = (s: MeanwardState) => s.problems.length === 0;

/** The message for one field, or undefined. */
export const selectProblemFor = (field: string) => (s: MeanwardState) =>
  s.problems.find((p) => p.field === field)?.message;

let lastProblems: MeanwardState['problems'] | null = null;
let lastGeneral: MeanwardState['problems'] = [];
/** Problems not tied to a single field (memoised so React sees a stable array). */
export const selectGeneralProblems = (s: MeanwardState) => {
  if (s.problems !== lastProblems) {
    lastProblems = s.problems;
    lastGeneral = s.problems.filter((p) => p.field === '');
  }
  return lastGeneral;
};

const EMPTY: AnalyticAnalysis[] = [];
let lastAnalytic: MeanwardState['analytic'] = null;
let lastList: AnalyticAnalysis[] = EMPTY;
/**
 * The closed-form results per analysis in display order (empty before the
 * first valid plan). Memoised on the results object so React sees a stable
 * array between changes.
 */
export const selectAnalysesInOrder = (s: MeanwardState): AnalyticAnalysis[] => {
  if (s.analytic !== lastAnalytic) {
    lastAnalytic = s.analytic;
    lastList = s.analytic ? presentAnalyses(s.analytic.analyses).map(([, a]) => a) : EMPTY;
  }
  return lastList;
};
