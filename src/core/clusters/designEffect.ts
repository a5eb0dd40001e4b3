import { formatNumber, requireOpenInterval } from '../inputChecks';

/**
 * The design effect of clustering for a mean (or a difference of means)
 * estimated from people sampled in clusters of equal size n: the variance
 * relative to a simple random sample of the same number of people,
 * 1 + (n − 1)·ICC (Kish 1965, Survey Sampling, §5.4, from memory). Any
 * person-level analysis whose SE ignores the clustering understates the
 * variance by about this factor (the SE by its square root).
 *
 * @param size people per cluster (≥ 1). @param icc intraclass correlation in (0, 1).
 * @returns the design effect (≥ 1).
 * @throws Error when size < 1 or icc outside (0, 1).
 * @example designEffect(25, 0.2) // 5.8 (Kish 1965 formula)
 */
export function designEffect(size: number, icc: number): number {
  requireOpenInterval(icc, 0, 1, 'The ICC');
  if (!(size >= 1) || !Number.isFinite(size)) throw new Error(`The number of people per cluster must be at least 1; got ${formatNumber(size)}.`);
  return 1 + (size - 1) * icc;
}
