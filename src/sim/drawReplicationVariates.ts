import type { NormalSampler } from './normalSampler';

/**
 * Draw every standard normal variate one replication of the engine needs, in
 * a fixed layout of z (length 3 (nC + nP)):
 * [comparison X, ascending | comparison T given X | comparison outcome residual |
 *  programme X (ascending when `programmeSorted`) | programme T given X | programme residual].
 *
 * The comparison pool's observed pretest is drawn as a sorted sample (order
 * statistics, see NormalSampler.fillSortedStandard), so the pool never needs
 * sorting; the programme pool is drawn sorted only when the matching order
 * needs it (lowest- or highest-first). The engine and the benchmark's
 * "normals alone" task both call this, so the benchmark's floor is exactly
 * the engine's own draws.
 *
 * @param sampler the replication's sampler (its generator already reseeded).
 * @param z destination, length >= 3 (nC + nP).
 * @param nC comparison pool size, nP programme pool size (integers >= 1).
 * @param programmeSorted draw the programme X ascending.
 * @example drawReplicationVariates(sampler, z, 1200, 180, false) // z[0..1200) ascending
 */
export function drawReplicationVariates(
  sampler: NormalSampler,
  z: Float64Array,
  nC: number,
  nP: number,
  programmeSorted: boolean,
): void {
  sampler.fillSortedStandard(z, nC, 0);
  sampler.fillStandard(z, 2 * nC, nC);
  const p = 3 * nC;
  if (programmeSorted) {
    sampler.fillSortedStandard(z, nP, p);
    sampler.fillStandard(z, 2 * nP, p + nP);
  } else {
    sampler.fillStandard(z, 3 * nP, p);
  }
}
