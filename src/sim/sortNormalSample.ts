/**
 * Sort a sample drawn (approximately) from N(mean, sd^2) in ascending order in
 * expected linear time: a distribution (bucket) sort (Knuth 1998, TAOCP vol. 3,
 * 5.2.1 and 5.2.5) whose bucket index is a cheap monotone stand-in for the
 * normal CDF, u = 1/2 + t / (2 (1 + |t|)) with t = 0.8 z (slope 0.4 at the
 * centre, like the normal density 0.399), followed by an insertion sort that
 * only has to fix order within buckets. Because the bucket map is monotone the
 * result is exactly sorted whatever the data; the normal shape only makes it
 * fast (a few items per bucket).
 * Used because the engine sorts each replication's pools, and a typed array's
 * built-in sort costs several times more here.
 *
 * @param values the sample; values[0..n) are sorted in place (finite numbers).
 * @param n count, 0 <= n <= values.length.
 * @param mean, sd the normal the sample comes from (sd > 0); only speed depends on them.
 * @param scratch Float64Array of length >= n; counts and bucketOf Int32Arrays of length >= n + 1 and >= n.
 * @example sortNormalSample([3, 1, 2] as Float64Array, 3, 2, 1, ...) → [1, 2, 3]
 */
export function sortNormalSample(
  values: Float64Array,
  n: number,
  mean: number,
  sd: number,
  scratch: Float64Array,
  counts: Int32Array,
  bucketOf: Int32Array,
): void {
  if (n < 2) return;
  const c = 0.8 / sd;
  const half = n * 0.5;
  counts.fill(0, 0, n + 1);
  for (let i = 0; i < n; i++) {
    const t = c * ((values[i] as number) - mean);
    let b = Math.floor(half + (half * t) / (1 + Math.abs(t)));
    if (b >= n) b = n - 1;
    bucketOf[i] = b;
    counts[b] = (counts[b] as number) + 1;
  }
  // Exclusive prefix sums: start of each bucket.
  let acc = 0;
  for (let b = 0; b < n; b++) {
    const size = counts[b] as number;
    counts[b] = acc;
    acc += size;
  }
  for (let i = 0; i < n; i++) {
    const b = bucketOf[i] as number;
    const at = counts[b] as number;
    counts[b] = at + 1;
    scratch[at] = values[i] as number;
  }
  // Insertion sort: elements are already in bucket order.
  values[0] = scratch[0] as number;
  for (let i = 1; i < n; i++) {
    const v = scratch[i] as number;
    let j = i - 1;
    while (j >= 0 && (values[j] as number) > v) {
      values[j + 1] = values[j] as number;
      j--;
    }
    values[j + 1] = v;
  }
}
