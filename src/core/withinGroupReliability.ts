import { semToReliability } from './semToReliability';

/**
 * Reliability of the pretest within one group, given the instrument's SEM and
 * that group's observed SD: 1 − SEM² / SD_g². A group narrower than the
 * population the manual's reliability came from has a lower reliability for
 * the same SEM (common practice).
 *
 * Reference: classical test theory (Lord & Novick 1968, ch. 3, from memory).
 *
 * @param sem standard error of measurement, test points (0 ≤ sem < observedSD).
 * @param observedSD the group's observed pretest SD, test points (> 0).
 * @returns within-group reliability in (0, 1].
 * @throws Error when sem ≥ observedSD or inputs are out of range.
 * @example withinGroupReliability(5, 8) // 0.609375
 */
export function withinGroupReliability(sem: number, observedSD: number): number {
  return semToReliability(sem, observedSD);
}
