import type { ModelParameters } from './modelParameters';
import { formatNumber, requireFinite, requireNonNegative } from './inputChecks';

/*
 * "What if" versions of a model: the same true scores and outcome model, with
 * one design feature changed. Used by the sensitivity curves and the remedies.
 */

/**
 * The model with the pretest's SEM changed (e.g. a longer or averaged pretest)
 * while true scores and the outcome model stay as they are: observed SD_g =
 * sqrt(trueSD_g² + sem²), rho_g = trueSD_g² / SD_g² (classical test theory,
 * Lord & Novick 1968, ch. 3, from memory). Averaging k parallel forms divides
 * the SEM by sqrt(k).
 * @param m model parameters. @param sem new SEM, test points (≥ 0).
 * @returns a new model (m is not changed).
 * @throws Error when sem is negative or not finite.
 * @example trueSD 8.66, sem 5 → 0 gives reliability 1 in both groups
 */
export function modelWithSem(m: ModelParameters, sem: number): ModelParameters {
  requireNonNegative(sem, 'The SEM');
  const tvP = m.trueSD.programme ** 2;
  const tvC = m.trueSD.comparison ** 2;
  const sxP2 = tvP + sem * sem;
  const sxC2 = tvC + sem * sem;
  const nP = m.n.programme;
  const nC = m.n.comparison;
  return {
    ...m,
    mean: { ...m.mean },
    observedSD: { programme: Math.sqrt(sxP2), comparison: Math.sqrt(sxC2) },
    trueSD: { ...m.trueSD },
    sem,
    reliability: { programme: tvP / sxP2, comparison: tvC / sxC2, pooled: (nP * tvP + nC * tvC) / (nP * sxP2 + nC * sxC2) },
    posttestSD: { ...m.posttestSD },
    n: { ...m.n },
  };
}

/**
 * The model with the programme's pretest mean moved so that the gap
 * (programme − comparison) is `gap` points; everything else unchanged.
 * @param m model parameters. @param gap new pretest gap, test points (finite).
 * @returns a new model.
 * @throws Error when gap is not finite.
 * @example modelWithPretestGap(m, 0).pretestGap // 0
 */
export function modelWithPretestGap(m: ModelParameters, gap: number): ModelParameters {
  requireFinite(gap, 'The pretest gap');
  return { ...modelWithSem(m, m.sem), mean: { programme: m.mean.comparison + gap, comparison: m.mean.comparison }, pretestGap: gap };
}

/**
 * The model with different pool sizes (the pooled reliability is pool-size weighted).
 * @param m model parameters. @param nProgramme, nComparison pool sizes (≥ 2).
 * @returns a new model.
 * @throws Error when a pool size is below 2.
 * @example modelWithPoolSizes(m, 180, 2400).n.comparison // 2400
 */
export function modelWithPoolSizes(m: ModelParameters, nProgramme: number, nComparison: number): ModelParameters {
  for (const [n, who] of [
    [nProgramme, 'programme'],
    [nComparison, 'comparison'],
  ] as const) {
    requireFinite(n, `The ${who} pool size`);
    if (n < 2) throw new Error(`The ${who} pool needs at least 2 people; got ${formatNumber(n)}.`);
  }
  return modelWithSem({ ...m, n: { programme: nProgramme, comparison: nComparison } }, m.sem);
}
