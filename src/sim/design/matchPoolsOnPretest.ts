import type { MatchedSets } from '../matchedSets';
import { matchOnPretest, type MatchingWorkspace } from '../matchOnPretest';
import type { RandomSource } from '../randomSource';
import type { MatchSettings } from '../multivariate/covariateMatching';
import { orderProgrammeByScore } from '../multivariate/orderProgrammeByScore';
import { createSortWorkspace, sortIndicesByScore, type SortWorkspace } from '../multivariate/sortIndicesByScore';
import { SortedValuesIndex } from './sortedValuesIndex';

/** A MatchingWorkspace whose pool sizes are set per replication (its arrays hold `capacity` people). */
interface ResizableMatchingWorkspace extends MatchingWorkspace {
  nProgramme: number;
  nComparison: number;
}

/**
 * Buffers of matchPoolsOnPretest for pools whose sizes change from
 * replication to replication (a selection rule), allocated once for the most
 * people a replication can hold. After a call, `partners` / `partnerCount`
 * hold the matched sets by pool row: programme member j (row nComparison + j)
 * has partnerCount[j] partners, partners[j * ratio + q], each a comparison
 * row (0 .. nComparison − 1), −1 beyond the count.
 */
export interface PoolsMatching extends MatchedSets {
  nProgramme: number;
  nComparison: number;
  readonly capacity: number;
  readonly inner: ResizableMatchingWorkspace;
  readonly orderC: Int32Array;
  readonly orderP: Int32Array;
  readonly sortedC: Float64Array;
  readonly orderedP: Float64Array;
  readonly sort: SortWorkspace;
  /** Positions in the sorted comparison pretests (used when the drawer draws each group sorted). */
  readonly positions: SortedValuesIndex;
}

/**
 * Allocate matchPoolsOnPretest's buffers.
 * @param capacity most people in one replication (both groups together, ≥ 1).
 * @param ratio partners per programme member, 1..5.
 * @returns the workspace (sizes 0 until the first match).
 * @throws never. @example createPoolsMatching(2000, 1).partners.length // 2000
 */
export function createPoolsMatching(capacity: number, ratio: number): PoolsMatching {
  const n = Math.max(1, capacity);
  const inner: ResizableMatchingWorkspace = {
    nProgramme: 0,
    nComparison: 0,
    ratio,
    partners: new Int32Array(n * ratio),
    partnerCount: new Uint8Array(n),
    nextUp: new Int32Array(n + 1),
    nextDown: new Int32Array(n + 1),
    fenwick: new Int32Array(n + 1),
    picked: new Int32Array(ratio),
    identity: Int32Array.from({ length: n + 1 }, (_, j) => j),
  };
  return {
    nProgramme: 0,
    nComparison: 0,
    ratio,
    capacity: n,
    partners: new Int32Array(n * ratio),
    partnerCount: new Uint8Array(n),
    inner,
    orderC: new Int32Array(n),
    orderP: new Int32Array(n),
    sortedC: new Float64Array(n),
    orderedP: new Float64Array(n),
    sort: createSortWorkspace(n),
    positions: new SortedValuesIndex(n),
  };
}

/**
 * Greedy caliper matching on the observed pretest for pools of any size up
 * to the workspace's capacity, with comparison members at rows [0, nC) and
 * programme members at rows [nC, nC + nP) of `observed` (the pools engine's
 * layout). Unsorted pools: the comparison rows are sorted by pretest
 * (sortIndicesByScore, expected linear time), the programme members taken in
 * pool order (members are exchangeable, so that is a random order) or, without
 * replacement, lowest- or highest-first by pretest (orderProgrammeByScore).
 * Pools drawn with each group's rows ascending by pretest (`sorted`, the
 * selection drawer) need no sort: the comparison rows are searched through an
 * equal-width bucket index (SortedValuesIndex) and the programme members are
 * taken in a uniformly random order (a Fisher–Yates shuffle from `rng`;
 * Knuth 1998, vol. 2, 3.4.2, algorithm P), lowest-first as drawn, or
 * highest-first in reverse (and as drawn with replacement, where the order
 * changes nothing but which of several equally eligible partners a random
 * pick takes). The matching
 * itself is the one-pretest engine's matchOnPretest ('nearest' or
 * 'random-within-caliper', 1:k, with or without replacement; Cochran & Rubin
 * 1973 caliper matching, Rosenbaum 2002 ch. 10 greedy matching). The result
 * is mapped back to pool rows.
 *
 * @param observed observed pretests by pool row.
 * @param nC comparison members (≥ 1). @param nP programme members (≥ 1); nC + nP ≤ capacity.
 * @param settings caliper in pretest points (≥ 0), method, replacement, order.
 * @param rng random source (used by 'random-within-caliper' and the shuffle).
 * @param ws workspace from createPoolsMatching.
 * @param sorted true when rows [0, nC) and rows [nC, nC + nP) are each ascending by pretest.
 * @returns the number of programme members with at least one partner.
 * @throws Error when the pools exceed the workspace, the caliper is negative, or a pretest is not finite.
 * @example
 *   // observed [1, 2, 3, 2.1, 2.2], nC 3, nP 2, caliper 0.5, nearest, no replacement:
 *   // programme 0 (2.1) → row 1; programme 1 (2.2): 3 is 0.8 away → discarded; returns 1 (hand-worked).
 */
export function matchPoolsOnPretest(
  observed: Float64Array,
  nC: number,
  nP: number,
  settings: MatchSettings,
  rng: RandomSource,
  ws: PoolsMatching,
  sorted = false,
): number {
  if (nC + nP > ws.capacity) throw new Error(`Cannot match ${nC + nP} people with a workspace for ${ws.capacity}.`);
  const { orderC, orderP, sortedC, orderedP, inner } = ws;
  const k = ws.ratio;
  ws.nComparison = nC;
  ws.nProgramme = nP;
  inner.nComparison = nC;
  inner.nProgramme = nP;
  if (sorted) return matchSortedPools(observed, nC, nP, settings, rng, ws);
  for (let j = 0; j < nC; j++) orderC[j] = j;
  for (let j = 0; j < nP; j++) orderP[j] = nC + j;
  sortIndicesByScore(observed, orderC, 0, nC, ws.sort);
  if (!settings.replacement && settings.order !== 'random') orderProgrammeByScore(observed, orderP, 0, nP, settings.order, ws.sort);
  for (let j = 0; j < nC; j++) sortedC[j] = observed[orderC[j] as number] as number;
  for (let j = 0; j < nP; j++) orderedP[j] = observed[orderP[j] as number] as number;
  const matched = matchOnPretest(sortedC, orderedP, settings.caliper, settings.method, settings.replacement, rng, inner);
  const { partners, partnerCount } = ws;
  const localPartners = inner.partners;
  const localCount = inner.partnerCount;
  for (let q = 0; q < nP; q++) {
    const j = (orderP[q] as number) - nC;
    const cnt = localCount[q] as number;
    partnerCount[j] = cnt;
    const base = j * k;
    for (let r = 0; r < k; r++) partners[base + r] = r < cnt ? (orderC[localPartners[q * k + r] as number] as number) : -1;
  }
  return matched;
}

/** matchPoolsOnPretest for pools whose groups are each drawn ascending by pretest (no sort needed). */
function matchSortedPools(observed: Float64Array, nC: number, nP: number, settings: MatchSettings, rng: RandomSource, ws: PoolsMatching): number {
  const { orderP, orderedP, inner, positions } = ws;
  const k = ws.ratio;
  if (settings.replacement || settings.order === 'lowest-first') {
    for (let j = 0; j < nP; j++) orderP[j] = j;
  } else if (settings.order === 'highest-first') {
    for (let j = 0; j < nP; j++) orderP[j] = nP - 1 - j;
  } else {
    // A uniformly random order: Fisher–Yates (Knuth 1998, vol. 2, 3.4.2, algorithm P).
    for (let j = 0; j < nP; j++) orderP[j] = j;
    for (let j = nP - 1; j > 0; j--) {
      const r = Math.floor(rng.nextFloat() * (j + 1));
      const tmp = orderP[j] as number;
      orderP[j] = orderP[r] as number;
      orderP[r] = tmp;
    }
  }
  for (let q = 0; q < nP; q++) orderedP[q] = observed[nC + (orderP[q] as number)] as number;
  positions.index(observed, nC);
  const matched = matchOnPretest(observed, orderedP, settings.caliper, settings.method, settings.replacement, rng, inner, positions);
  const { partners, partnerCount } = ws;
  const localPartners = inner.partners;
  const localCount = inner.partnerCount;
  for (let q = 0; q < nP; q++) {
    const j = orderP[q] as number;
    const cnt = localCount[q] as number;
    partnerCount[j] = cnt;
    const base = j * k;
    const from = q * k;
    for (let r = 0; r < k; r++) partners[base + r] = r < cnt ? (localPartners[from + r] as number) : -1;
  }
  return matched;
}

/**
 * Mark every programme member unmatched (used when a replication is not matched at all).
 * @param ws the workspace. @param nC comparison members. @param nP programme members.
 * @returns nothing. @throws never. @example clearPoolsMatching(ws, 10, 5) // ws.partnerCount[0..5) = 0
 */
export function clearPoolsMatching(ws: PoolsMatching, nC: number, nP: number): void {
  ws.nComparison = nC;
  ws.nProgramme = nP;
  ws.partnerCount.fill(0, 0, nP);
  ws.partners.fill(-1, 0, nP * ws.ratio);
}
