import type { MatchingMethod } from '../core/plan';
import type { MatchedSets } from './matchedSets';
import type { RandomSource } from './randomSource';

/**
 * Reusable buffers for matchOnPretest, sized for one plan's pools so the
 * Monte Carlo loop allocates nothing per replication.
 */
export interface MatchingWorkspace extends MatchedSets {
  /** partners[i * ratio + j] = sorted-comparison index of member i's j-th partner, or -1. */
  readonly partners: Int32Array;
  /** Number of partners found for programme member i (0..ratio). */
  readonly partnerCount: Uint8Array;
  /** Union–find "next available at or above" (size nComparison + 1; last is a sentinel). */
  readonly nextUp: Int32Array;
  /** Union–find "next available at or below", shifted by one (slot 0 is the sentinel "none"). */
  readonly nextDown: Int32Array;
  /** Fenwick tree of availability over the sorted comparison pool (1-based). */
  readonly fenwick: Int32Array;
  /** Scratch for with-replacement random picks (ratio slots). */
  readonly picked: Int32Array;
  /** 0, 1, ..., nComparison: copied into nextUp/nextDown to reset them (a block copy, not a loop). */
  readonly identity: Int32Array;
}

/**
 * Positions in the sorted comparison pretests, when the caller already has a
 * faster way to find them than binary search (the engine's NormalSampleIndex,
 * built by the same sort). Must describe exactly the array passed as comparisonX.
 */
export interface SortedPositions {
  /** First index i with comparisonX[i] >= x (nComparison when none). */
  lowerBound(x: number): number;
  /** First index i with comparisonX[i] > x (nComparison when none). */
  upperBound(x: number): number;
}

/** Allocate a matching workspace for pools of the given sizes and ratio 1..5. */
export function createMatchingWorkspace(nProgramme: number, nComparison: number, ratio: number): MatchingWorkspace {
  return {
    nProgramme,
    nComparison,
    ratio,
    partners: new Int32Array(nProgramme * ratio),
    partnerCount: new Uint8Array(nProgramme),
    nextUp: new Int32Array(nComparison + 1),
    nextDown: new Int32Array(nComparison + 1),
    fenwick: new Int32Array(nComparison + 1),
    picked: new Int32Array(ratio),
    identity: Int32Array.from({ length: nComparison + 1 }, (_, j) => j),
  };
}

/** First index i in [0, n) with xs[i] >= v (n when none). */
function lowerBound(xs: Float64Array, n: number, v: number): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if ((xs[mid] as number) < v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** First index i in [0, n) with xs[i] > v (n when none). */
function upperBound(xs: Float64Array, n: number, v: number): number {
  let lo = 0;
  let hi = n;
  while (lo < hi) {
    const mid = (lo + hi) >>> 1;
    if ((xs[mid] as number) <= v) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Greedy caliper matching of programme members to comparison members on the
 * observed pretest, 1:k, with or without replacement, in O((n_P k + n_C) log n_C)
 * time (never O(n^2)).
 *
 * Procedure (Cochran & Rubin 1973, caliper matching; Rosenbaum 2002 ch. 10 for
 * greedy matching): programme members are taken in the order given (earlier
 * members get first pick of the comparison pool when matching without
 * replacement: that is why the plan's matching order matters). Each member's
 * k partners are chosen in turn among the comparison members not yet used
 * (without replacement: by anyone; with replacement: by this member) whose
 * pretest x_c satisfies x - caliper <= x_c <= x + caliper:
 *  - 'nearest': the closest such member (a tie in distance goes to the lower
 *    pretest); found with next-available pointers on each side of x kept by
 *    union–find with path compression (Tarjan 1975).
 *  - 'random-within-caliper': uniform among such members; the j-th available
 *    in the caliper's index range is found with a Fenwick tree of
 *    availability (Fenwick 1994), j = floor(U * count).
 * A member with no partner in the caliper is discarded (partnerCount 0);
 * with k > 1 a member with at least one partner is kept with fewer than k.
 *
 * @param comparisonX comparison pretest scores sorted ascending, first nComparison used.
 *   Partners are returned as indices into this sorted array.
 * @param programmeX programme pretest scores in matching order (first nProgramme used).
 * @param caliper half-width of the acceptable pretest difference, test points (>= 0).
 * @param method 'nearest' | 'random-within-caliper'.
 * @param replacement whether a comparison member may serve several programme members.
 * @param rng random source (consumed only by 'random-within-caliper').
 * @param ws workspace from createMatchingWorkspace (its ratio = k, 1..5); filled in place.
 * @param positions optional look-up of positions in comparisonX (same results as
 *   binary search, found faster); binary search when omitted.
 * @returns the number of programme members with at least one partner.
 * @throws Error when the caliper is negative or not finite.
 * @example
 *   // comparison [1, 2, 3], programme [2.1, 2.2], caliper 0.5, nearest, no replacement:
 *   // member 0 takes 2 (index 1), member 1 takes 3 (index 2; distance 0.8 > 0.5, so discarded)
 *   // → returns 1 (hand-worked).
 */
export function matchOnPretest(
  comparisonX: Float64Array,
  programmeX: Float64Array,
  caliper: number,
  method: MatchingMethod,
  replacement: boolean,
  rng: RandomSource,
  ws: MatchingWorkspace,
  positions?: SortedPositions,
): number {
  if (!(caliper >= 0) || !Number.isFinite(caliper)) {
    throw new Error(`The caliper must be a non-negative number of pretest points; got ${String(caliper)}.`);
  }
  const nP = ws.nProgramme;
  const nC = ws.nComparison;
  const k = ws.ratio;
  const partners = ws.partners;
  const count = ws.partnerCount;
  let matched = 0;

  if (replacement) {
    const picked = ws.picked;
    for (let i = 0; i < nP; i++) {
      const x = programmeX[i] as number;
      const xLow = x - caliper;
      const xHigh = x + caliper;
      const base = i * k;
      let got = 0;
      if (method === 'nearest') {
        // Walk outward from x: left pointer below, right pointer at or above.
        const pos = positions ? positions.lowerBound(x) : lowerBound(comparisonX, nC, x);
        let l = pos - 1;
        let r = pos;
        while (got < k) {
          const okL = l >= 0 && (comparisonX[l] as number) >= xLow;
          const okR = r < nC && (comparisonX[r] as number) <= xHigh;
          if (!okL && !okR) break;
          let take: number;
          if (okL && okR) take = x - (comparisonX[l] as number) <= (comparisonX[r] as number) - x ? l-- : r++;
          else take = okL ? l-- : r++;
          partners[base + got++] = take;
        }
      } else {
        const lo = positions ? positions.lowerBound(xLow) : lowerBound(comparisonX, nC, xLow);
        const range = (positions ? positions.upperBound(xHigh) : upperBound(comparisonX, nC, xHigh)) - lo;
        while (got < k && got < range) {
          // j-th (0-based) index in [lo, hi) not already picked by this member.
          let cand = lo + Math.floor(rng.nextFloat() * (range - got));
          // picked[0..got) is kept sorted ascending: shift past those at or below cand.
          let ins = 0;
          for (; ins < got; ins++) {
            if ((picked[ins] as number) <= cand) cand++;
            else break;
          }
          for (let q = got; q > ins; q--) picked[q] = picked[q - 1] as number;
          picked[ins] = cand;
          partners[base + got++] = cand;
        }
      }
      count[i] = got;
      for (let j = got; j < k; j++) partners[base + j] = -1;
      if (got > 0) matched++;
    }
    return matched;
  }

  if (method === 'nearest') {
    const up = ws.nextUp;
    const down = ws.nextDown;
    // Every member available: up[j] = j (up[nC] = nC: "none above"); down[j+1] represents
    // index j, down[0] = 0: "none below".
    up.set(ws.identity);
    down.set(ws.identity);
    for (let i = 0; i < nP; i++) {
      const x = programmeX[i] as number;
      const xLow = x - caliper;
      const xHigh = x + caliper;
      const pos = positions ? positions.lowerBound(x) : lowerBound(comparisonX, nC, x);
      const base = i * k;
      let got = 0;
      while (got < k) {
        // Smallest available index >= pos.
        let r = pos;
        while (up[r] !== r) r = up[r] as number;
        for (let a = pos; up[a] !== r; ) {
          const nx = up[a] as number;
          up[a] = r;
          a = nx;
        }
        // Largest available index <= pos - 1 (slot pos in the shifted array).
        let lS = pos;
        while (down[lS] !== lS) lS = down[lS] as number;
        for (let a = pos; down[a] !== lS; ) {
          const nx = down[a] as number;
          down[a] = lS;
          a = nx;
        }
        const l = lS - 1;
        // Within the caliper: x - c <= x_c <= x + c (the same predicate as the binary searches use).
        const okL = l >= 0 && (comparisonX[l] as number) >= xLow;
        const okR = r < nC && (comparisonX[r] as number) <= xHigh;
        if (!okL && !okR) break;
        let take: number;
        if (okL && okR) take = x - (comparisonX[l] as number) <= (comparisonX[r] as number) - x ? l : r;
        else take = okL ? l : r;
        // Mark `take` used: its "next available" becomes its neighbour.
        up[take] = take + 1;
        down[take + 1] = take;
        partners[base + got++] = take;
      }
      count[i] = got;
      for (let j = got; j < k; j++) partners[base + j] = -1;
      if (got > 0) matched++;
    }
    return matched;
  }

  // Random within caliper, without replacement: Fenwick tree of availability.
  const tree = ws.fenwick;
  tree[0] = 0;
  for (let j = 1; j <= nC; j++) tree[j] = j & -j; // every member available: node j covers (j & -j) ones
  let topBit = 1;
  while (topBit * 2 <= nC) topBit *= 2;
  for (let i = 0; i < nP; i++) {
    const x = programmeX[i] as number;
    const lo = positions ? positions.lowerBound(x - caliper) : lowerBound(comparisonX, nC, x - caliper);
    const hi = positions ? positions.upperBound(x + caliper) : upperBound(comparisonX, nC, x + caliper);
    const base = i * k;
    let got = 0;
    while (got < k) {
      // Available count in [lo, hi) = prefix(hi) - prefix(lo).
      let before = 0;
      for (let j = lo; j > 0; j -= j & -j) before += tree[j] as number;
      let upto = 0;
      for (let j = hi; j > 0; j -= j & -j) upto += tree[j] as number;
      const avail = upto - before;
      if (avail <= 0) break;
      // Rank (1-based) of the chosen member among all available.
      let rank = before + 1 + Math.floor(rng.nextFloat() * avail);
      // Fenwick descent: smallest position p with prefix(p) >= rank.
      let pos = 0;
      for (let step = topBit; step > 0; step >>= 1) {
        const nxt = pos + step;
        if (nxt <= nC && (tree[nxt] as number) < rank) {
          pos = nxt;
          rank -= tree[nxt] as number;
        }
      }
      const take = pos; // 0-based index (1-based pos + 1, minus 1)
      for (let j = take + 1; j <= nC; j += j & -j) tree[j] = (tree[j] as number) - 1;
      partners[base + got++] = take;
    }
    count[i] = got;
    for (let j = got; j < k; j++) partners[base + j] = -1;
    if (got > 0) matched++;
  }
  return matched;
}
