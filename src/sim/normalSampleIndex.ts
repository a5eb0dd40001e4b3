import jStat from 'jstat';

/** Half-width of the tabulated range, in SDs; values beyond it share the end buckets (still exact). */
const SPAN = 6;
/** Table cells per item: enough that a bucket (about 1/n of probability) spans one or two cells. */
const CELLS_PER_ITEM = 4;
/** At most this many buckets, so bucket numbers fit 16 bits (a small table stays in cache). */
const MAX_BUCKETS = 65536;
/** The largest stride between indexed positions (see the constructor's `searches`). */
const MAX_STRIDE = 8;

/**
 * Searching a sorted sample of n values drawn from N(mean, sd^2) in expected
 * constant time per search, with buffers reused across samples.
 *
 * The index puts each value in bucket floor(m Φ(z)), z = (x - mean) / sd,
 * m = min(n, 65536) buckets (a distribution-sort layout; Knuth 1998, TAOCP
 * vol. 3, 5.2.1 and 5.2.5), so a normal sample fills them about evenly. Φ (the
 * standard normal CDF, jStat's normal.cdf; Abramowitz & Stegun 1972, 26.2) is
 * tabulated once per n on a grid of 4m cells over z in [-6, 6], so placing a
 * value costs one multiply and one table look-up. The map x → bucket is
 * monotone (every floating-point step is), so searches are exact whatever the
 * data; the normal shape only makes them fast.
 *
 * `indexSorted` records where each bucket ends in ascending values (e.g. a
 * sample drawn sorted); `lowerBound` and `upperBound` then find positions
 * through the same bucket map (values in lower buckets are smaller, in higher
 * buckets larger), scanning one bucket instead of binary searching.
 *
 * When few searches follow each indexing (the engine searches the comparison
 * pool once or twice per programme member), only every `stride`-th position is
 * indexed (a sample of the sorted values, `stride` a power of two up to 8): a
 * search finds the first indexed position at or above its value as before,
 * then steps through the at most stride − 1 positions just below it. Still
 * exact; indexing costs 1/stride as much, each search a few comparisons more.
 *
 * @example
 *   const s = new NormalSampleIndex(3);
 *   s.indexSorted(Float64Array.from([8, 10, 12]), 10, 2);
 *   s.lowerBound(10); // 1, s.upperBound(10); // 2 (hand-worked)
 * @throws Error when n is not a positive integer.
 */
export class NormalSampleIndex {
  /** Sample size sorted by this index, integer >= 1. */
  readonly n: number;
  /** Positions 0, stride, 2·stride, ... are indexed (a power of two, 1..8). */
  readonly stride: number;
  private readonly shift: number;
  private readonly cells: number;
  /** cellBucket[c] = bucket of table cell c (non-decreasing in c). */
  private readonly cellBucket: Uint16Array;
  /** After `indexSorted`: one past the last position of each non-empty bucket, 0 for empty ones. */
  private readonly ends: Int32Array;
  private sorted: Float64Array;
  private lo = 0;
  private scale = 0;

  /**
   * @param n sample size, integer >= 1.
   * @param searches about how many searches follow each indexing (default n: every
   *   position indexed). The stride is the power of two nearest below
   *   sqrt(2.5 n / searches), at most 8: it balances the indexing saved (n / stride
   *   positions placed) against the extra steps per search (about (stride − 1) / 2;
   *   placing a value costs about 2.5 such steps, as timed on the engine's demo plan).
   */
  constructor(n: number, searches: number = n) {
    if (!Number.isInteger(n) || n < 1) throw new Error(`The sample size to sort must be a whole number of at least 1; got ${String(n)}.`);
    this.n = n;
    let shift = 0;
    const best = Math.sqrt((2.5 * n) / Math.max(1, searches));
    while ((1 << (shift + 1)) <= Math.min(best, MAX_STRIDE)) shift++;
    this.shift = shift;
    this.stride = 1 << shift;
    // Indexed positions: 0, stride, ..., one bucket per indexed position (up to MAX_BUCKETS).
    const indexed = ((n - 1) >> shift) + 1;
    const nb = Math.min(indexed, MAX_BUCKETS);
    const cells = CELLS_PER_ITEM * nb;
    this.cells = cells;
    this.cellBucket = new Uint16Array(cells);
    const width = (2 * SPAN) / cells;
    let prev = 0;
    for (let c = 0; c < cells; c++) {
      const p = jStat.normal.cdf(-SPAN + (c + 0.5) * width, 0, 1) as number;
      let b = Math.floor(nb * p);
      if (!(b >= prev)) b = prev; // keep the map monotone (and NaN-proof)
      if (b > nb - 1) b = nb - 1;
      this.cellBucket[c] = b;
      prev = b;
    }
    this.ends = new Int32Array(nb);
    this.sorted = new Float64Array(0);
  }

  /** Table cell of value x under the current (mean, sd); monotone non-decreasing in x. */
  private cell(x: number): number {
    const f = (x - this.lo) * this.scale;
    const last = this.cells - 1;
    return f > 0 ? (f < last ? f | 0 : last) : 0;
  }

  /**
   * Index values that are already in ascending order (e.g. a sample drawn
   * sorted) for lowerBound/upperBound, without moving them: one pass records
   * where each bucket ends. Linear time.
   * @param sorted ascending values, length >= n; remembered as the searched array.
   * @param mean, sd the location and scale the buckets are laid out for (sd > 0 for speed).
   * @throws Error when the values are not in ascending order (the searches would be wrong).
   */
  indexSorted(sorted: Float64Array, mean: number, sd: number): void {
    const n = this.n;
    const ends = this.ends;
    const table = this.cellBucket;
    const last = this.cells - 1;
    const lo = mean - SPAN * sd;
    const scale = sd > 0 ? this.cells / (2 * SPAN * sd) : 0;
    this.lo = lo;
    this.scale = scale;
    this.sorted = sorted;
    let prev = -Infinity;
    for (let j = 0; j < n; j++) {
      const x = sorted[j] as number;
      if (!(x >= prev)) throw new Error(`Values to index must be in ascending order; position ${j} holds ${x} after ${prev}.`);
      prev = x;
    }
    // Each indexed value (position j = s·stride) marks its bucket's end, s + 1 (the last,
    // i.e. largest, wins); empty buckets keep 0, which the searches read as "empty" (see bucketStart).
    ends.fill(0);
    const stride = this.stride;
    for (let j = 0, s = 1; j < n; j += stride, s++) {
      const f = ((sorted[j] as number) - lo) * scale;
      ends[table[f > 0 ? (f < last ? f | 0 : last) : 0] as number] = s;
    }
  }

  /**
   * First position of bucket b: the end of the nearest lower bucket that is
   * not marked empty (0), skipping the empty buckets just below b (buckets are
   * equiprobable, so runs of empty ones are short).
   */
  private bucketStart(b: number): number {
    const ends = this.ends;
    let p = b - 1;
    while (p >= 0 && (ends[p] as number) === 0) p--;
    return p >= 0 ? (ends[p] as number) : 0;
  }

  /** First position i in the last sorted array with sorted[i] >= x (n when none). */
  lowerBound(x: number): number {
    return this.firstPositionAbove(x, false);
  }

  /** First position i in the last sorted array with sorted[i] > x (n when none). */
  upperBound(x: number): number {
    return this.firstPositionAbove(x, true);
  }

  /**
   * First position whose value is above x (strictly) or at least x (not strictly):
   * the first such indexed position (scanning x's bucket only), then the positions
   * just below it back to the previous indexed one.
   */
  private firstPositionAbove(x: number, strictly: boolean): number {
    const b = this.cellBucket[this.cell(x)] as number;
    // k counts indexed positions: the k-th is k·stride.
    let k = this.bucketStart(b);
    const marked = this.ends[b] as number;
    const end = marked > k ? marked : k;
    const s = this.sorted;
    const shift = this.shift;
    if (strictly) while (k < end && (s[k << shift] as number) <= x) k++;
    else while (k < end && (s[k << shift] as number) < x) k++;
    if (shift === 0 || k === 0) return k << shift;
    // Indexed position k − 1 is below x (k − 1 >= 0), k (if any) is not: the answer is in ((k − 1)·stride, k·stride].
    let i = ((k - 1) << shift) + 1;
    const hi = Math.min(k << shift, this.n);
    if (strictly) while (i < hi && (s[i] as number) <= x) i++;
    else while (i < hi && (s[i] as number) < x) i++;
    return i;
  }
}
