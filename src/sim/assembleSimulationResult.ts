import type { Plan } from '../core/plan';
import type { AnalysisRecords } from './analysisRecords';
import { summariseAnalyses } from './summariseAnalyses';
import type { CovariateBalance, SimMatchingSummary, SimulationResult } from './types';

/**
 * A finished simulation's result, as both engines report it: a copy of the
 * plan, the seed, replication count and true effect, the estimators'
 * summaries (summariseAnalyses), the matching summary, the estimates, the
 * example replication and, from the several-covariate engine, the balance
 * of every variable.
 *
 * @param plan the simulated plan (copied, so later edits do not reach the result).
 * @param seed the run's seed.
 * @param total number of replications run (≥ 2).
 * @param records the per-replication estimator records (tau is taken from them).
 * @param matching the matching summary (summariseMatching).
 * @param example replication 0's matched sets, or null when it has not been kept (then empty lists).
 * @param balance per-variable balance (several-covariate engine only; omitted when undefined).
 * @returns the SimulationResult.
 * @throws never: an analysis computed in fewer than two replications is reported as
 *   `{ feasible: false, reason }` and every other analysis is summarised as usual.
 * @example assembleSimulationResult(plan, 1, 200, records, matching, null).example // { pairs: [], discarded: [] }
 */
export function assembleSimulationResult(
  plan: Plan,
  seed: number,
  total: number,
  records: AnalysisRecords,
  matching: SimMatchingSummary,
  example: SimulationResult['example'] | null,
  balance?: CovariateBalance[],
): SimulationResult {
  const { analyses, ancovaMatchedSample, estimates } = summariseAnalyses(records, total);
  const result: SimulationResult = {
    plan: structuredClone(plan),
    seed,
    replications: total,
    tau: records.tau,
    analyses,
    ancovaMatchedSample,
    matching,
    estimates,
    example: example ?? { pairs: [], discarded: [] },
  };
  if (balance !== undefined) result.balance = balance;
  return result;
}
