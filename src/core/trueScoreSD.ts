import { formatNumber, requireNonNegative, requirePositive } from './inputChecks';

/**
 * SD of true scores in a group: sqrt(observedSD² − SEM²), since observed
 * variance = true variance + error variance.
 *
 * Reference: classical test theory (Lord & Novick 1968, ch. 3, from memory).
 *
 * @param observedSD within-group SD of the observed pretest, test points (> 0).
 * @param sem standard error of measurement, test points (0 ≤ sem < observedSD).
 * @returns true-score SD in test points (> 0).
 * @throws Error when sem ≥ observedSD or inputs are out of range.
 * @example trueScoreSD(10, 6) // 8
 */
export function trueScoreSD(observedSD: number, sem: number): number {
  requirePositive(observedSD, 'The pretest SD');
  requireNonNegative(sem, 'The SEM');
  if (!(sem < observedSD)) {
    throw new Error(
      `The pretest's SEM (${formatNumber(sem)} points) is not smaller than the group's pretest SD ` +
        `(${formatNumber(observedSD)}): the pretest would measure nothing but error in that group.`,
    );
  }
  return Math.sqrt(observedSD * observedSD - sem * sem);
}
