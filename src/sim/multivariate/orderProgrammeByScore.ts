import type { MatchingOrder } from '../../core/plan';
import { sortIndicesByScore, type SortWorkspace } from './sortIndicesByScore';

/**
 * Put one stratum's programme members in the plan's greedy matching order
 * when that order is by score: ascending score for 'lowest-first' (ties by
 * their current position, as sortIndicesByScore keeps them), the reverse for
 * 'highest-first' (greedy matching orders; common practice). The caller
 * applies it only without replacement and for an order other than 'random'
 * (members are exchangeable, so pool order is already a random order, and
 * with replacement no member's partners depend on another's).
 *
 * @param score the score that orders them, indexed by person (pool indexing).
 * @param orderP person indices; the segment orderP[p0 .. p1) is reordered in place.
 * @param p0 start of the segment. @param p1 end of the segment (exclusive).
 * @param order 'lowest-first' or 'highest-first' ('random' is treated as 'lowest-first').
 * @param sort workspace of sortIndicesByScore (capacity ≥ p1 − p0).
 * @returns nothing.
 * @throws Error (from sortIndicesByScore) when a score is not finite.
 * @example score [3, 1, 2], orderP [0, 1, 2], 'highest-first' → orderP [0, 2, 1]
 */
export function orderProgrammeByScore(
  score: Float64Array,
  orderP: Int32Array,
  p0: number,
  p1: number,
  order: MatchingOrder,
  sort: SortWorkspace,
): void {
  sortIndicesByScore(score, orderP, p0, p1, sort);
  if (order === 'highest-first') orderP.subarray(p0, p1).reverse();
}
