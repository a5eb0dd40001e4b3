/**
 * Which replications a summary counts: replication i counts when
 * ok[i * stride + offset] has `bit` set (stride and offset let one byte array
 * hold flags for several variables, replication-major).
 */
export interface ReplicationSelection {
  readonly ok: Uint8Array;
  /** A non-zero flag bit; 0 counts every replication. */
  readonly bit: number;
  /** Entries per replication in ok (default 1). */
  readonly stride?: number;
  /** Which of them (default 0). */
  readonly offset?: number;
}

/**
 * Mean of a per-replication figure and its Monte Carlo SE, sd / sqrt(c) with
 * the sd's divisor c − 1, over the c replications selected (Morris, White &
 * Crowther 2019, Table 6: the MCSE of a mean over replications). Two passes
 * (mean, then squared deviations), summed in replication order.
 *
 * @param values the figure per replication (first n used).
 * @param n number of replications stored.
 * @param select which replications count (default: all).
 * @returns [mean, MCSE]; [0, 0] when none is selected, [mean, 0] when one is.
 * @throws never.
 * @example meanAndMCSE(Float64Array.of(1, 2, 3), 3) // [2, 1 / sqrt(3) ≈ 0.577] (hand-worked)
 */
export function meanAndMCSE(values: Float64Array, n: number, select?: ReplicationSelection): [number, number] {
  const ok = select?.ok;
  const bit = select ? select.bit : 0;
  const stride = select?.stride ?? 1;
  const offset = select?.offset ?? 0;
  let c = 0;
  let s = 0;
  for (let i = 0; i < n; i++) {
    if (bit && !(((ok as Uint8Array)[i * stride + offset] as number) & bit)) continue;
    c++;
    s += values[i] as number;
  }
  if (c === 0) return [0, 0];
  const mean = s / c;
  if (c < 2) return [mean, 0];
  let ss = 0;
  for (let i = 0; i < n; i++) {
    if (bit && !(((ok as Uint8Array)[i * stride + offset] as number) & bit)) continue;
    const d = (values[i] as number) - mean;
    ss += d * d;
  }
  return [mean, Math.sqrt(ss / (c - 1) / c)];
}

/**
 * Number of the first n replications a selection counts.
 * @param n number of replications stored. @param select the selection (bit 0: all n).
 * @returns a count in 0..n. @throws never.
 * @example countSelected(3, { ok: Uint8Array.of(1, 0, 3), bit: 1 }) // 2
 */
export function countSelected(n: number, select: ReplicationSelection): number {
  const { ok, bit } = select;
  if (!bit) return n;
  const stride = select.stride ?? 1;
  const offset = select.offset ?? 0;
  let c = 0;
  for (let i = 0; i < n; i++) if ((ok[i * stride + offset] as number) & bit) c++;
  return c;
}
