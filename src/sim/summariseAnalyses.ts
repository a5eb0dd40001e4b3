import type { AnalysisId } from '../core/plan';
import { ANALYSIS_SLOT, SLOT_ANCOVA_MATCHED, type AnalysisRecords } from './analysisRecords';
import { FLAG_COMPUTED, summariseAnalysis } from './summariseAnalysis';
import type { SimulationResult } from './types';

/**
 * The estimator part of a simulation's result, from its per-replication
 * records: each of the four analyses summarised over the replications by
 * summariseAnalysis (Morris, White & Crowther 2019, Table 6) — the matched
 * difference in the matched sample, the others in the full pools — ANCOVA in
 * the matched sample likewise, and each analysis' computed estimates in
 * replication order (for histograms).
 *
 * @param records the records both engines fill (AnalysisRecords; tau is taken from them).
 * @param total number of replications run (≥ 2; a prefix of the records).
 * @returns analyses, ancovaMatchedSample and estimates of a SimulationResult.
 * @throws never: an analysis computed in fewer than two replications is reported as
 *   `{ feasible: false, reason }` and every other analysis is summarised as usual.
 * @example
 *   // gain-score estimates 1, 2, 3 with tau 2 → analyses.gainScore.bias 0, estimates.gainScore [1, 2, 3] (hand-worked).
 */
export function summariseAnalyses(
  records: AnalysisRecords,
  total: number,
): Pick<SimulationResult, 'analyses' | 'ancovaMatchedSample' | 'estimates'> {
  const { est, se, flags, tau } = records;
  const summary = (id: AnalysisId, slot: number, sample: 'full' | 'matched') =>
    summariseAnalysis(id, est[slot] as Float64Array, se[slot] as Float64Array, flags[slot] as Uint8Array, total, tau, sample);
  const analyses = {} as SimulationResult['analyses'];
  const estimates = {} as SimulationResult['estimates'];
  for (const id of records.ids) {
    const slot = ANALYSIS_SLOT[id];
    analyses[id] = summary(id, slot, id === 'matchedDifference' ? 'matched' : 'full');
    const list: number[] = [];
    const e = est[slot] as Float64Array;
    const f = flags[slot] as Uint8Array;
    for (let i = 0; i < total; i++) if ((f[i] as number) & FLAG_COMPUTED) list.push(e[i] as number);
    estimates[id] = list;
  }
  return { analyses, ancovaMatchedSample: summary('ancova', SLOT_ANCOVA_MATCHED, 'matched'), estimates };
}
