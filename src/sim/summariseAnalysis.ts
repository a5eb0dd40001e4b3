import type { AnalysisId } from '../core/plan';
import type { SimAnalysisResult } from './types';

/** Per-replication flags stored for one analysis (bit set). */
export const FLAG_COMPUTED = 1;
export const FLAG_COVERED = 2;
export const FLAG_REJECTED = 4;
export const FLAG_WRONG_SIGN = 8;

/**
 * Performance measures of one estimator across Monte Carlo replications, each
 * with its Monte Carlo standard error, by the formulas of Morris, White &
 * Crowther (2019), "Using simulation studies to evaluate statistical methods",
 * Statistics in Medicine 38, Table 6 (n = replications used, θ = tau):
 *   bias = mean(θ̂) - θ,               MCSE = EmpSE / sqrt(n)
 *   EmpSE = sd(θ̂) (divisor n - 1),      MCSE = EmpSE / sqrt(2 (n - 1))
 *   MSE = mean((θ̂ - θ)^2),             MCSE = sqrt(Σ((θ̂ - θ)^2 - MSE)^2 / (n (n - 1)))
 *     RMSE = sqrt(MSE), MCSE by the delta method: MCSE(MSE) / (2 RMSE)
 *   ModSE = sqrt(mean(SE^2)),           MCSE = sqrt(Var(SE^2) / (4 n ModSE^2))
 *   coverage, rejection, wrong sign: proportion p, MCSE = sqrt(p (1 - p) / n)
 * Only replications flagged FLAG_COMPUTED enter.
 *
 * @param id which analysis.
 * @param estimate per-replication estimates (points); entries without FLAG_COMPUTED are ignored.
 * @param se per-replication model SEs (points).
 * @param flags per-replication bit flags (FLAG_*).
 * @param count number of replications stored (prefix of the arrays).
 * @param tau true programme effect, points.
 * @param sample which sample the analysis used (only 'ancova' is run in both).
 * @returns the summary, or `{ feasible: false, reason }` (no figures) when fewer than two
 *   replications could be computed: there is nothing to summarise, and the
 *   other analyses are reported regardless.
 * @throws never.
 * @example
 *   // estimates 1, 2, 3 with tau 2: bias 0, EmpSE 1, MCSE of bias 1/sqrt(3) ≈ 0.577 (hand-worked).
 */
export function summariseAnalysis(
  id: AnalysisId,
  estimate: Float64Array,
  se: Float64Array,
  flags: Uint8Array,
  count: number,
  tau: number,
  sample: 'full' | 'matched' = id === 'matchedDifference' ? 'matched' : 'full',
): SimAnalysisResult {
  let n = 0;
  let sum = 0;
  let sumSE2 = 0;
  let covered = 0;
  let rejected = 0;
  let wrong = 0;
  for (let i = 0; i < count; i++) {
    const f = flags[i] as number;
    if (!(f & FLAG_COMPUTED)) continue;
    n++;
    sum += estimate[i] as number;
    const s = se[i] as number;
    sumSE2 += s * s;
    if (f & FLAG_COVERED) covered++;
    if (f & FLAG_REJECTED) rejected++;
    if (f & FLAG_WRONG_SIGN) wrong++;
  }
  if (n < 2) {
    const why =
      sample === 'matched'
        ? 'Almost no programme member found a comparison partner within the caliper (it needs at least two matched sets per replication): widen the caliper, allow matching with replacement or enlarge the comparison pool.'
        : 'The pools are too small, or the pretest has no spread, for this analysis.';
    return {
      id,
      sample,
      feasible: false,
      reason: `The ${describe(id, sample)} could be computed in only ${n} of ${count} simulated studies, too few to summarise. ${why}`,
      replications: n,
    };
  }
  const mean = sum / n;
  const modVar = sumSE2 / n;
  let ss = 0; // Σ (θ̂ - mean)^2
  let mse = 0;
  let varSE2 = 0;
  for (let i = 0; i < count; i++) {
    if (!((flags[i] as number) & FLAG_COMPUTED)) continue;
    const e = estimate[i] as number;
    ss += (e - mean) * (e - mean);
    mse += (e - tau) * (e - tau);
    const s = se[i] as number;
    varSE2 += (s * s - modVar) * (s * s - modVar);
  }
  mse /= n;
  let mseDev = 0;
  for (let i = 0; i < count; i++) {
    if (!((flags[i] as number) & FLAG_COMPUTED)) continue;
    const e = estimate[i] as number;
    const d = (e - tau) * (e - tau) - mse;
    mseDev += d * d;
  }
  const empSE = Math.sqrt(ss / (n - 1));
  const mseMCSE = Math.sqrt(mseDev / (n * (n - 1)));
  const rmse = Math.sqrt(mse);
  const modSE = Math.sqrt(modVar);
  const prop = (k: number): [number, number] => {
    const p = k / n;
    return [p, Math.sqrt((p * (1 - p)) / n)];
  };
  const [coverage, coverageMCSE] = prop(covered);
  const [rejectionRate, rejectionRateMCSE] = prop(rejected);
  const [wrongSignRate, wrongSignRateMCSE] = prop(wrong);
  return {
    id,
    sample,
    feasible: true,
    meanEstimate: mean,
    meanEstimateMCSE: empSE / Math.sqrt(n),
    bias: mean - tau,
    biasMCSE: empSE / Math.sqrt(n),
    empiricalSE: empSE,
    empiricalSEMCSE: empSE / Math.sqrt(2 * (n - 1)),
    meanModelSE: modSE,
    meanModelSEMCSE: modSE > 0 ? Math.sqrt(varSE2 / (n - 1) / (4 * n * modVar)) : 0,
    rmse,
    rmseMCSE: rmse > 0 ? mseMCSE / (2 * rmse) : 0,
    coverage,
    coverageMCSE,
    rejectionRate,
    rejectionRateMCSE,
    wrongSignRate,
    wrongSignRateMCSE,
    replications: n,
  };
}

function describe(id: AnalysisId, sample: 'full' | 'matched'): string {
  if (id === 'ancova' && sample === 'matched') return 'ANCOVA in the matched sample';
  switch (id) {
    case 'matchedDifference':
      return 'matched post-test difference';
    case 'ancova':
      return 'ANCOVA on the observed pretest';
    case 'gainScore':
      return 'gain-score comparison';
    case 'correctedAncova':
      return 'reliability-corrected ANCOVA';
    case 'regressionDiscontinuity':
      return 'regression-discontinuity analysis';
    case 'prePostChange':
      return 'pre–post change';
    case 'personLevelAncova':
      return 'person-level ANCOVA';
  }
}
