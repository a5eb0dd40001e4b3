import { formatNumber, requireOpenInterval } from '../inputChecks';

/**
 * Reliability of a cluster's observed mean as a measure of the cluster's
 * true mean when the outcome is measured on a NEW cohort of the cluster:
 * ICC(2) = n·ICC / (1 + (n − 1)·ICC), the Spearman–Brown formula with the
 * ICC as the reliability of one person's score as a measure of the cluster
 * (Bliese 2000; Snijders & Bosker 2012, eq. 3.17, from memory). It does not
 * depend on the test's reliability: measurement error and which people were
 * tested both sit in the within-cluster part of the ICC.
 *
 * @param size people tested per cluster (≥ 1, may be fractional for averages over years).
 * @param icc intraclass correlation of the observed scores within a group, in (0, 1).
 * @returns λ in (0, 1).
 * @throws Error when size < 1 or icc outside (0, 1).
 * @example newCohortClusterMeanReliability(25, 0.2) // 0.8621 (5 / 5.8)
 */
export function newCohortClusterMeanReliability(size: number, icc: number): number {
  requireOpenInterval(icc, 0, 1, 'The ICC');
  if (!(size >= 1) || !Number.isFinite(size)) throw new Error(`The number of people per cluster must be at least 1; got ${formatNumber(size)}.`);
  return (size * icc) / (1 + (size - 1) * icc);
}

/** Variance components of one group's observed pretest (points²). */
export interface PretestComponents {
  /** τ²: variance of the clusters' true means. */
  betweenTrue: number;
  /** σ²_wT: variance of a person's true deviation from the cluster's true mean. */
  withinTrue: number;
  /** SEM²: measurement error variance. */
  error: number;
}

/**
 * Reliability of a cluster's observed pretest mean as a measure of the true
 * mean of the SAME people (who also sit the posttest): the cluster's true
 * mean plus those people's average true deviation, over the observed mean's
 * variance (classical test theory applied to a mean; Lord & Novick 1968):
 *   λ = (τ² + σ²_wT / n) / (τ² + (σ²_wT + SEM²) / n).
 * With no measurement error it is 1: the people's own true scores are then
 * known exactly.
 *
 * @param c the group's variance components (points², τ² > 0, others ≥ 0).
 * @param size people tested per cluster (≥ 1).
 * @returns λ in (0, 1].
 * @throws Error on a non-positive τ², a negative component or size < 1.
 * @example ICC .2, reliability .8, SD 15 (τ² 45, σ²_wT 135, SEM² 45), 25 people: 50.4 / 52.2 = 0.9655
 */
export function samePeopleClusterMeanReliability(c: PretestComponents, size: number): number {
  if (!(c.betweenTrue > 0) || !(c.withinTrue >= 0) || !(c.error >= 0)) {
    throw new Error('The variance components of the pretest must be positive (between clusters) and not negative (within clusters, error).');
  }
  if (!(size >= 1) || !Number.isFinite(size)) throw new Error(`The number of people per cluster must be at least 1; got ${formatNumber(size)}.`);
  return (c.betweenTrue + c.withinTrue / size) / (c.betweenTrue + (c.withinTrue + c.error) / size);
}

/**
 * Reliability of the average of `years` yearly cluster means (each year a
 * different cohort of `size` people), as a measure of what predicts this
 * year's outcome: the cluster's true mean, plus (cohort 'same') this year's
 * people's true deviation, which only one of the years carries:
 *   λ = (τ² + [same]·σ²_wT / (n·years)) / (τ² + (σ²_wT + SEM²) / (n·years)).
 * With years = 1 it is the new-cohort ICC(2) or the same-people λ above.
 * Reference: Spearman–Brown over years (Spearman 1910; Brown 1910), the clusters' true means assumed stable.
 * @param c variance components. @param size people per cluster per year (≥ 1).
 * @param years yearly means averaged (≥ 1). @param same whether the posttest is taken by this year's pretested people.
 * @returns λ in (0, 1]. @throws Error as samePeopleClusterMeanReliability.
 * @example τ² 45, σ²_wT 135, SEM² 45, 25 people, 3 years, new cohort → 45 / (45 + 180/75) = 0.9494
 */
export function averagedClusterMeanReliability(c: PretestComponents, size: number, years: number, same: boolean): number {
  if (!(years >= 1) || !Number.isFinite(years)) throw new Error(`The number of years averaged must be at least 1; got ${formatNumber(years)}.`);
  const n = size * years;
  const lambda = samePeopleClusterMeanReliability(c, n);
  if (same) return lambda;
  return c.betweenTrue / (c.betweenTrue + (c.withinTrue + c.error) / n);
}
