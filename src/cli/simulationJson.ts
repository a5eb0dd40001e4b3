import type { SimulationResult } from '../sim/types';

/** The simulation block of `meanward run --json`: summaries only unless per-replication detail is asked for. */
export type SimulationJson = Omit<SimulationResult, 'plan' | 'estimates' | 'example'> &
  Partial<Pick<SimulationResult, 'estimates' | 'example'>>;

/**
 * Select what `--json` prints from a simulation result: the per-analysis
 * summaries (analyses.*: meanEstimate, bias, empiricalSE, rmse, coverage,
 * rejectionRate, wrongSignRate, each with its Monte Carlo SE, and `feasible: true`;
 * an analysis computed in fewer than two replications is instead
 * `{ id, sample, feasible: false, reason, replications }`), the matched-sample
 * ANCOVA and the matching summary (raw points and SMDs), and, for plans with
 * covariates or a propensity / Mahalanobis distance, `balance[]`: per variable
 * (pretest first) {name, measured, exact, observedSMDBefore, observedSMDAfter,
 * trueSMDBefore, trueSMDAfter, varianceRatioAfter}, each with its MCSE. The per-replication
 * estimates and the example replication are large and appear only with
 * `withDetail` (the --estimates flag). The plan is printed once, beside it.
 * Formatting only: every figure comes from src/sim.
 */
export function simulationJson(result: SimulationResult, withDetail: boolean): SimulationJson {
  const { plan: _plan, estimates, example, ...summary } = result;
  return withDetail ? { ...summary, estimates, example } : summary;
}
