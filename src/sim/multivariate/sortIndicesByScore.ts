const INDEX_BITS = 2 ** 24;
const LEVELS = 2 ** 29 - 1;

/**
 * Sort a segment of person indices ascending by their score, ties by position
 * in the segment (so the result is fully determined), in O(m log m): the
 * scores are quantised to 29 bits over their range and packed with the
 * segment position into one exactly representable double (2^29 × 2^24 = 2^53),
 * sorted by the built-in numeric sort of a Float64Array, then put in exact
 * order by an insertion pass (only people whose scores share a quantisation
 * level can be out of order, so the pass is linear in practice).
 *
 * @param score scores indexed by person.
 * @param idx person indices; the segment idx[from .. to) is sorted in place.
 * @param from start of the segment.
 * @param to end of the segment (exclusive); to − from < 2^24.
 * @param scratch work space of at least to − from doubles.
 * @param positions work space of at least to − from 32-bit integers.
 * @returns nothing.
 * @throws Error when the segment is longer than 2^24 − 1 people or a score is not finite.
 * @example score [0.3, −1, 0.3], idx [0, 1, 2] → idx [1, 0, 2]
 */
export function sortIndicesByScore(
  score: Float64Array,
  idx: Int32Array,
  from: number,
  to: number,
  scratch: Float64Array,
  positions: Int32Array,
): void {
  const m = to - from;
  if (m < 2) return;
  if (m >= INDEX_BITS) throw new Error(`Cannot sort more than ${INDEX_BITS - 1} people at once; got ${m}.`);
  let lo = Infinity;
  let hi = -Infinity;
  for (let j = from; j < to; j++) {
    const s = score[idx[j] as number] as number;
    if (!Number.isFinite(s)) throw new Error(`A matching score is not a finite number (${s}).`);
    if (s < lo) lo = s;
    if (s > hi) hi = s;
  }
  const f = hi > lo ? LEVELS / (hi - lo) : 0;
  const keys = scratch.subarray(0, m);
  for (let j = 0; j < m; j++) {
    const level = Math.min(LEVELS, Math.floor(((score[idx[from + j] as number] as number) - lo) * f));
    keys[j] = level * INDEX_BITS + j;
  }
  keys.sort();
  const pos = positions;
  for (let j = 0; j < m; j++) {
    const key = keys[j] as number;
    pos[j] = key - Math.floor(key / INDEX_BITS) * INDEX_BITS;
  }
  // Exact order by (score, position): insertion pass over the nearly sorted positions.
  for (let j = 1; j < m; j++) {
    const p = pos[j] as number;
    const s = score[idx[from + p] as number] as number;
    let q = j - 1;
    while (q >= 0) {
      const pq = pos[q] as number;
      const sq = score[idx[from + pq] as number] as number;
      if (sq < s || (sq === s && pq < p)) break;
      pos[q + 1] = pq;
      q--;
    }
    pos[q + 1] = p;
  }
  // Permute the segment.
  for (let j = 0; j < m; j++) keys[j] = idx[from + (pos[j] as number)] as number;
  for (let j = 0; j < m; j++) idx[from + j] = keys[j] as number;
}
