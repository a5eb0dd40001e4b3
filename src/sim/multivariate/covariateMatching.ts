import type { MatchingOrder } from '../../core/plan';

/**
 * The result of matching in the several-covariate engine, by pool position:
 * programme member j (0-based within the programme pool) has partnerCount[j]
 * partners, partners[j * ratio + q] for q < partnerCount[j], each an index
 * into the comparison pool (0-based), or −1 beyond the count.
 */
export interface CovariateMatching {
  readonly nProgramme: number;
  readonly nComparison: number;
  /** Partners per programme member sought (1..5). */
  readonly ratio: number;
  readonly partners: Int32Array;
  readonly partnerCount: Uint8Array;
}

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
