import { ANALYSIS_IDS, type AnalysisId, type AnalysisRecord } from './plan';

/**
 * The analyses a result holds, in display order (ANALYSIS_IDS): which ones
 * depends on the plan's design (designAnalysisIds). Every consumer that
 * lists analyses (screen, PDF, CLI, CSV, charts) goes through this, so a new
 * analysis appears everywhere once the design lists it.
 * @example presentAnalysisIds({ ancova: 1, gainScore: 2 }) // ['ancova', 'gainScore']
 */
export function presentAnalysisIds<T>(record: AnalysisRecord<T>): AnalysisId[] {
  return ANALYSIS_IDS.filter((id) => record[id] !== undefined);
}

/**
 * The pairs [id, value] of a result's analyses, in display order.
 * @example presentAnalyses({ gainScore: 2, ancova: 1 }) // [['ancova', 1], ['gainScore', 2]]
 */
export function presentAnalyses<T>(record: AnalysisRecord<T>): [AnalysisId, T][] {
  return presentAnalysisIds(record).map((id) => [id, record[id] as T]);
}

/**
 * One analysis that the caller knows the design has.
 * @throws Error naming the analysis when the result does not hold it (a programming error, not a user one).
 */
export function requireAnalysis<T>(record: AnalysisRecord<T>, id: AnalysisId): T {
  const a = record[id];
  if (a === undefined) throw new Error(`This plan's design has no ${id} analysis.`);
  return a;
}
