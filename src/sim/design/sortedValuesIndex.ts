import type { SortedPositions } from '../matchOnPretest';

/**
 * Positions in an ascending array in expected constant time per search, for
 * arrays of any length up to a capacity (the pools engine's comparison group,
 * whose size changes with each replication): equal-width buckets over the
 * values' range, one bucket per value (a distribution-sort layout; Knuth 1998,
 * "The Art of Computer Programming" vol. 3, 5.2.1 and 5.2.5). `index` records
 * where each bucket starts in one pass; a search maps x to its bucket and
 * scans that bucket only. The map x → bucket, floor((x − min)·scale), is
 * monotone in floating point, so every value in a lower bucket is smaller
 * than x and every value in a higher one larger: the searches are exact
 * whatever the values' shape (a truncated group included), the shape only
 * decides the speed. Same results as binary search.
 *
 * @example
 *   const s = new SortedValuesIndex(8); s.index(Float64Array.of(1, 2, 2, 5), 4);
 *   s.lowerBound(2) // 1; s.upperBound(2) // 3; s.lowerBound(9) // 4 (hand-worked)
 */
export class SortedValuesIndex implements SortedPositions {
  private readonly start: Int32Array;
  private values: Float64Array = new Float64Array(0);
  private n = 0;
  private lo = 0;
  private scale = 0;
  private last = 0;

  /** @param capacity longest array indexed (whole number ≥ 1). @throws RangeError for a negative capacity. */
  constructor(capacity: number) {
    this.start = new Int32Array(Math.max(1, capacity) + 1);
  }

  /**
   * Index values[0 .. n), ascending (not checked: the caller draws them sorted).
   * @param values ascending values; remembered as the searched array.
   * @param n how many (0 ≤ n ≤ capacity).
   * @throws Error when n exceeds the capacity.
   */
  index(values: Float64Array, n: number): void {
    if (n > this.start.length - 1) throw new Error(`Cannot index ${n} values with room for ${this.start.length - 1}.`);
    this.values = values;
    this.n = n;
    const start = this.start;
    if (n === 0) {
      this.last = 0;
      start[0] = 0;
      return;
    }
    const lo = values[0] as number;
    const hi = values[n - 1] as number;
    this.lo = lo;
    this.last = n - 1;
    this.scale = hi > lo ? n / (hi - lo) : 0;
    let next = 0;
    for (let j = 0; j < n; j++) {
      const b = this.bucket(values[j] as number);
      while (next <= b) start[next++] = j;
    }
    while (next <= n) start[next++] = n;
  }

  private bucket(x: number): number {
    const f = (x - this.lo) * this.scale;
    return f > 0 ? (f < this.last ? f | 0 : this.last) : 0;
  }

  /** First position i with values[i] ≥ x (n when none). */
  lowerBound(x: number): number {
    const s = this.values;
    const n = this.n;
    let i = n === 0 ? 0 : (this.start[this.bucket(x)] as number);
    while (i < n && (s[i] as number) < x) i++;
    return i;
  }

  /** First position i with values[i] > x (n when none). */
  upperBound(x: number): number {
    const s = this.values;
    const n = this.n;
    let i = n === 0 ? 0 : (this.start[this.bucket(x)] as number);
    while (i < n && (s[i] as number) <= x) i++;
    return i;
  }
}
