import { countSelected, meanAndMCSE, type ReplicationSelection } from './meanAndMCSE';
import type { SimMatchingSummary } from './types';

/** Flag bit: at least one matched set in the replication (the "after" figures exist). */
export const MATCHED_SETS_OK = 1;
/** Flag bit: the variance ratio after matching could be computed. */
export const VARIANCE_RATIO_OK = 2;

/**
 * The pretest's per-replication matching records, each a Float64Array over
 * replications. Differences are programme minus comparison, raw points; SMDs
 * use the replication's before-matching pooled SD (Stuart 2010).
 */
export interface PretestMatchingRecords {
  /** Programme members with at least one partner. */
  matched: Float64Array;
  observedBefore: Float64Array;
  observedAfter: Float64Array;
  observedSMDBefore: Float64Array;
  observedSMDAfter: Float64Array;
  trueBefore: Float64Array;
  trueAfter: Float64Array;
  trueSMDBefore: Float64Array;
  trueSMDAfter: Float64Array;
  /** Observed pretest variance ratio (programme / comparison) after matching. */
  varianceRatio: Float64Array;
  /** Per-replication flags (MATCHED_SETS_OK, VARIANCE_RATIO_OK) at ok[i * stride + offset]. */
  ok: Uint8Array;
  stride: number;
  offset: number;
  /**
   * Programme members in each replication, when they vary (a selection rule decides who is in the
   * programme): the discarded share is then averaged over replications, each relative to its own
   * programme (a replication with no programme member counts as 0 discarded). Absent: every
   * replication has `programmePoolSize` members.
   */
  programmeSizes?: Float64Array;
}

/**
 * Matching summary over replications, as both engines report it: mean matched
 * programme members and discarded share, each with its Monte Carlo SE (the
 * discarded share's is the matched count's over n_P; with per-replication
 * programme sizes, the mean and MCSE of each replication's own share); the pretest's observed
 * and true differences and SMDs before matching over all replications, after
 * matching over those with a matched set; the variance ratio over those where
 * it could be computed (meanAndMCSE; Morris, White & Crowther 2019, Table 6).
 *
 * @param records the per-replication records.
 * @param total number of replications stored (≥ 1).
 * @param programmePoolSize n_P, people (≥ 1); ignored for the discarded share when records.programmeSizes is given.
 * @returns the SimMatchingSummary.
 * @throws never.
 * @example
 *   // matched counts 90 and 110 in a pool of 150 → meanMatchedProgramme 100, discardedProgrammeShare 1/3 (hand-worked).
 */
export function summariseMatching(records: PretestMatchingRecords, total: number, programmePoolSize: number): SimMatchingSummary {
  const r = records;
  const nP = programmePoolSize;
  const after: ReplicationSelection = { ok: r.ok, bit: MATCHED_SETS_OK, stride: r.stride, offset: r.offset };
  const ratioOk: ReplicationSelection = { ok: r.ok, bit: VARIANCE_RATIO_OK, stride: r.stride, offset: r.offset };
  const [matchedMean, matchedMCSE] = meanAndMCSE(r.matched, total);
  const [obsAfter, obsAfterMCSE] = meanAndMCSE(r.observedAfter, total, after);
  const [trueAfter, trueAfterMCSE] = meanAndMCSE(r.trueAfter, total, after);
  let discarded = 1 - matchedMean / nP;
  let discardedMCSE = matchedMCSE / nP;
  if (r.programmeSizes) {
    const share = new Float64Array(total);
    for (let i = 0; i < total; i++) {
      const size = r.programmeSizes[i] as number;
      share[i] = size > 0 ? 1 - (r.matched[i] as number) / size : 0;
    }
    [discarded, discardedMCSE] = meanAndMCSE(share, total);
  }
  return {
    meanMatchedProgramme: matchedMean,
    meanMatchedProgrammeMCSE: matchedMCSE,
    discardedProgrammeShare: discarded,
    discardedProgrammeShareMCSE: discardedMCSE,
    observedDifferenceBefore: meanAndMCSE(r.observedBefore, total)[0],
    observedDifferenceAfter: obsAfter,
    observedDifferenceAfterMCSE: obsAfterMCSE,
    observedSMDBefore: meanAndMCSE(r.observedSMDBefore, total)[0],
    observedSMDAfter: meanAndMCSE(r.observedSMDAfter, total, after)[0],
    trueDifferenceBefore: meanAndMCSE(r.trueBefore, total)[0],
    trueDifferenceAfter: trueAfter,
    trueDifferenceAfterMCSE: trueAfterMCSE,
    trueSMDBefore: meanAndMCSE(r.trueSMDBefore, total)[0],
    trueSMDAfter: meanAndMCSE(r.trueSMDAfter, total, after)[0],
    varianceRatioAfter: meanAndMCSE(r.varianceRatio, total, ratioOk)[0],
    replicationsWithMatches: countSelected(total, after),
  };
}
