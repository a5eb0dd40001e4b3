import { formatNumber, requireNonNegative } from '../inputChecks';
import type { CovariateModel, GroupMatrices } from './covariateModel';

/*
 * "What if" versions of a covariate model: the same true scores and outcome
 * model (Sigma_T, beta, residual), with one design feature changed. Used by
 * the break-even reliability and the remedies.
 */

/**
 * The covariate model with variable j's SEM changed (e.g. the pretest averaged
 * over parallel forms: SEM / sqrt(k)); true scores, slopes and residual stay.
 * Only Sigma_X[j, j] changes (errors are independent of everything else):
 * Sigma_X,g[j, j] = Sigma_T,g[j, j] + sem²; reliabilities follow.
 * @param cm the model. @param j variable index (0 = pretest). @param sem new SEM (≥ 0), in j's units.
 * @returns a new model (cm is not changed).
 * @throws Error when sem is negative or j is not a variable.
 * @example covariateModelWithSem(cm, 0, 0).reliability.comparison[0] // 1
 */
export function covariateModelWithSem(cm: CovariateModel, j: number, sem: number): CovariateModel {
  requireNonNegative(sem, 'The SEM');
  if (!(j >= 0 && j < cm.names.length)) throw new Error(`There is no variable ${formatNumber(j)} in this model.`);
  const withVar = (s: number[][], t: number[][]): number[][] =>
    s.map((row, i) => row.map((x, l) => (i === j && l === j ? (t[j]![j] as number) + sem * sem : x)));
  const sxP = withVar(cm.sigmaX.programme, cm.sigmaT.programme);
  const sxC = withVar(cm.sigmaX.comparison, cm.sigmaT.comparison);
  const semv = cm.sem.map((s, i) => (i === j ? sem : s));
  return rebuild({ ...cm, sem: semv }, sxP, sxC, cm.n);
}

/**
 * The covariate model with different pool sizes (the pooled matrices are
 * pool-size weighted).
 * @param cm the model. @param nProgramme, nComparison pool sizes (≥ 2).
 * @returns a new model. @throws Error when a pool size is below 2.
 * @example covariateModelWithPoolSizes(cm, 180, 2400).n.comparison // 2400
 */
export function covariateModelWithPoolSizes(cm: CovariateModel, nProgramme: number, nComparison: number): CovariateModel {
  if (!(nProgramme >= 2 && nComparison >= 2)) {
    throw new Error(`Each pool needs at least 2 people; got ${formatNumber(nProgramme)} and ${formatNumber(nComparison)}.`);
  }
  return rebuild(cm, cm.sigmaX.programme, cm.sigmaX.comparison, { programme: nProgramme, comparison: nComparison });
}

/**
 * The covariate model with the given variables measured as well (a
 * confounder that the study would now record, with its stated reliability).
 * @param cm the model. @param indices variables to mark measured.
 * @returns a new model. @throws never.
 * @example covariateModelWithMeasured(cm, [3]).measured[3] // true
 */
export function covariateModelWithMeasured(cm: CovariateModel, indices: number[]): CovariateModel {
  const measured = cm.measured.map((x, i) => x || indices.includes(i));
  return { ...cm, measured, measuredIndices: measured.flatMap((x, i) => (x ? [i] : [])) };
}

function rebuild(cm: CovariateModel, sxP: number[][], sxC: number[][], n: { programme: number; comparison: number }): CovariateModel {
  const N = n.programme + n.comparison;
  const pool = (a: number[][], c: number[][]): number[][] =>
    a.map((row, i) => row.map((x, l) => (n.programme * x + n.comparison * (c[i]![l] as number)) / N));
  const sigmaX: GroupMatrices = { programme: sxP, comparison: sxC, pooled: pool(sxP, sxC) };
  const sigmaT: GroupMatrices = {
    programme: cm.sigmaT.programme,
    comparison: cm.sigmaT.comparison,
    pooled: pool(cm.sigmaT.programme, cm.sigmaT.comparison),
  };
  const rel = (t: number[][], s: number[][]): number[] => t.map((row, i) => (row[i] as number) / (s[i]![i] as number));
  const sd = (s: number[][]): number[] => s.map((row, i) => Math.sqrt(row[i] as number));
  const sdC = sd(sxC);
  return {
    ...cm,
    correlations: sxC.map((row, i) => row.map((x, l) => (i === l ? 1 : x / ((sdC[i] as number) * (sdC[l] as number))))),
    observedSD: { programme: sd(sxP), comparison: sdC },
    reliability: { programme: rel(sigmaT.programme, sxP), comparison: rel(sigmaT.comparison, sxC), pooled: rel(sigmaT.pooled, sigmaX.pooled) },
    sigmaX,
    sigmaT,
    n: { ...n },
  };
}
