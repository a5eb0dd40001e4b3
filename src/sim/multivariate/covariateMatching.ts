import type { MatchingOrder } from '../../core/plan';
import type { MatchedSets } from '../matchedSets';

/**
 * The result of matching in the several-covariate engine, by pool position:
 * programme member j (0-based within the programme pool) has partnerCount[j]
 * partners, partners[j * ratio + q] for q < partnerCount[j], each an index
 * into the comparison pool (0-based), or −1 beyond the count.
 */
export type CovariateMatching = MatchedSets;

/** Settings shared by the matchers (the plan's matching block, in the engine's terms). */
export interface MatchSettings {
  /** Greatest acceptable distance, in the matcher's own units (≥ 0). */
  caliper: number;
  method: 'nearest' | 'random-within-caliper';
  replacement: boolean;
  /**
   * Greedy order (without replacement): 'random' = pool order (members are
   * exchangeable, so pool order is a random order); 'lowest-first' /
   * 'highest-first' = ascending / descending `orderScore`.
   */
  order: MatchingOrder;
}
