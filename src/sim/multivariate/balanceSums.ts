/*
 * The several-covariate engine's balance sums (createMultivariateSimulation's
 * recordBalance, and the logit's variance for the caliper): the matched rows
 * listed once per replication, then shifted sums over a group's rows and over
 * the listed rows (Chan, Golub & LeVeque 1983, "Algorithms for computing the
 * sample variance", The American Statistician 37: shifting by a value of the
 * data keeps the cancellation error small).
 */

/**
 * The rows i of [from, to) whose weight[i − from] is not 0, in order, into
 * rows[] with their weights into weights[].
 * @param weight a weight per row, indexed from `from`. @param from first row. @param to end row (exclusive).
 * @param rows receives the rows. @param weights receives their weights.
 * @returns how many rows were listed. @throws never.
 * @example countedRows([0, 2, 0, 1], 10, 14, rows, weights) // 2; rows [11, 13], weights [2, 1]
 */
export function countedRows(weight: ArrayLike<number>, from: number, to: number, rows: Int32Array, weights: Float64Array): number {
  let count = 0;
  for (let i = from; i < to; i++) {
    const w = weight[i - from] as number;
    if (w === 0) continue;
    rows[count] = i;
    weights[count++] = w;
  }
  return count;
}

/**
 * Count, shifted sum and sum of squares of col[from..to) (out[0..2]) and of
 * the listed rows rows[0..count) weighted by weights[t] (out[3..5], from
 * countedRows); values are shifted by `shift` (Chan, Golub & LeVeque 1983).
 * Each sum runs over its rows in order, as one pass skipping the rows of weight 0 would.
 * @returns nothing (fills out). @throws never.
 * @example col [1, 2, 3], rows [2] weight 2, shift 1 → out [3, 3, 5, 2, 4, 8] (hand-worked)
 */
export function subsetSums(
  col: Float64Array,
  from: number,
  to: number,
  rows: Int32Array,
  weights: Float64Array,
  count: number,
  shift: number,
  out: Float64Array,
): void {
  let s = 0, ss = 0, n2 = 0, s2 = 0, ss2 = 0;
  for (let i = from; i < to; i++) {
    const d = (col[i] as number) - shift;
    s += d;
    ss += d * d;
  }
  for (let t = 0; t < count; t++) {
    const w = weights[t] as number;
    const d = (col[rows[t] as number] as number) - shift;
    n2 += w;
    s2 += w * d;
    ss2 += w * d * d;
  }
  out[0] = to - from;
  out[1] = s;
  out[2] = ss;
  out[3] = n2;
  out[4] = s2;
  out[5] = ss2;
}

/**
 * subsetSums of two columns at once (a variable's observed and true values),
 * into outA and outB: each sum over the same rows in the same order with the
 * same operations as subsetSums, so the same bits, in half the sweeps (a test
 * compares them).
 * @returns nothing (fills outA and outB). @throws never.
 * @example pairedSubsetSums(x, t, 0, n, rows, w, count, x[0], t[0], a, b) // a, b as subsetSums gives each
 */
export function pairedSubsetSums(
  colA: Float64Array,
  colB: Float64Array,
  from: number,
  to: number,
  rows: Int32Array,
  weights: Float64Array,
  count: number,
  shiftA: number,
  shiftB: number,
  outA: Float64Array,
  outB: Float64Array,
): void {
  let sA = 0, ssA = 0, sB = 0, ssB = 0;
  for (let i = from; i < to; i++) {
    const dA = (colA[i] as number) - shiftA;
    const dB = (colB[i] as number) - shiftB;
    sA += dA;
    ssA += dA * dA;
    sB += dB;
    ssB += dB * dB;
  }
  let n2 = 0, s2A = 0, ss2A = 0, s2B = 0, ss2B = 0;
  for (let t = 0; t < count; t++) {
    const w = weights[t] as number;
    const r = rows[t] as number;
    const dA = (colA[r] as number) - shiftA;
    const dB = (colB[r] as number) - shiftB;
    n2 += w;
    s2A += w * dA;
    ss2A += w * dA * dA;
    s2B += w * dB;
    ss2B += w * dB * dB;
  }
  outA[0] = to - from;
  outA[1] = sA;
  outA[2] = ssA;
  outA[3] = n2;
  outA[4] = s2A;
  outA[5] = ss2A;
  outB[0] = to - from;
  outB[1] = sB;
  outB[2] = ssB;
  outB[3] = n2;
  outB[4] = s2B;
  outB[5] = ss2B;
}
