/** Most (stratum, value) keys looked up in a table rather than a map. */
const DENSE_KEYS = 1 << 16;
/** The table's buffer, shared by calls (filled afresh by each; it carries nothing from one call to the next). */
let denseTable = new Int32Array(0);
/** groupByStratum's running offsets, shared by calls likewise (no allocation per call). */
let fillScratch = new Int32Array(16);

/**
 * Strata for exact matching: people with identical values on every exactly
 * matched covariate share a stratum (Rosenbaum 2002, "Observational Studies",
 * 2nd ed., ch. 3 on exact matching / stratification; common practice).
 * Stratum numbers are 0, 1, … in order of first appearance, so they depend only
 * on the data.
 *
 * @param columns the exactly matched covariates' values (whole numbers in the
 *   engine), each a Float64Array of at least `size` values. No columns: everyone in stratum 0.
 * @param size number of people.
 * @param out receives each person's stratum number (length ≥ size).
 * @returns the number of strata.
 * @throws Error when a value is not finite.
 * @example exactStrata([Float64Array.of(0, 1, 0, 2)], 4, out) // 3; out = [0, 1, 0, 2]
 */
export function exactStrata(columns: readonly Float64Array[], size: number, out: Int32Array): number {
  out.fill(0, 0, size);
  let count = size > 0 ? 1 : 0;
  for (const col of columns) {
    // Refine the strata column by column: key (previous stratum, value) → new stratum.
    let lo = Infinity;
    let hi = -Infinity;
    let wholeNumbers = true;
    for (let i = 0; i < size; i++) {
      const v = col[i] as number;
      if (!Number.isFinite(v)) throw new Error(`An exactly matched covariate has a value that is not a finite number (${v}).`);
      if (v < lo) lo = v;
      if (v > hi) hi = v;
      if (wholeNumbers && !Number.isInteger(v)) wholeNumbers = false;
    }
    const integral = Number.isInteger(lo) && Number.isInteger(hi);
    const span = hi - lo + 1;
    if (wholeNumbers && count * span <= DENSE_KEYS) {
      // Few possible keys (a 0/1 record, a handful of bands): a table instead of the map, the
      // same numbering (first seen, first numbered).
      const table = denseTable.length >= count * span ? denseTable : (denseTable = new Int32Array(DENSE_KEYS));
      table.fill(-1, 0, count * span);
      let next = 0;
      for (let i = 0; i < size; i++) {
        const key = (out[i] as number) * span + ((col[i] as number) - lo);
        let id = table[key] as number;
        if (id < 0) {
          id = next++;
          table[key] = id;
        }
        out[i] = id;
      }
      count = next;
      continue;
    }
    const numericKeys = integral && count * span < 2 ** 52;
    const ids = new Map<string | number, number>();
    for (let i = 0; i < size; i++) {
      const v = col[i] as number;
      const key = numericKeys && Number.isInteger(v) ? (out[i] as number) * span + (v - lo) : `${out[i]}|${v}`;
      let id = ids.get(key);
      if (id === undefined) {
        id = ids.size;
        ids.set(key, id);
      }
      out[i] = id;
    }
    count = ids.size;
  }
  return count;
}

/**
 * Group people by stratum (a stable counting sort): `order[start[s] .. start[s + 1])`
 * lists the members of stratum s in their original order.
 *
 * @param stratum stratum number per person (0 ≤ s < count), read at indices from..to.
 * @param from first person (inclusive); `order` receives person indices in [from, to).
 * @param to last person (exclusive).
 * @param count number of strata.
 * @param order receives to − from person indices.
 * @param start receives count + 1 offsets into `order`.
 * @returns nothing.
 * @throws never.
 * @example groupByStratum(Int32Array.of(1, 0, 1), 0, 3, 2, order, start) // order [1, 0, 2], start [0, 1, 3]
 */
export function groupByStratum(stratum: Int32Array, from: number, to: number, count: number, order: Int32Array, start: Int32Array): void {
  start.fill(0, 0, count + 1);
  for (let i = from; i < to; i++) start[(stratum[i] as number) + 1] = (start[(stratum[i] as number) + 1] as number) + 1;
  for (let s = 0; s < count; s++) start[s + 1] = (start[s + 1] as number) + (start[s] as number);
  if (fillScratch.length < count) fillScratch = new Int32Array(Math.max(count, 2 * fillScratch.length));
  const fill = fillScratch;
  fill.set(start.subarray(0, count));
  for (let i = from; i < to; i++) {
    const s = stratum[i] as number;
    order[fill[s] as number] = i;
    fill[s] = (fill[s] as number) + 1;
  }
}

/** The stratum bookkeeping a matcher's workspace carries (see groupPoolsByStratum). */
export interface StratumGroups {
  readonly nProgramme: number;
  readonly nComparison: number;
  /** Comparison members (pool indices 0..nC − 1) grouped by stratum. */
  readonly orderC: Int32Array;
  /** Programme members (pool indices nC..nC + nP − 1) grouped by stratum. */
  readonly orderP: Int32Array;
  /** Offsets of each stratum in orderC (strata + 1); replaced by a longer array when needed. */
  startC: Int32Array;
  /** Offsets of each stratum in orderP (strata + 1); replaced likewise. */
  startP: Int32Array;
}

/**
 * Group both pools by stratum for matching (groupByStratum on each): pool
 * indexing puts comparison members at [0, nC) and programme members at
 * [nC, nC + nP); without strata everyone is in stratum 0, in pool order.
 * Grows ws.startC / ws.startP when there are more strata than they hold.
 *
 * @param stratum stratum number per person (pool indexing), or null for one stratum.
 * @param strata number of strata (ignored when `stratum` is null).
 * @param ws the matcher's workspace; orderC, orderP, startC, startP are filled.
 * @returns the number of strata grouped (1 when `stratum` is null).
 * @throws never.
 * @example
 *   // nC = 2, nP = 1, stratum [1, 0, 1], strata 2 → orderC [1, 0], startC [0, 1, 2]; orderP [2], startP [0, 0, 1]
 */
export function groupPoolsByStratum(stratum: Int32Array | null, strata: number, ws: StratumGroups): number {
  const { nProgramme: nP, nComparison: nC, orderC, orderP } = ws;
  const count = stratum ? strata : 1;
  if (count + 1 > ws.startC.length) {
    ws.startC = new Int32Array(count + 1);
    ws.startP = new Int32Array(count + 1);
  }
  const startC = ws.startC;
  const startP = ws.startP;
  if (stratum) {
    groupByStratum(stratum, 0, nC, count, orderC, startC);
    groupByStratum(stratum, nC, nC + nP, count, orderP, startP);
  } else {
    for (let j = 0; j < nC; j++) orderC[j] = j;
    for (let j = 0; j < nP; j++) orderP[j] = nC + j;
    startC[0] = 0;
    startC[1] = nC;
    startP[0] = 0;
    startP[1] = nP;
  }
  return count;
}
