import type { ReplicationBlock } from './replicationBlock';
import type { AnalysisId, AnalysisRecord, Plan } from '../core/plan';

/** One Monte Carlo estimate's summary across replications; each figure has its Monte Carlo SE. */
export interface SimAnalysisSummary {
  id: AnalysisId;
  /** Sample the analysis was run in: the full unmatched pools or the matched sample (added; optional for older readers). */
  sample?: 'full' | 'matched';
  /** true: the analysis could be computed in at least two replications and every figure below is filled (added; optional for older readers). */
  feasible?: true;
  meanEstimate: number;
  meanEstimateMCSE: number;
  /** meanEstimate - tau. */
  bias: number;
  biasMCSE: number;
  empiricalSE: number;
  empiricalSEMCSE: number;
  meanModelSE: number;
  meanModelSEMCSE: number;
  rmse: number;
  rmseMCSE: number;
  /** Share of 95% CIs that cover tau. */
  coverage: number;
  coverageMCSE: number;
  /** Share of replications with p < alpha (false-positive rate when tau = 0, power otherwise). */
  rejectionRate: number;
  rejectionRateMCSE: number;
  /** Share significant with the sign opposite to the hypothesised effect. */
  wrongSignRate: number;
  wrongSignRateMCSE: number;
  /** Replications in which this analysis could be computed. */
  replications: number;
}

/**
 * An analysis the simulation could not summarise: it could be computed in
 * fewer than two replications (typically almost nobody matched within the
 * caliper), so there are no figures, only the reason in plain English.
 * Every other analysis of the same result is still reported.
 */
export interface SimAnalysisInfeasible {
  id: AnalysisId;
  sample?: 'full' | 'matched';
  feasible: false;
  /** Why, and what to change, for the researcher. */
  reason: string;
  /** Replications in which it could be computed (0 or 1). */
  replications: number;
}

/** One analysis in a simulation result: its summary, or why it has none. */
export type SimAnalysisResult = SimAnalysisSummary | SimAnalysisInfeasible;

/**
 * Whether a simulated analysis has figures (narrows the type).
 * Reference: none (a type guard). @param s the analysis' result. @returns false for an infeasible one.
 * @throws never. @example isFeasible({ id: 'ancova', feasible: false, reason: '…', replications: 0 }) // false
 */
export function isFeasible(s: SimAnalysisResult): s is SimAnalysisSummary {
  return s.feasible !== false;
}

export interface SimMatchingSummary {
  meanMatchedProgramme: number;
  meanMatchedProgrammeMCSE: number;
  discardedProgrammeShare: number;
  discardedProgrammeShareMCSE: number;
  /** Observed pretest difference (programme - comparison), raw points. */
  observedDifferenceBefore: number;
  observedDifferenceAfter: number;
  observedDifferenceAfterMCSE: number;
  /** SMD (pooled SD) versions. */
  observedSMDBefore: number;
  observedSMDAfter: number;
  /** True-score difference after matching: the hidden imbalance. */
  trueDifferenceBefore: number;
  trueDifferenceAfter: number;
  trueDifferenceAfterMCSE: number;
  trueSMDBefore: number;
  trueSMDAfter: number;
  /** Variance ratio (programme / comparison) of the observed pretest after matching. */
  varianceRatioAfter: number;
  /** Replications in which at least one programme member was matched (the "after" figures average over these). Added. */
  replicationsWithMatches?: number;
}

/** One example replication's matched sets, for charts. */
export interface ExamplePair {
  programme: { observed: number; trueScore: number; outcome: number };
  comparison: { observed: number; trueScore: number; outcome: number }[];
}

/**
 * Balance on one covariate before and after matching, averaged over
 * replications, each with its Monte Carlo SE (sd over replications / sqrt(n)).
 * SMDs are programme minus comparison over the pooled within-group SD of the
 * full pools before matching, sqrt((s_P^2 + s_C^2) / 2) (Stuart 2010), for the
 * before and after figures alike; the true-score SMD uses the true scores'
 * pooled SD. After matching, each matched set counts once: a programme
 * member's partners share a weight of 1 (matching weights; Stuart 2010), so
 * the "after" gaps are those the matched difference compares. "After" figures
 * average over replications with at least one matched set (the variance ratio
 * over those with at least two in each group).
 */
export interface CovariateBalance {
  /** The covariate's name from the plan; the pretest (always first) is "Pretest". */
  name: string;
  /** Whether the covariate is measured (false: never matched or adjusted on; its imbalance flows through). */
  measured: boolean;
  /** Whether the covariate is matched exactly (binary or categorical). */
  exact: boolean;
  observedSMDBefore: number;
  observedSMDBeforeMCSE: number;
  observedSMDAfter: number;
  observedSMDAfterMCSE: number;
  trueSMDBefore: number;
  trueSMDBeforeMCSE: number;
  /** The hidden imbalance: true-score SMD in the matched sample. */
  trueSMDAfter: number;
  trueSMDAfterMCSE: number;
  /** Variance ratio (programme / comparison) of the observed covariate in the matched sample (Rubin 2001: 0.5–2). */
  varianceRatioAfter: number;
  varianceRatioAfterMCSE: number;
}

export interface SimulationResult {
  plan: Plan;
  seed: number;
  replications: number;
  tau: number;
  /**
   * The four analyses: matchedDifference in the matched sample; ancova,
   * gainScore and correctedAncova in the full unmatched sample (as in the
   * closed forms they are checked against). An analysis computed in fewer
   * than two replications is `{ feasible: false, reason }` (isFeasible).
   */
  analyses: AnalysisRecord<SimAnalysisResult>;
  /** ANCOVA on the observed pretest within the matched sample. */
  ancovaMatchedSample: SimAnalysisResult;
  matching: SimMatchingSummary;
  /** Per-replication estimates per analysis (histogram-ready), in replication order. */
  estimates: AnalysisRecord<number[]>;
  example: { pairs: ExamplePair[]; discarded: { observed: number; trueScore: number }[] };
  /**
   * Per-covariate balance, pretest first then the plan's covariates in order
   * (measured and unmeasured). Present only when the several-covariate engine
   * ran (plan.covariates non-empty or matching.distance not 'pretest').
   */
  balance?: CovariateBalance[];
  /**
   * Clusters only: the person-level analyses as a naive analysis that ignores
   * the clustering would report them — the same estimates with the OLS SE
   * (personLevelAncova) or, when people are matched across clusters, the
   * one-level matching-weights SE (matchedDifference) — so the coverage shows
   * what ignoring the clustering costs. The cluster-aware figures are in `analyses`.
   */
  naivePersonLevel?: { personLevelAncova: SimAnalysisResult; matchedDifference?: SimAnalysisResult };
  /**
   * Present (true) only when the run was stopped early, at a time limit, and summarised over the
   * replications that had finished (`replications`, always the first ones: 0 … replications − 1).
   */
  partial?: true;
  /** With `partial`: the number of replications the plan asked for. */
  replicationsPlanned?: number;
}

/** Options for a simulation run; each defaults to the plan's `simulation` block. */
export interface SimulationOptions {
  /** Number of replications, integer 2..1,000,000. */
  replications?: number;
  /** Seed, any safe integer. */
  seed?: number;
}

/** A simulation in progress: run replications in any chunks, then summarise. */
export interface SimulationRun {
  readonly total: number;
  readonly seed: number;
  /** Replications finished so far. */
  readonly completed: number;
  /** Run replications from (inclusive) to `to` (exclusive); 0 <= from <= to <= total. */
  runChunk(from: number, to: number): void;
  /** Summaries over all replications. @throws Error if some replications have not run. */
  finish(): SimulationResult;
  /**
   * Summaries over the replications finished so far from the first on (0 … m − 1), marked
   * `partial` when m is less than total: the same numbers as a run planned with m replications.
   * @throws Error when fewer than 2 have finished.
   */
  finishPartial(): SimulationResult;
  /**
   * The per-replication state of replications [from, to) (all run) as plain typed arrays, for
   * another run of the same plan, seed and total to import (a worker pool's split and merge).
   * @throws Error when the range is outside 0..total or some of it has not run.
   */
  exportBlock(from: number, to: number): ReplicationBlock;
  /**
   * Take in a block exported by a run of the same plan, seed and total: its replications count
   * as run, and finish() then gives bit for bit the result of running them here.
   * @throws Error when the block belongs to another run (total, seed, records).
   */
  importBlock(block: ReplicationBlock): void;
}
