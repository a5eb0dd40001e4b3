import { ancovaEstimate } from './ancovaEstimate';
import { SLOT_ANCOVA_MATCHED, SLOT_MATCHED, type AnalysisRecords } from './analysisRecords';
import { matchedDifferenceEstimate } from './matchedDifferenceEstimate';
import type { StackedComparison } from './multivariate/ancovaOnCovariates';

/** Layout of the matched-sample sums (MS_*) both pretest-matching engines accumulate per replication. */
export const MS_M = 0; // matched programme members
export const MS_DS = 1; // Σ D (D = Y − mean of the partners' Y)
export const MS_DSS = 2; // Σ D²
export const MS_QSX = 3; // matched programme: Σ dx, Σ dx², Σ dy, Σ dy², Σ dx·dy about the programme centres
export const MS_QSXX = 4;
export const MS_QSY = 5;
export const MS_QSYY = 6;
export const MS_QSXY = 7;
export const MS_RN = 8; // stacked partner rows: count and the same sums about the comparison centres
export const MS_RSX = 9;
export const MS_RSXX = 10;
export const MS_RSY = 11;
export const MS_RSYY = 12;
export const MS_RSXY = 13;
export const MS_COUNT = 14;

/**
 * The two matched-sample analyses of one replication, from its matched-set
 * sums, shared by the one-pretest fast path and the pools engine: the matched
 * difference with the matching-weights SE (Abadie & Imbens 2006; the reuse
 * term `excess` is 0 without replacement) and ANCOVA on the pretest in the
 * stacked matched sample (use counts in its SE). Nothing is recorded with
 * fewer than 2 matched programme members.
 * @param records the estimator records. @param i replication. @param s sums in the MS_* layout.
 * @param centres the programme's (px, py) and comparison's (cx, cy) pretest and outcome centres the sums are taken about.
 * @param sigma2C the comparison pool's residual variance of Y given X. @param excess the matching weights' reuse excess.
 * @param moments scratch (12) in ancovaEstimate's layout. @param out scratch (3). @param stacked the stacked rows (sigma2 is set here).
 * @example recordMatchedSampleAnalyses(records, 0, sums, { px: 44, py: 0, cx: 54, cy: 0 }, 60, 0, moments, out, stacked)
 */
export function recordMatchedSampleAnalyses(
  records: AnalysisRecords,
  i: number,
  s: Float64Array,
  centres: { px: number; py: number; cx: number; cy: number },
  sigma2C: number,
  excess: number,
  moments: Float64Array,
  out: Float64Array,
  stacked: { sigma2: number },
): void {
  const m = s[MS_M] as number;
  if (!(m >= 2)) return;
  if (matchedDifferenceEstimate(m, s[MS_DS] as number, s[MS_DSS] as number, sigma2C, excess, out)) {
    records.record(SLOT_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
  }
  const qSx = s[MS_QSX] as number, qSxx = s[MS_QSXX] as number, qSy = s[MS_QSY] as number;
  const qSyy = s[MS_QSYY] as number, qSxy = s[MS_QSXY] as number;
  const rN = s[MS_RN] as number, rSx = s[MS_RSX] as number, rSxx = s[MS_RSXX] as number;
  const rSy = s[MS_RSY] as number, rSyy = s[MS_RSYY] as number, rSxy = s[MS_RSXY] as number;
  moments[0] = m; moments[1] = centres.px + qSx / m; moments[2] = centres.py + qSy / m;
  moments[3] = qSxx - (qSx * qSx) / m; moments[4] = qSxy - (qSx * qSy) / m; moments[5] = qSyy - (qSy * qSy) / m;
  moments[6] = rN; moments[7] = centres.cx + rSx / rN; moments[8] = centres.cy + rSy / rN;
  moments[9] = rSxx - (rSx * rSx) / rN; moments[10] = rSxy - (rSx * rSy) / rN; moments[11] = rSyy - (rSy * rSy) / rN;
  stacked.sigma2 = sigma2C;
  if (ancovaEstimate(moments, 1, out, stacked as StackedComparison)) {
    records.record(SLOT_ANCOVA_MATCHED, i, out[0] as number, out[1] as number, out[2] as number);
  }
}
