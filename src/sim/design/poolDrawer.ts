import type { NormalSampler } from '../normalSampler';
import type { RandomSource } from '../randomSource';
import type { ClusterLayout } from './clusterPoolDrawer';

/**
 * One replication's people, as a design's drawer leaves them for the pools
 * engine (createPoolsSimulation). Arrays are allocated once per simulation
 * (length `capacity`) and overwritten every replication. Comparison members
 * occupy rows [0, nComparison), programme members rows
 * [nComparison, nComparison + nProgramme); with a selection rule the two sizes
 * change from replication to replication. In a one-group design the
 * "comparison" rows are the people the rule did not select (never analysed).
 */
export interface DrawnPools {
  /** Most people a replication can hold (the arrays' length). */
  readonly capacity: number;
  /** Observed pretest, points. */
  readonly observed: Float64Array;
  /** True pretest score, points. */
  readonly trueScore: Float64Array;
  /** Outcome (posttest), points, including the programme effect and the growth gap for programme members. */
  readonly outcome: Float64Array;
  /** The observed variable the selection rule used (pretest or screener), points; unused when the basis is not observed. */
  readonly basis: Float64Array;
  /** Comparison members this replication (rows 0 .. nComparison − 1). */
  nComparison: number;
  /** Programme members this replication (rows nComparison .. nComparison + nProgramme − 1). */
  nProgramme: number;
}

/**
 * How a design draws its people. The pools engine asks a drawer, once per
 * replication, to fill a DrawnPools from the replication's own random stream;
 * everything after that (matching, every analysis, every summary) is shared
 * by all designs. A drawer allocates its buffers once, when it is created.
 */
export interface PoolDrawer {
  /** Most people one replication can hold. */
  readonly capacity: number;
  /** True programme effect tau, points (the estimates are judged against it). */
  readonly effect: number;
  /** Whether `basis` is filled: the rule used an observed variable (regression discontinuity can use it). */
  readonly observedBasis: boolean;
  /**
   * Whether each group's rows come out ascending by the observed pretest (drawn
   * as a sorted sample), so matching needs no sort.
   */
  readonly sortedByPretest: boolean;
  /**
   * Present when people sit in clusters (clusterPoolDrawer): where each
   * cluster's rows are. The engine then runs the full-sample analyses on the
   * cluster means, matches clusters or people, and adds the person-level ANCOVA.
   */
  readonly clusters?: ClusterLayout;
  /**
   * Draw one replication's people into `pools` (and set its two sizes), using
   * only `normal` and `rng` (already reseeded for the replication), so the same
   * replication always gives the same people.
   */
  draw(normal: NormalSampler, rng: RandomSource, pools: DrawnPools): void;
}

/**
 * Allocate the per-replication arrays for a drawer's capacity.
 * @param capacity most people per replication (whole number ≥ 4).
 * @returns empty pools (both sizes 0).
 * @throws Error when capacity is not a whole number of at least 4.
 * @example createDrawnPools(2000).observed.length // 2000
 */
export function createDrawnPools(capacity: number): DrawnPools {
  if (!Number.isInteger(capacity) || capacity < 4) {
    throw new Error(`A simulated replication needs room for at least 4 people; got ${String(capacity)}.`);
  }
  return {
    capacity,
    observed: new Float64Array(capacity),
    trueScore: new Float64Array(capacity),
    outcome: new Float64Array(capacity),
    basis: new Float64Array(capacity),
    nComparison: 0,
    nProgramme: 0,
  };
}
