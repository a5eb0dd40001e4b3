/** One contiguous range of replications, [from, to). */
export interface ReplicationRange {
  from: number;
  to: number;
}

/**
 * Split replications 0..total into at most `parts` contiguous ranges whose
 * sizes differ by at most one, larger ones first (the block distribution of
 * an index range: common practice for static load balancing), each holding at
 * least `minPerPart` replications where the total allows (so small runs use
 * fewer workers: starting a worker's run costs about as much as a few
 * replications). Since replication i always draws from its own stream, any
 * split gives the same numbers once the ranges are merged.
 *
 * @param total replications, whole number ≥ 1.
 * @param parts most ranges wanted, whole number ≥ 1.
 * @param minPerPart fewest replications per range (whole number ≥ 1; default 1).
 * @returns the ranges in order, covering 0..total exactly once.
 * @throws Error when an argument is not a whole number in range.
 * @example splitReplications(10, 3) // [{0,4}, {4,7}, {7,10}]
 */
export function splitReplications(total: number, parts: number, minPerPart = 1): ReplicationRange[] {
  for (const [name, v] of [['total', total], ['parts', parts], ['minPerPart', minPerPart]] as const) {
    if (!Number.isInteger(v) || v < 1) throw new Error(`The ${name} for splitting replications must be a whole number of at least 1; got ${String(v)}.`);
  }
  const n = Math.max(1, Math.min(parts, Math.floor(total / minPerPart)));
  const base = Math.floor(total / n);
  const extra = total % n;
  const out: ReplicationRange[] = [];
  let from = 0;
  for (let p = 0; p < n; p++) {
    const to = from + base + (p < extra ? 1 : 0);
    out.push({ from, to });
    from = to;
  }
  return out;
}
