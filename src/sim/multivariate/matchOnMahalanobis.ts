import type { RandomSource } from '../randomSource';
import type { CovariateMatching, MatchSettings } from './covariateMatching';
import { groupPoolsByStratum, type StratumGroups } from './exactStrata';
import { orderProgrammeByScore } from './orderProgrammeByScore';
import { createSortWorkspace, type SortWorkspace } from './sortIndicesByScore';

/** Deepest k-d tree the search stack allows (a balanced tree of 2^60 members). */
const MAX_DEPTH = 64;

/** Buffers for matchOnMahalanobis, allocated once per plan (the point copy grows once to the plan's coordinate count). */
export interface MahalanobisMatchingWorkspace extends CovariateMatching, StratumGroups {
  /** Splitting coordinate of the k-d tree node whose median sits at each position of orderC. */
  readonly splitDim: Uint8Array;
  /** Members of each node's subtree still available (indexed like splitDim). */
  readonly available: Int32Array;
  /** Tree position (in orderC) of each comparison member. */
  readonly position: Int32Array;
  /** Comparison members' coordinates in tree order, `dims` per member (grown when a plan has more coordinates). */
  points: Float64Array;
  /** Each node's bounding box of its subtree's members, lower and upper corners, `dims` per node (indexed like points). */
  boxLo: Float64Array;
  boxHi: Float64Array;
  readonly used: Uint8Array;
  /** Candidate list for random picks. */
  readonly candidates: Int32Array;
  readonly bestIndex: Int32Array;
  readonly bestDistance: Float64Array;
  /** The programme member's coordinates. */
  query: Float64Array;
  /** Search stack: segment starts, ends and lower bounds on the squared distance. */
  readonly stackLo: Int32Array;
  readonly stackHi: Int32Array;
  readonly stackBound: Float64Array;
  readonly sort: SortWorkspace;
  /** Tree nodes examined by the last call (a measure of the search's work, for tests and the benchmark). */
  nodesVisited: number;
}

/**
 * Allocate the buffers of matchOnMahalanobis.
 * @param nProgramme programme pool size (≥ 1). @param nComparison comparison pool size (≥ 1).
 * @param ratio partners per programme member, 1..5.
 * @returns a workspace whose partners / partnerCount receive the matches.
 * @throws never. @example createMahalanobisMatchingWorkspace(180, 1200, 2).partners.length // 360
 */
export function createMahalanobisMatchingWorkspace(nProgramme: number, nComparison: number, ratio: number): MahalanobisMatchingWorkspace {
  const n = Math.max(nProgramme, nComparison);
  return {
    nProgramme,
    nComparison,
    ratio,
    partners: new Int32Array(nProgramme * ratio),
    partnerCount: new Uint8Array(nProgramme),
    orderC: new Int32Array(nComparison),
    orderP: new Int32Array(nProgramme),
    startC: new Int32Array(2),
    startP: new Int32Array(2),
    splitDim: new Uint8Array(nComparison),
    available: new Int32Array(nComparison),
    position: new Int32Array(nComparison),
    points: new Float64Array(nComparison * 3),
    boxLo: new Float64Array(nComparison * 3),
    boxHi: new Float64Array(nComparison * 3),
    used: new Uint8Array(nComparison),
    candidates: new Int32Array(nComparison),
    bestIndex: new Int32Array(ratio),
    bestDistance: new Float64Array(ratio),
    query: new Float64Array(3),
    stackLo: new Int32Array(2 * MAX_DEPTH),
    stackHi: new Int32Array(2 * MAX_DEPTH),
    stackBound: new Float64Array(2 * MAX_DEPTH),
    sort: createSortWorkspace(n),
    nodesVisited: 0,
  };
}

/**
 * Put the member with the k-th smallest key of idx[lo..hi] (inclusive) at position k, smaller or
 * equal keys before it and greater or equal after (Hoare's FIND, 1961, with a median-of-three
 * pivot; equal keys stop both scans, so a run of equal keys is split evenly).
 */
function selectKth(idx: Int32Array, key: Float64Array, lo: number, hi: number, k: number): void {
  while (hi > lo) {
    const m = (lo + hi) >>> 1;
    const a = key[idx[lo] as number] as number;
    const b = key[idx[m] as number] as number;
    const c = key[idx[hi] as number] as number;
    const pivot = a < b ? (b < c ? b : a < c ? c : a) : a < c ? a : b < c ? c : b;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((key[idx[i] as number] as number) < pivot) i++;
      while ((key[idx[j] as number] as number) > pivot) j--;
      if (i <= j) {
        const t = idx[i] as number;
        idx[i] = idx[j] as number;
        idx[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/** Put the k-th smallest of values[lo..hi] (inclusive) at position k (Hoare's FIND, as selectKth). */
function selectKthValue(values: Int32Array, lo: number, hi: number, k: number): void {
  while (hi > lo) {
    const pivot = values[(lo + hi) >>> 1] as number;
    let i = lo;
    let j = hi;
    while (i <= j) {
      while ((values[i] as number) < pivot) i++;
      while ((values[j] as number) > pivot) j--;
      if (i <= j) {
        const t = values[i] as number;
        values[i] = values[j] as number;
        values[j] = t;
        i++;
        j--;
      }
    }
    if (k <= j) hi = j;
    else if (k >= i) lo = i;
    else return;
  }
}

/** Build the k-d tree over orderC[lo, hi): the median of the widest coordinate at the middle, halves either side. */
function buildTree(coords: readonly Float64Array[], ws: MahalanobisMatchingWorkspace, lo: number, hi: number): void {
  const n = hi - lo;
  if (n <= 0) return;
  const mid = (lo + hi) >>> 1;
  ws.available[mid] = n;
  if (n === 1) {
    ws.splitDim[mid] = 0;
    return;
  }
  const orderC = ws.orderC;
  let dim = 0;
  if (coords.length > 1) {
    let widest = -1;
    for (let d = 0; d < coords.length; d++) {
      const col = coords[d] as Float64Array;
      let min = Infinity;
      let max = -Infinity;
      for (let t = lo; t < hi; t++) {
        const v = col[orderC[t] as number] as number;
        if (v < min) min = v;
        if (v > max) max = v;
      }
      if (max - min > widest) {
        widest = max - min;
        dim = d;
      }
    }
  }
  selectKth(orderC, coords[dim] as Float64Array, lo, hi - 1, mid);
  ws.splitDim[mid] = dim;
  buildTree(coords, ws, lo, mid);
  buildTree(coords, ws, mid + 1, hi);
}

/** Bounding boxes of the subtree over positions [lo, hi) (points already in tree order). */
function buildBoxes(ws: MahalanobisMatchingWorkspace, dims: number, lo: number, hi: number): void {
  const mid = (lo + hi) >>> 1;
  const { points, boxLo, boxHi } = ws;
  const at = mid * dims;
  for (let d = 0; d < dims; d++) {
    boxLo[at + d] = points[at + d] as number;
    boxHi[at + d] = points[at + d] as number;
  }
  for (const [a, b] of [
    [lo, mid],
    [mid + 1, hi],
  ] as const) {
    if (b <= a) continue;
    buildBoxes(ws, dims, a, b);
    const child = ((a + b) >>> 1) * dims;
    for (let d = 0; d < dims; d++) {
      if ((boxLo[child + d] as number) < (boxLo[at + d] as number)) boxLo[at + d] = boxLo[child + d] as number;
      if ((boxHi[child + d] as number) > (boxHi[at + d] as number)) boxHi[at + d] = boxHi[child + d] as number;
    }
  }
}

/** Append every available member of the subtree over positions [lo, hi) to ws.candidates from index `got`; returns the new count. */
function collectAvailable(ws: MahalanobisMatchingWorkspace, replacement: boolean, lo: number, hi: number, got: number): number {
  if (hi <= lo) return got;
  const mid = (lo + hi) >>> 1;
  if (ws.available[mid] === 0) return got;
  const c = ws.orderC[mid] as number;
  if (replacement || !ws.used[c]) ws.candidates[got++] = c;
  got = collectAvailable(ws, replacement, lo, mid, got);
  return collectAvailable(ws, replacement, mid + 1, hi, got);
}

/**
 * Greedy caliper matching on the Mahalanobis distance (Rubin 1980,
 * "Bias reduction using Mahalanobis-metric matching", Biometrics 36; Rosenbaum
 * & Rubin 1985), within strata of exactly matched covariates. The caller
 * passes whitened coordinates w = L⁻¹x (S = L L' the covariance used by
 * the distance), so the distance is the Euclidean distance between w's.
 *
 * Each programme member, in the matching order, takes k partners among the
 * comparison members of its stratum that are still available (without
 * replacement: not used by anyone; with replacement: any) and lie within the
 * caliper (distance ≤ caliper):
 *  - 'nearest': the k closest (ties to the lower comparison index);
 *  - 'random-within-caliper': k drawn uniformly without repetition from those
 *    eligible, listed by comparison index (a partial Fisher–Yates shuffle).
 * A member with none is discarded.
 *
 * Search: a k-d tree (Bentley 1975, "Multidimensional binary search trees used
 * for associative searching", CACM 18) over each stratum's comparison members,
 * built in place in orderC (each node the median of its members' widest
 * coordinate, by selection: O(n log n)). Every node counts the members of its
 * subtree still available; matching without replacement marks a used partner
 * by decrementing the counts on its path (O(log n)), and the search skips
 * subtrees with none left. A search descends to the programme member's side
 * of each split first and skips the other side when the squared distance to
 * the splitting plane exceeds the caliper² (and, for 'nearest' with k
 * partners found, the k-th best squared distance). The tree compares only
 * coordinate differences, so the work does not depend on where the
 * coordinates are centred or how large they are: pools 1e19 whitened units
 * apart cost a root-to-leaf path per member. 'nearest': O(log n) per member on
 * average for a few coordinates (Friedman, Bentley & Finkel 1977, ACM TOMS 3),
 * so O(n log n) in all. 'random-within-caliper' must list every eligible
 * member to draw uniformly by index (and so keep its numbers), so it adds the
 * number listed: the caliper's share of the pool per member.
 *
 * @param coords whitened coordinates, one Float64Array per coordinate (1..255), pool indexing
 *   (comparison members at [0, nC), programme members at [nC, nC + nP)).
 * @param stratum stratum number per person, or null for one stratum.
 * @param strata number of strata (1 when `stratum` is null).
 * @param orderScore the score that 'lowest-first' / 'highest-first' order by (the engine passes the observed pretest).
 * @param settings caliper in Mahalanobis-distance units (> 0), method, replacement, order.
 * @param rng random source (used by 'random-within-caliper').
 * @param ws workspace from createMahalanobisMatchingWorkspace; partners / partnerCount are filled.
 * @returns the number of programme members with at least one partner.
 * @throws Error when the caliper is not a positive finite number, or there are no coordinates or more than 255.
 * @example
 *   // one coordinate, comparison [0, 1, 5], programme [0.9], caliper 0.5, nearest → comparison 1 (hand-worked).
 */
export function matchOnMahalanobis(
  coords: readonly Float64Array[],
  stratum: Int32Array | null,
  strata: number,
  orderScore: Float64Array,
  settings: MatchSettings,
  rng: RandomSource,
  ws: MahalanobisMatchingWorkspace,
): number {
  const caliper = settings.caliper;
  if (!(caliper > 0) || !Number.isFinite(caliper)) {
    throw new Error(`The Mahalanobis caliper must be a positive number of distance units; got ${String(caliper)}.`);
  }
  const dims = coords.length;
  if (dims < 1 || dims > 255) {
    throw new Error(`The Mahalanobis distance needs between 1 and 255 coordinates; got ${dims}.`);
  }
  const { nComparison: nC, ratio: k, orderC, orderP, used, candidates, splitDim, available, position } = ws;
  const { partners, partnerCount, bestIndex, bestDistance, stackLo, stackHi, stackBound } = ws;
  if (ws.points.length < nC * dims) {
    ws.points = new Float64Array(nC * dims);
    ws.boxLo = new Float64Array(nC * dims);
    ws.boxHi = new Float64Array(nC * dims);
  }
  if (ws.query.length < dims) ws.query = new Float64Array(dims);
  const pts = ws.points;
  const boxLo = ws.boxLo;
  const boxHi = ws.boxHi;
  const qv = ws.query;
  const count = groupPoolsByStratum(stratum, strata, ws);
  const startC = ws.startC;
  const startP = ws.startP;
  partnerCount.fill(0);
  partners.fill(-1);
  used.fill(0);
  const cal2 = caliper * caliper;
  const nearest = settings.method === 'nearest';
  const replacement = settings.replacement;
  const byScore = !replacement && settings.order !== 'random';
  let matched = 0;
  let visited = 0;

  for (let s = 0; s < count; s++) {
    const c0 = startC[s] as number;
    const c1 = startC[s + 1] as number;
    const p0 = startP[s] as number;
    const p1 = startP[s + 1] as number;
    if (p1 === p0 || c1 === c0) continue;
    buildTree(coords, ws, c0, c1);
    for (let t = c0; t < c1; t++) {
      const c = orderC[t] as number;
      position[c] = t;
      for (let d = 0; d < dims; d++) pts[t * dims + d] = (coords[d] as Float64Array)[c] as number;
    }
    buildBoxes(ws, dims, c0, c1);
    if (byScore) orderProgrammeByScore(orderScore, orderP, p0, p1, settings.order, ws.sort);

    for (let qp = p0; qp < p1; qp++) {
      const pi = orderP[qp] as number;
      const j = pi - nC;
      for (let d = 0; d < dims; d++) qv[d] = (coords[d] as Float64Array)[pi] as number;
      let got = 0; // nearest: size of the best list; random: number of candidates
      let sp = 1;
      stackLo[0] = c0;
      stackHi[0] = c1;
      stackBound[0] = 0;
      while (sp > 0) {
        sp--;
        const lo = stackLo[sp] as number;
        const hi = stackHi[sp] as number;
        const mid = (lo + hi) >>> 1;
        visited++;
        if (available[mid] === 0) continue;
        let bound = nearest && got === k ? Math.min(cal2, bestDistance[k - 1] as number) : cal2;
        if ((stackBound[sp] as number) > bound) continue;
        if (!nearest) {
          // A box wholly within the caliper: every available member in it is eligible.
          let far = 0;
          const at = mid * dims;
          for (let dim = 0; dim < dims && far <= cal2; dim++) {
            const q = qv[dim] as number;
            const a = q - (boxLo[at + dim] as number);
            const b = (boxHi[at + dim] as number) - q;
            const e = a > b ? a : b;
            far += e * e;
          }
          if (far <= cal2) {
            got = collectAvailable(ws, replacement, lo, hi, got);
            continue;
          }
        }
        const c = orderC[mid] as number;
        if (replacement || !used[c]) {
          // The squared distance, summed coordinate by coordinate, given up once past the bound.
          let d2 = 0;
          const at = mid * dims;
          for (let dim = 0; dim < dims && d2 <= bound; dim++) {
            const diff = (qv[dim] as number) - (pts[at + dim] as number);
            d2 += diff * diff;
          }
          if (d2 <= bound) {
            if (!nearest) candidates[got++] = c;
            else {
              // Insert (d2, c) into the sorted best list (ties: lower comparison index first).
              let pos = got < k ? got : k - 1;
              let keep = true;
              if (got === k) {
                const wd = bestDistance[k - 1] as number;
                if (d2 > wd || (d2 === wd && c > (bestIndex[k - 1] as number))) keep = false;
              } else got++;
              if (keep) {
                while (pos > 0) {
                  const pd = bestDistance[pos - 1] as number;
                  if (pd < d2 || (pd === d2 && (bestIndex[pos - 1] as number) < c)) break;
                  bestDistance[pos] = pd;
                  bestIndex[pos] = bestIndex[pos - 1] as number;
                  pos--;
                }
                bestDistance[pos] = d2;
                bestIndex[pos] = c;
                if (got === k) bound = Math.min(cal2, bestDistance[k - 1] as number);
              }
            }
          }
        }
        if (hi - lo === 1) continue;
        // Each child's members lie at least its bounding box's distance away.
        let pushed = 0;
        for (let side = 0; side < 2; side++) {
          const a = side === 0 ? lo : mid + 1;
          const b = side === 0 ? mid : hi;
          if (b <= a) continue;
          const at = ((a + b) >>> 1) * dims;
          let near = 0;
          for (let dim = 0; dim < dims && near <= bound; dim++) {
            const q = qv[dim] as number;
            const l = boxLo[at + dim] as number;
            const h = boxHi[at + dim] as number;
            const e = q < l ? l - q : q > h ? q - h : 0;
            near += e * e;
          }
          if (near > bound) continue;
          stackLo[sp] = a;
          stackHi[sp] = b;
          stackBound[sp] = near;
          sp++;
          pushed++;
        }
        // Visit the nearer child first (pushed last).
        if (pushed === 2 && (stackBound[sp - 1] as number) > (stackBound[sp - 2] as number)) {
          const tl = stackLo[sp - 1] as number, th = stackHi[sp - 1] as number, tb = stackBound[sp - 1] as number;
          stackLo[sp - 1] = stackLo[sp - 2] as number;
          stackHi[sp - 1] = stackHi[sp - 2] as number;
          stackBound[sp - 1] = stackBound[sp - 2] as number;
          stackLo[sp - 2] = tl;
          stackHi[sp - 2] = th;
          stackBound[sp - 2] = tb;
        }
      }
      const base = j * k;
      let taken = 0;
      if (nearest) {
        for (; taken < got; taken++) partners[base + taken] = bestIndex[taken] as number;
      } else if (got === 1 || (got > 1 && k === 1)) {
        // One pick: the floor(U × got)-th smallest comparison index, found by selection (O(got))
        // rather than sorting the list: the same member the sorted list would give.
        const pick = Math.floor(rng.nextFloat() * got);
        selectKthValue(candidates, 0, got - 1, pick);
        partners[base] = candidates[pick] as number;
        taken = 1;
      } else if (got > 0) {
        const list = candidates.subarray(0, got);
        list.sort();
        const want = Math.min(k, got);
        for (; taken < want; taken++) {
          const pick = taken + Math.floor(rng.nextFloat() * (got - taken));
          const c = list[pick] as number;
          list[pick] = list[taken] as number;
          list[taken] = c;
          partners[base + taken] = c;
        }
      }
      partnerCount[j] = taken;
      if (taken > 0) {
        matched++;
        if (!replacement) {
          for (let t = 0; t < taken; t++) {
            const c = partners[base + t] as number;
            used[c] = 1;
            // One fewer available on the path from the stratum's root to the member's node.
            const target = position[c] as number;
            let lo = c0;
            let hi = c1;
            for (;;) {
              const mid = (lo + hi) >>> 1;
              available[mid] = (available[mid] as number) - 1;
              if (mid === target) break;
              if (target < mid) hi = mid;
              else lo = mid + 1;
            }
          }
        }
      }
    }
  }
  ws.nodesVisited = visited;
  return matched;
}
