import type { RandomSource } from '../randomSource';
import type { CovariateMatching, MatchSettings } from './covariateMatching';
import { groupPoolsByStratum, type StratumGroups } from './exactStrata';
import { orderProgrammeByScore } from './orderProgrammeByScore';
import { createSortWorkspace, sortIndicesByScore, type SortWorkspace } from './sortIndicesByScore';

/** Buffers for matchOnMahalanobis, allocated once per plan. */
export interface MahalanobisMatchingWorkspace extends CovariateMatching, StratumGroups {
  /** Grid cell key per person (pool indexing). */
  readonly cellKey: Float64Array;
  /** Cell keys of the comparison members in grid order. */
  readonly sortedKey: Float64Array;
  readonly used: Uint8Array;
  /** Candidate list for random picks. */
  readonly candidates: Int32Array;
  readonly bestIndex: Int32Array;
  readonly bestDistance: Float64Array;
  readonly sort: SortWorkspace;
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
    cellKey: new Float64Array(nProgramme + nComparison),
    sortedKey: new Float64Array(nComparison),
    used: new Uint8Array(nComparison),
    candidates: new Int32Array(nComparison),
    bestIndex: new Int32Array(ratio),
    bestDistance: new Float64Array(ratio),
    sort: createSortWorkspace(n),
  };
}

/** Cells per grid axis at most (keeps cell numbers below 2^30, sorted exactly by sortIndicesByScore). */
const MAX_CELLS = 2 ** 15;

/**
 * Greedy caliper matching on the Mahalanobis distance (Rubin 1980,
 * "Bias reduction using Mahalanobis-metric matching", Biometrics 36; Rosenbaum
 * & Rubin 1985), within strata of exactly matched covariates. The caller
 * passes whitened coordinates w = L'x (A = L L' the inverse covariance used by
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
 * Search: the comparison members of a stratum are put on a grid over the
 * first one or two whitened coordinates, sorted by cell (each run of
 * consecutive cells in a row found by binary search). 'random-within-caliper'
 * uses cells one caliper wide and examines the 3 × 3 block around the
 * programme member's cell (every eligible member is there). 'nearest' uses
 * finer cells (about three comparison members per cell at the centre of the
 * cloud) and examines rings of cells outward from the member's own, stopping
 * once the next ring can hold no one nearer than the k-th best found or
 * within the caliper. Time O(n log n + candidates × coordinates): for
 * 'nearest' a few cells per member while partners are close; for 'random'
 * every member within the caliper must be listed, so its cost grows with the
 * caliper's share of the pool. Worst case (a caliper covering most of the
 * pool): O(n_P × n_C × coordinates), the cost of comparing all pairs.
 *
 * @param coords whitened coordinates, one Float64Array per coordinate (≥ 1), pool indexing
 *   (comparison members at [0, nC), programme members at [nC, nC + nP)).
 * @param stratum stratum number per person, or null for one stratum.
 * @param strata number of strata (1 when `stratum` is null).
 * @param orderScore the score that 'lowest-first' / 'highest-first' order by (the engine passes the observed pretest).
 * @param settings caliper in Mahalanobis-distance units (> 0), method, replacement, order.
 * @param rng random source (used by 'random-within-caliper').
 * @param ws workspace from createMahalanobisMatchingWorkspace; partners / partnerCount are filled.
 * @returns the number of programme members with at least one partner.
 * @throws Error when the caliper is not a positive finite number.
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
  const { nComparison: nC, ratio: k, orderC, orderP, cellKey, sortedKey, used, candidates } = ws;
  const { partners, partnerCount, bestIndex, bestDistance } = ws;
  const count = groupPoolsByStratum(stratum, strata, ws);
  const startC = ws.startC;
  const startP = ws.startP;
  partnerCount.fill(0);
  partners.fill(-1);
  used.fill(0);
  const dims = coords.length;
  const w1 = coords[0] as Float64Array;
  const w2 = dims > 1 ? (coords[1] as Float64Array) : null;
  const cal2 = caliper * caliper;
  const nearest = settings.method === 'nearest';
  const replacement = settings.replacement;
  const byScore = !replacement && settings.order !== 'random';
  let matched = 0;

  for (let s = 0; s < count; s++) {
    const c0 = startC[s] as number;
    const c1 = startC[s + 1] as number;
    const p0 = startP[s] as number;
    const p1 = startP[s + 1] as number;
    if (p1 === p0 || c1 === c0) continue;
    // Grid over the comparison members' first one or two coordinates.
    let lo1 = Infinity, hi1 = -Infinity, lo2 = 0, hi2 = 0;
    for (let j = c0; j < c1; j++) {
      const v = w1[orderC[j] as number] as number;
      if (v < lo1) lo1 = v;
      if (v > hi1) hi1 = v;
    }
    if (w2) {
      lo2 = Infinity;
      hi2 = -Infinity;
      for (let j = c0; j < c1; j++) {
        const v = w2[orderC[j] as number] as number;
        if (v < lo2) lo2 = v;
        if (v > hi2) hi2 = v;
      }
    }
    // Cell side: for 'random-within-caliper' one caliper (every eligible member lies in the 3 × 3
    // block around the programme member's cell); for 'nearest' finer, about three comparison
    // members per cell at the centre of the whitened (unit-variance) cloud, searched ring by ring.
    const mC = c1 - c0;
    const dense = w2 ? Math.sqrt((6 * Math.PI) / mC) : 7.5 / mC;
    const floorSide = Math.max((hi1 - lo1) / MAX_CELLS, (hi2 - lo2) / MAX_CELLS);
    const h = nearest ? Math.max(Math.min(caliper, dense), floorSide) : Math.max(caliper * (1 + 1e-9), floorSide);
    // Cell numbers are computed by rounding divisions: allow for that in the ring bound.
    const slack = 1e-12 * (Math.abs(lo1) + Math.abs(hi1) + Math.abs(lo2) + Math.abs(hi2) + h);
    const rows = Math.floor((hi1 - lo1) / h) + 1;
    const cols = w2 ? Math.floor((hi2 - lo2) / h) + 1 : 1;
    for (let j = c0; j < c1; j++) {
      const c = orderC[j] as number;
      const r = Math.floor(((w1[c] as number) - lo1) / h);
      const q = w2 ? Math.floor(((w2[c] as number) - lo2) / h) : 0;
      cellKey[c] = r * cols + q;
    }
    sortIndicesByScore(cellKey, orderC, c0, c1, ws.sort);
    for (let j = c0; j < c1; j++) sortedKey[j] = cellKey[orderC[j] as number] as number;
    if (byScore) orderProgrammeByScore(orderScore, orderP, p0, p1, settings.order, ws.sort);

    for (let qp = p0; qp < p1; qp++) {
      const pi = orderP[qp] as number;
      const j = pi - nC;
      const r = Math.floor(((w1[pi] as number) - lo1) / h);
      const q = w2 ? Math.floor(((w2[pi] as number) - lo2) / h) : 0;
      let got = 0; // nearest: size of the best list; random: number of candidates
      // Rings of cells at Chebyshev distance rho from the programme member's cell: rho = 0 is the
      // cell itself; ring rho is its top and bottom rows and, with two coordinates, the left and
      // right cells of the rows between. A member in ring rho + 1 is at least rho·h away.
      for (let rho = 0; ; rho++) {
        const top = r - rho;
        const bottom = r + rho;
        const left = q - rho;
        const right = q + rho;
        let segments = 1;
        let midStart = 0;
        if (rho > 0) {
          midStart = Math.max(top + 1, 0);
          const midEnd = Math.min(bottom - 1, rows - 1);
          segments = 2 + (cols > 1 ? 2 * Math.max(0, midEnd - midStart + 1) : 0);
        }
        for (let sg = 0; sg < segments; sg++) {
          let row: number;
          let qa: number;
          let qb: number;
          if (rho === 0) {
            row = r;
            qa = q;
            qb = q;
          } else if (sg < 2) {
            row = sg === 0 ? top : bottom;
            qa = left;
            qb = right;
          } else {
            const m = sg - 2;
            row = midStart + (m >> 1);
            qa = m & 1 ? right : left;
            qb = qa;
          }
          if (row < 0 || row >= rows) continue;
          if (qa < 0) qa = 0;
          if (qb > cols - 1) qb = cols - 1;
          if (qa > qb) continue;
          const keyLo = row * cols + qa;
          const keyHi = row * cols + qb;
          // First position with key >= keyLo, then walk while key <= keyHi.
          let a = c0;
          let b = c1;
          while (a < b) {
            const mid = (a + b) >>> 1;
            if ((sortedKey[mid] as number) < keyLo) a = mid + 1;
            else b = mid;
          }
          for (let t = a; t < c1 && (sortedKey[t] as number) <= keyHi; t++) {
            const c = orderC[t] as number;
            if (!replacement && used[c]) continue;
            const bound = nearest && got === k ? Math.min(cal2, bestDistance[k - 1] as number) : cal2;
            let d2 = 0;
            for (let dim = 0; dim < dims && d2 <= bound; dim++) {
              const col = coords[dim] as Float64Array;
              const diff = (col[pi] as number) - (col[c] as number);
              d2 += diff * diff;
            }
            if (d2 > bound) continue;
            if (!nearest) {
              candidates[got++] = c;
              continue;
            }
            // Insert (d2, c) into the sorted best list (ties: lower comparison index first).
            let pos = got < k ? got : k - 1;
            if (got === k) {
              const wd = bestDistance[k - 1] as number;
              if (d2 > wd || (d2 === wd && c > (bestIndex[k - 1] as number))) continue;
            } else got++;
            while (pos > 0) {
              const pd = bestDistance[pos - 1] as number;
              if (pd < d2 || (pd === d2 && (bestIndex[pos - 1] as number) < c)) break;
              bestDistance[pos] = pd;
              bestIndex[pos] = bestIndex[pos - 1] as number;
              pos--;
            }
            bestDistance[pos] = d2;
            bestIndex[pos] = c;
          }
        }
        if (top <= 0 && bottom >= rows - 1 && left <= 0 && right >= cols - 1) break; // the whole grid is searched
        if (!nearest) {
          if (rho >= 1) break; // the 3 × 3 block of cells one caliper wide holds every eligible member
          continue;
        }
        const next = rho * h - slack; // nearest possible distance in the next ring
        if (next > caliper) break;
        if (got === k && next > 0 && next * next > (bestDistance[k - 1] as number)) break;
      }
      const base = j * k;
      let taken = 0;
      if (nearest) {
        for (; taken < got; taken++) partners[base + taken] = bestIndex[taken] as number;
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
        if (!replacement) for (let t = 0; t < taken; t++) used[partners[base + t] as number] = 1;
      }
    }
  }
  return matched;
}
