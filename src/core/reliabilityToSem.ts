import { requirePositive, requireReliability } from './inputChecks';

/**
 * Standard error of measurement (SEM) from a reliability coefficient:
 * SEM = SD · sqrt(1 − reliability).
 *
 * Reference: classical test theory (Lord & Novick 1968, eq. 3.8.4, from memory;
 * Gulliksen 1950).
 *
 * @param reliability reliability in the population whose SD is `sd`; in (0, 1].
 * @param sd observed-score SD of that population, test points (> 0).
 * @returns the SEM in test points (≥ 0).
 * @throws Error when reliability is outside (0, 1] or sd is not positive.
 * @example reliabilityToSem(0.75, 10) // 5
 */
export function reliabilityToSem(reliability: number, sd: number): number {
  requireReliability(reliability);
  requirePositive(sd, 'The pretest SD');
  return sd * Math.sqrt(1 - reliability);
}
