import type { Plan } from '../../core/plan';
import { clusterModel } from '../../core/clusters/clusterModel';
import type { NormalSampler } from '../normalSampler';
import type { RandomSource } from '../randomSource';
import type { DrawnPools, PoolDrawer } from './poolDrawer';

/**
 * Where each cluster's people sit in a replication's rows: comparison
 * clusters first (rows [0, n_C)), then programme clusters, each cluster's
 * people consecutive. Fixed for a simulation (sizes are per cluster, so
 * unequal sizes need no other change here).
 */
export interface ClusterLayout {
  /** Clusters in the comparison pool (clusters 0 .. comparison − 1). */
  readonly comparison: number;
  /** Clusters in the programme pool (clusters comparison .. comparison + programme − 1). */
  readonly programme: number;
  /** First row of cluster c; start[comparison + programme] is the number of rows. */
  readonly start: Int32Array;
  /** The cluster of each row. */
  readonly of: Int32Array;
  /** Whether the people who sat the pretest sit the posttest (false: row i's outcome is a new person's). */
  readonly sameCohort: boolean;
  /** Match whole clusters on their observed means (true) or people (false). */
  readonly matchClusters: boolean;
}

/** A drawer whose people sit in clusters. */
export interface ClusterPoolDrawer extends PoolDrawer {
  readonly clusters: ClusterLayout;
}

/**
 * A pool drawer for the clusters design (clusterModel in src/core/clusters):
 * per group g and cluster j, the cluster's true pretest deviation
 * u_j ~ N(0, τ²_g) and the outcome's own cluster part w_j ~ N(0, σ²_w); per
 * person T = mu_g + u_j + v (v ~ N(0, σ²_wT,g)), X = T + N(0, SEM²), and the
 * outcome Y = d_g + tau·[P] + beta·T* + w_j + N(0, σ²_e), T* = T for the same
 * people, or mu_g + u_j + v' with a new person's own v' for a new cohort (row
 * i then holds a pretest taker's X and T and a posttest taker's Y). Rows are
 * drawn plainly (no sorted samples); `trueScore` is the pretest taker's T for the
 * same people, and the cluster's true mean for a new cohort (what balance after
 * matching must compare: the part of the pretest the posttest takers share).
 *
 * @param plan a validated plan with a clusters section.
 * @returns the drawer (capacity = both pools' people).
 * @throws Error (ClusterModelError) for contradictory inputs.
 * @example clusterPoolDrawer(plan).clusters.start[1] // 25 with clusters of 25
 */
export function clusterPoolDrawer(plan: Plan): ClusterPoolDrawer {
  return new ClusterDrawer(plan);
}

class ClusterDrawer implements ClusterPoolDrawer {
  readonly capacity: number;
  readonly effect: number;
  readonly observedBasis = false;
  readonly sortedByPretest = false;
  readonly clusters: ClusterLayout;
  readonly nC: number;
  readonly nP: number;
  readonly mean: Float64Array; // per cluster: mu_g
  readonly yCentre: Float64Array; // per cluster: d_g + tau·[P]
  readonly clusterSD: Float64Array; // per cluster: τ_g
  readonly withinSD: Float64Array; // per cluster: σ_wT,g
  readonly sem: number;
  readonly beta: number;
  readonly outcomeClusterSD: number;
  readonly outcomePersonSD: number;
  readonly z: Float64Array;
  readonly zc: Float64Array;

  constructor(plan: Plan) {
    const cm = clusterModel(plan);
    const m = cm.person;
    const d = cm.design;
    const JC = d.clusterCount.comparison;
    const JP = d.clusterCount.programme;
    const J = JC + JP;
    const start = new Int32Array(J + 1);
    this.mean = new Float64Array(J);
    this.yCentre = new Float64Array(J);
    this.clusterSD = new Float64Array(J);
    this.withinSD = new Float64Array(J);
    for (let c = 0; c < J; c++) {
      const who = c < JC ? 'comparison' : 'programme';
      const g = cm[who];
      start[c + 1] = (start[c] as number) + d.clusterSize[who];
      this.mean[c] = m.mean[who];
      this.yCentre[c] = who === 'programme' ? m.growthGap + m.effect : 0;
      this.clusterSD[c] = Math.sqrt(g.components.betweenTrue);
      this.withinSD[c] = Math.sqrt(g.components.withinTrue);
    }
    const N = start[J] as number;
    const of = new Int32Array(N);
    for (let c = 0; c < J; c++) for (let i = start[c] as number; i < (start[c + 1] as number); i++) of[i] = c;
    this.nC = start[JC] as number;
    this.nP = N - this.nC;
    this.capacity = Math.max(4, N);
    this.effect = m.effect;
    this.sem = m.sem;
    this.beta = m.beta;
    this.outcomeClusterSD = Math.sqrt(cm.outcomeClusterVar);
    this.outcomePersonSD = Math.sqrt(cm.outcomePersonVar);
    const same = d.cohort === 'same';
    this.clusters = { comparison: JC, programme: JP, start, of, sameCohort: same, matchClusters: d.level === 'clusters' };
    this.z = new Float64Array((same ? 3 : 4) * N);
    this.zc = new Float64Array(2 * J);
  }

  draw(normal: NormalSampler, _rng: RandomSource, pools: DrawnPools): void {
    const { start, sameCohort } = this.clusters;
    const J = this.clusters.comparison + this.clusters.programme;
    const N = start[J] as number;
    const { z, zc, sem, beta, outcomeClusterSD, outcomePersonSD } = this;
    normal.fillStandard(zc, 2 * J);
    normal.fillStandard(z, (sameCohort ? 3 : 4) * N);
    const { observed, trueScore, outcome } = pools;
    for (let c = 0; c < J; c++) {
      const mu = this.mean[c] as number;
      const clusterMean = mu + (this.clusterSD[c] as number) * (zc[c] as number);
      const yBase = (this.yCentre[c] as number) + outcomeClusterSD * (zc[J + c] as number);
      const sw = this.withinSD[c] as number;
      for (let i = start[c] as number, end = start[c + 1] as number; i < end; i++) {
        const t = clusterMean + sw * (z[i] as number);
        // The true score the balance figures compare: the person's own for the same people; for a new
        // cohort the cluster's true mean, the only part of the pretest the posttest takers share.
        trueScore[i] = sameCohort ? t : clusterMean;
        observed[i] = t + sem * (z[N + i] as number);
        const taker = sameCohort ? t : clusterMean + sw * (z[3 * N + i] as number);
        outcome[i] = yBase + beta * taker + outcomePersonSD * (z[2 * N + i] as number);
      }
    }
    pools.nComparison = this.nC;
    pools.nProgramme = this.nP;
  }
}
