import { formatNumber, requireNonNegative, requirePositive } from './inputChecks';

/**
 * Reliability implied by a standard error of measurement in a population with
 * observed SD `sd`: reliability = 1 − SEM² / SD².
 *
 * Reference: classical test theory (Lord & Novick 1968, eq. 3.8.4 rearranged, from memory).
 *
 * @param sem standard error of measurement, test points (0 ≤ sem < sd).
 * @param sd observed-score SD of the population, test points (> 0).
 * @returns reliability in (0, 1].
 * @throws Error when sem is negative, sd is not positive, or sem ≥ sd (the
 *   test would measure nothing but error in that population).
 * @example semToReliability(5, 10) // 0.75
 */
export function semToReliability(sem: number, sd: number): number {
  requireNonNegative(sem, 'The SEM');
  requirePositive(sd, 'The pretest SD');
  if (!(sem < sd)) {
    throw new Error(
      `The SEM (${formatNumber(sem)} points) must be smaller than the pretest SD (${formatNumber(sd)}); ` +
        'otherwise the pretest would measure nothing but error.',
    );
  }
  return 1 - (sem * sem) / (sd * sd);
}
