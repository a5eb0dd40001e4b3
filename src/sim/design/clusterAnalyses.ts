import type { AnalysisRecords } from '../analysisRecords';
import { SLOT_MATCHED, SLOT_MATCHED_NAIVE, SLOT_PERSON, SLOT_PERSON_NAIVE } from '../analysisRecords';
import type { MatchedSets } from '../matchedSets';
import type { ClusterLayout } from './clusterPoolDrawer';
import { ClusterSums, clusterRobustAncova } from './clusterRobustAncova';
import { clusterRobustDifference } from './clusterRobustDifference';
import { createDrawnPools, type DrawnPools } from './poolDrawer';

/**
 * The pools engine's cluster work for one simulation (buffers allocated once):
 * each replication's cluster means as "unit pools" (one row per cluster, the
 * same layout as people: comparison clusters first), on which the engine's
 * shared analyses run unchanged — ANCOVA and the gain score on cluster means,
 * and with matching.level 'clusters' the matching of clusters on their observed
 * means, the matched difference of cluster means (SE from the matched cluster
 * pairs, df matched clusters − 1), ANCOVA in the matched clusters and the
 * balance; plus the person-level ANCOVA with CR2 SEs beside its naive OLS SE
 * (clusterRobustAncova), and, when people are matched across clusters, the
 * matched difference's cluster-robust SE (clusterRobustDifference, partners
 * weighted 1/k) beside the one-level matching-weights SE.
 */
export class ClusterWork {
  readonly layout: ClusterLayout;
  /** One row per cluster: observed pretest mean, true-score mean (pretest takers), outcome mean. */
  readonly units: DrawnPools;
  readonly sums: ClusterSums;
  readonly weight: Float64Array;
  readonly weightY: Float64Array;
  readonly out = new Float64Array(5);

  constructor(layout: ClusterLayout) {
    this.layout = layout;
    const J = layout.comparison + layout.programme;
    this.units = createDrawnPools(Math.max(4, J));
    this.sums = new ClusterSums(J);
    for (let c = 0; c < J; c++) this.sums.group[c] = c < layout.comparison ? 0 : 1;
    this.sums.count = J;
    this.weight = new Float64Array(J);
    this.weightY = new Float64Array(J);
  }

  /**
   * Fill the cluster means from a replication's people, and the per-cluster
   * sums of the person-level regression: x is each person's own pretest with
   * the same people, the cluster's pretest mean with a new cohort (the only
   * pretest its posttest takers have). Sums are about the pools' overall means.
   */
  fillClusters(pools: DrawnPools): void {
    const { start, comparison, programme, sameCohort } = this.layout;
    const J = comparison + programme;
    const { observed: x, trueScore: t, outcome: y } = pools;
    const u = this.units;
    const N = start[J] as number;
    let gx = 0, gy = 0;
    for (let c = 0; c < J; c++) {
      let sx = 0, st = 0, sy = 0;
      const from = start[c] as number, to = start[c + 1] as number;
      for (let i = from; i < to; i++) {
        sx += x[i] as number;
        st += t[i] as number;
        sy += y[i] as number;
      }
      const n = to - from;
      u.observed[c] = sx / n;
      u.trueScore[c] = st / n;
      u.outcome[c] = sy / n;
      gx += sx;
      gy += sy;
    }
    u.nComparison = comparison;
    u.nProgramme = programme;
    const cx = gx / N, cy = gy / N;
    const s = this.sums;
    for (let c = 0; c < J; c++) {
      const from = start[c] as number, to = start[c + 1] as number;
      const n = to - from;
      let sx = 0, sxx = 0, sy = 0, sxy = 0, syy = 0;
      const mean = (u.observed[c] as number) - cx;
      for (let i = from; i < to; i++) {
        const xi = sameCohort ? (x[i] as number) - cx : mean;
        const yi = (y[i] as number) - cy;
        sx += xi; sxx += xi * xi; sy += yi; sxy += xi * yi; syy += yi * yi;
      }
      s.n[c] = n; s.sx[c] = sx; s.sxx[c] = sxx; s.sy[c] = sy; s.sxy[c] = sxy; s.syy[c] = syy;
    }
  }

  /** Record replication i's person-level ANCOVA: CR2 SE (SLOT_PERSON) and naive OLS SE (SLOT_PERSON_NAIVE). */
  personLevel(i: number, records: AnalysisRecords): void {
    const o = this.out;
    if (!clusterRobustAncova(this.sums, o)) return;
    records.record(SLOT_PERSON, i, o[0] as number, o[1] as number, o[2] as number);
    records.record(SLOT_PERSON_NAIVE, i, o[0] as number, o[3] as number, o[4] as number);
  }

  /**
   * People matched across clusters: keep the one-level matching-weights
   * figures in SLOT_MATCHED_NAIVE and record the same estimate in SLOT_MATCHED
   * with a cluster-robust SE: the CR2 variance of the weighted group means of
   * the residuals Y − bX (b the pooled within-group slope of the full pools;
   * matched programme people weight 1, each partner 1/(its set's partner
   * count) per use; clusters as the units). Using Y − bX rather than Y keeps
   * out the between-cluster variation that matching on X has already paired
   * away (partners share the programme member's X, so their difference
   * carries only the residual's cluster parts).
   */
  peopleMatched(i: number, records: AnalysisRecords, sets: MatchedSets, pools: DrawnPools, slope: number): void {
    const flags = records.flags[SLOT_MATCHED] as Uint8Array;
    if (flags[i] === 0) return;
    const est = records.est[SLOT_MATCHED] as Float64Array;
    const se = records.se[SLOT_MATCHED] as Float64Array;
    const { of } = this.layout;
    const w = this.weight;
    const wy = this.weightY;
    w.fill(0);
    wy.fill(0);
    const nC = pools.nComparison;
    const y = pools.outcome;
    const x = pools.observed;
    const k = sets.ratio;
    let m = 0;
    for (let j = 0; j < sets.nProgramme; j++) {
      const cnt = sets.partnerCount[j] as number;
      if (cnt === 0) continue;
      m++;
      const row = nC + j;
      const cl = of[row] as number;
      w[cl] = (w[cl] as number) + 1;
      wy[cl] = (wy[cl] as number) + (y[row] as number) - slope * (x[row] as number);
      for (let q = 0; q < cnt; q++) {
        const r = sets.partners[j * k + q] as number;
        const cc = of[r] as number;
        w[cc] = (w[cc] as number) + 1 / cnt;
        wy[cc] = (wy[cc] as number) + ((y[r] as number) - slope * (x[r] as number)) / cnt;
      }
    }
    const naiveEstimate = est[i] as number;
    const naiveSE = se[i] as number;
    const o = this.out;
    if (!clusterRobustDifference(this.sums.group, w, wy, this.sums.count, o)) {
      flags[i] = 0; // no cluster-aware SE: the replication does not count for the matched difference
      records.record(SLOT_MATCHED_NAIVE, i, naiveEstimate, naiveSE, Math.max(1, m - 1));
      return;
    }
    records.record(SLOT_MATCHED_NAIVE, i, naiveEstimate, naiveSE, Math.max(1, m - 1));
    records.record(SLOT_MATCHED, i, naiveEstimate, o[1] as number, o[2] as number);
  }
}
