const PACK = 2 ** 24;

/** Buffers for sortIndicesByScore, sized for segments of up to `capacity` people. */
export interface SortWorkspace {
  readonly capacity: number;
  /** Bucket number per position. */
  readonly buckets: Int32Array;
  /** Bucket starts (capacity + 1). */
  readonly counts: Int32Array;
  readonly positions: Int32Array;
  /** Scratch for the fallback sort and the final permutation. */
  readonly packed: Float64Array;
  /** The segment's scores by position in it (read once, so the passes below index one array). */
  readonly values: Float64Array;
}

/** Allocate a sort workspace. @param capacity longest segment (≥ 1). @returns the buffers. @throws never. @example createSortWorkspace(1200).positions.length // 1200 */
export function createSortWorkspace(capacity: number): SortWorkspace {
  const n = Math.max(1, capacity);
  return {
    capacity: n,
    buckets: new Int32Array(n),
    counts: new Int32Array(n + 1),
    positions: new Int32Array(n),
    packed: new Float64Array(n),
    values: new Float64Array(n),
  };
}

/**
 * Sort a segment of person indices ascending by their score, ties by position
 * in the segment (so the result is fully determined), in expected linear time
 * for scores spread like a normal sample (logits, pretests, grid cells): a
 * distribution sort into m equal-width buckets over the scores' range (a
 * stable counting pass; Knuth 1998, "The Art of Computer Programming" vol. 3,
 * sec. 5.2.1 and 5.2.5), then an insertion pass on the exact scores, which only
 * has to order scores sharing a bucket. Should that pass meet many such
 * scores (an extreme outlier squeezing the others into few buckets), it falls
 * back to a comparison sort, so the worst case is O(m log m).
 *
 * @param score scores indexed by person.
 * @param idx person indices; the segment idx[from .. to) is sorted in place.
 * @param from start of the segment.
 * @param to end of the segment (exclusive); to − from ≤ ws.capacity (< 2^24).
 * @param ws work space from createSortWorkspace.
 * @returns nothing.
 * @throws Error when the segment is longer than the workspace or a score is not finite.
 * @example score [0.3, −1, 0.3], idx [0, 1, 2] → idx [1, 0, 2]
 */
export function sortIndicesByScore(score: Float64Array, idx: Int32Array, from: number, to: number, ws: SortWorkspace): void {
  const m = to - from;
  if (m < 2) return;
  if (m > ws.capacity) throw new Error(`Cannot sort ${m} people with a workspace for ${ws.capacity}.`);
  const { buckets, counts, positions: pos, values } = ws;
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = 0; j < m; j++) {
    const s = score[idx[from + j] as number] as number;
    if (!Number.isFinite(s)) throw new Error(`A matching score is not a finite number (${s}).`);
    values[j] = s;
    if (s < lo) lo = s;
    if (s > hi) hi = s;
  }
  const f = hi > lo ? (m - 1) / (hi - lo) : 0;
  counts.fill(0, 0, m + 1);
  for (let j = 0; j < m; j++) {
    const b = Math.floor(((values[j] as number) - lo) * f);
    const c = b < m ? b : m - 1;
    buckets[j] = c;
    counts[c + 1] = (counts[c + 1] as number) + 1;
  }
  for (let c = 0; c < m; c++) counts[c + 1] = (counts[c + 1] as number) + (counts[c] as number);
  for (let j = 0; j < m; j++) {
    const c = buckets[j] as number;
    const at = counts[c] as number;
    counts[c] = at + 1;
    pos[at] = j;
  }
  // Exact order by (score, position) within buckets.
  const limit = 16 * m + 64;
  const moves = insertionPass(values, m, pos, limit);
  const out = ws.packed;
  if (moves > limit) comparisonSort(values, m, pos, out, lo, hi);
  // Permute the segment.
  for (let j = 0; j < m; j++) out[j] = idx[from + (pos[j] as number)] as number;
  for (let j = 0; j < m; j++) idx[from + j] = out[j] as number;
}

/** Fallback: positions sorted by (score, position) with the built-in numeric sort of packed keys, then an insertion pass. */
function comparisonSort(values: Float64Array, m: number, pos: Int32Array, keys: Float64Array, lo: number, hi: number): void {
  const levels = 2 ** 29 - 1;
  const f = hi > lo ? levels / (hi - lo) : 0;
  for (let j = 0; j < m; j++) keys[j] = Math.min(levels, Math.floor(((values[j] as number) - lo) * f)) * PACK + j;
  const view = keys.subarray(0, m);
  view.sort();
  for (let j = 0; j < m; j++) {
    const key = view[j] as number;
    pos[j] = key - Math.floor(key / PACK) * PACK;
  }
  insertionPass(values, m, pos, Infinity);
}

/**
 * Insertion sort of positions pos[0 .. m) by (values[position], position), in
 * place; stops starting new elements once more than `limit` moves have been
 * made (Infinity: sorts fully). Returns the moves made.
 */
function insertionPass(values: Float64Array, m: number, pos: Int32Array, limit: number): number {
  let moves = 0;
  for (let j = 1; j < m && moves <= limit; j++) {
    const p = pos[j] as number;
    const s = values[p] as number;
    let q = j - 1;
    while (q >= 0) {
      const pq = pos[q] as number;
      const sq = values[pq] as number;
      if (sq < s || (sq === s && pq < p)) break;
      pos[q + 1] = pq;
      q--;
      moves++;
    }
    pos[q + 1] = p;
  }
  return moves;
}
