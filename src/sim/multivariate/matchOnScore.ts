import { createMatchingWorkspace, matchOnPretest, type MatchingWorkspace } from '../matchOnPretest';
import type { RandomSource } from '../randomSource';
import type { CovariateMatching, MatchSettings } from './covariateMatching';
import { groupPoolsByStratum, type StratumGroups } from './exactStrata';
import { orderProgrammeByScore } from './orderProgrammeByScore';
import { createSortWorkspace, sortIndicesByScore, type SortWorkspace } from './sortIndicesByScore';

/** Buffers for matchOnScore, allocated once per plan. */
export interface ScoreMatchingWorkspace extends CovariateMatching, StratumGroups {
  /** The one-dimensional matcher's workspace (its partners are positions in the sorted stratum). */
  readonly inner: MatchingWorkspace;
  readonly sortedC: Float64Array;
  readonly orderedP: Float64Array;
  readonly sort: SortWorkspace;
}

/**
 * Allocate the buffers of matchOnScore.
 * @param nProgramme programme pool size (≥ 1). @param nComparison comparison pool size (≥ 1).
 * @param ratio partners per programme member, 1..5.
 * @returns a workspace whose partners / partnerCount receive the matches.
 * @throws never. @example createScoreMatchingWorkspace(180, 1200, 1).partners.length // 180
 */
export function createScoreMatchingWorkspace(nProgramme: number, nComparison: number, ratio: number): ScoreMatchingWorkspace {
  const inner = createMatchingWorkspace(nProgramme, nComparison, ratio);
  const n = Math.max(nProgramme, nComparison);
  return {
    nProgramme,
    nComparison,
    ratio,
    partners: new Int32Array(nProgramme * ratio),
    partnerCount: new Uint8Array(nProgramme),
    inner,
    orderC: new Int32Array(nComparison),
    orderP: new Int32Array(nProgramme),
    startC: new Int32Array(2),
    startP: new Int32Array(2),
    sortedC: new Float64Array(nComparison),
    orderedP: new Float64Array(nProgramme),
    sort: createSortWorkspace(n),
  };
}

/**
 * Greedy caliper matching on a one-dimensional score (the observed pretest,
 * or the linear propensity score, i.e. the fitted logit; Rosenbaum & Rubin
 * 1985), within strata of exactly matched covariates, in O(n log n) per
 * stratum: never quadratic in pool size.
 *
 * Within each stratum the comparison members are sorted by score
 * (sortIndicesByScore) and the programme members taken in the matching order;
 * the matching itself is the engine's one-covariate matcher, matchOnPretest
 * ('nearest': closest available within the caliper, ties to the lower score;
 * 'random-within-caliper': uniform among the available within the caliper;
 * 1:k, with or without replacement; a member with no partner is discarded).
 * Strata are processed in order 0, 1, …; they share no comparison members, so
 * their order changes nothing but the random stream's use.
 *
 * @param score scores of the whole pool: comparison members at [0, nC), programme members at [nC, nC + nP).
 * @param stratum stratum number per person (same indexing), or null for one stratum.
 * @param strata number of strata (1 when `stratum` is null).
 * @param settings caliper (in score units), method, replacement, order ('lowest-first' / 'highest-first' by score).
 * @param rng random source (used by 'random-within-caliper').
 * @param ws workspace from createScoreMatchingWorkspace; partners / partnerCount are filled.
 * @returns the number of programme members with at least one partner.
 * @throws Error when the caliper is negative or not finite, or a score is not finite.
 * @example
 *   // comparison scores [1, 2, 3], programme [2.1, 2.2], caliper 0.5, nearest, no replacement:
 *   // programme 0 → comparison 1; programme 1 → none within 0.5 of 2.2 left (3 is 0.8 away) → returns 1.
 */
export function matchOnScore(
  score: Float64Array,
  stratum: Int32Array | null,
  strata: number,
  settings: MatchSettings,
  rng: RandomSource,
  ws: ScoreMatchingWorkspace,
): number {
  const { nComparison: nC, ratio: k, orderC, orderP, sortedC, orderedP, inner } = ws;
  const count = groupPoolsByStratum(stratum, strata, ws);
  const startC = ws.startC;
  const startP = ws.startP;
  const byScore = !settings.replacement && settings.order !== 'random';
  const localPartners = inner.partners;
  const localCount = inner.partnerCount;
  let matched = 0;
  for (let s = 0; s < count; s++) {
    const c0 = startC[s] as number;
    const c1 = startC[s + 1] as number;
    const p0 = startP[s] as number;
    const p1 = startP[s + 1] as number;
    if (p1 === p0) continue;
    if (c1 === c0) {
      localCount.fill(0, p0, p1);
      continue;
    }
    sortIndicesByScore(score, orderC, c0, c1, ws.sort);
    if (byScore) orderProgrammeByScore(score, orderP, p0, p1, settings.order, ws.sort);
    for (let j = c0; j < c1; j++) sortedC[j] = score[orderC[j] as number] as number;
    for (let j = p0; j < p1; j++) orderedP[j] = score[orderP[j] as number] as number;
    const sc = c1 - c0;
    const sub: MatchingWorkspace =
      count === 1
        ? inner
        : {
            nProgramme: p1 - p0,
            nComparison: sc,
            ratio: k,
            partners: localPartners.subarray(p0 * k, p1 * k),
            partnerCount: localCount.subarray(p0, p1),
            nextUp: inner.nextUp.subarray(0, sc + 1),
            nextDown: inner.nextDown.subarray(0, sc + 1),
            fenwick: inner.fenwick.subarray(0, sc + 1),
            picked: inner.picked,
            identity: inner.identity.subarray(0, sc + 1),
          };
    matched += matchOnPretest(
      sortedC.subarray(c0, c1),
      orderedP.subarray(p0, p1),
      settings.caliper,
      settings.method,
      settings.replacement,
      rng,
      sub,
    );
  }
  // Back to pool positions.
  const partners = ws.partners;
  const partnerCount = ws.partnerCount;
  for (let s = 0; s < count; s++) {
    const c0 = startC[s] as number;
    const p0 = startP[s] as number;
    const p1 = startP[s + 1] as number;
    for (let q = p0; q < p1; q++) {
      const j = (orderP[q] as number) - nC;
      const cnt = localCount[q] as number;
      partnerCount[j] = cnt;
      const base = j * k;
      for (let r = 0; r < k; r++) {
        partners[base + r] = r < cnt ? (orderC[c0 + (localPartners[q * k + r] as number)] as number) : -1;
      }
    }
  }
  return matched;
}
