/**
 * The plan: everything a researcher enters about a two-group study before data
 * are collected. This is the in-memory shape of the versioned plan file
 * (`"format": "meanward-plan"`, `"version": 1`). Field names are part of the
 * file format: later versions may add fields, never rename these.
 */

/** How the hypothesised effect is expressed. */
export type EffectScale = 'points' | 'sd';

/** How a programme member's comparison partner(s) are chosen. */
export type MatchingMethod = 'nearest' | 'random-within-caliper';

/**
 * Order in which programme members take their partners in greedy matching
 * without replacement. Earlier members get first pick of the comparison pool.
 */
export type MatchingOrder = 'random' | 'lowest-first' | 'highest-first';

/** One group's pool (programme or comparison). */
export interface GroupSpec {
  /** Plain-language name shown on screen and in reports (user text). */
  label: string;
  /** Number of people available in this pool (integer, at least 2). */
  poolSize: number;
  /** Mean of the observed pretest in this group, in test points. */
  pretestMean: number;
  /** Within-group SD of the observed pretest, in test points (> 0). */
  pretestSD: number;
}

/**
 * The pretest instrument. Give either `reliability` (with the SD of the
 * population it was estimated in, `referenceSD`), or the standard error of
 * measurement `sem` directly. The SEM is common to both groups.
 */
export interface PretestSpec {
  reliability?: number;
  /** SD of the population the reliability was estimated in (default: comparison pretestSD). */
  referenceSD?: number;
  /** Standard error of measurement in test points. */
  sem?: number;
}

export interface OutcomeSpec {
  /** Within-group SD of the posttest (comparison group), in posttest points. */
  posttestSD: number;
  /** Within-group correlation of observed pretest and posttest (comparison group). */
  prePostCorrelation: number;
  /** Programme-minus-comparison growth that is not the programme's effect, in posttest points. */
  growthGap: number;
  /** The programme effect the study hopes to detect. */
  hypothesisedEffect: number;
  /** Whether hypothesisedEffect is in posttest points or in posttest-SD units. */
  effectScale: EffectScale;
}

/**
 * What matching measures closeness on: the observed pretest alone (the
 * default), the linear propensity score (logit) fitted on all measured
 * covariates, or the Mahalanobis distance on all measured covariates.
 */
export type MatchingDistance = 'pretest' | 'propensity' | 'mahalanobis';

export interface MatchingSpec {
  method: MatchingMethod;
  /** Caliper width in SDs of the pooled observed pretest (> 0). */
  caliper: number;
  /** Comparison partners per programme member, 1..5. */
  ratio: number;
  /** Whether a comparison member may serve more than one programme member. */
  replacement: boolean;
  /** Greedy matching order (without replacement). Default 'random'. */
  order?: MatchingOrder;
  /**
   * What closeness is measured on. Default 'pretest'. With 'propensity' the
   * caliper is in SDs of the logit of the propensity score; with
   * 'mahalanobis' it is in Mahalanobis-distance units.
   */
  distance?: MatchingDistance;
}

/**
 * A covariate beyond the pretest (the pretest is always covariate 0). Its
 * means and SD are of the observed values; reliability 1 means measured
 * without error (age, a recorded category).
 */
export interface CovariateSpec {
  /** Plain-language name, e.g. "Attendance" (user text). */
  name: string;
  /** Mean of the observed covariate in the programme group. */
  programmeMean: number;
  /** Mean of the observed covariate in the comparison group. */
  comparisonMean: number;
  /** Within-group SD of the observed covariate (> 0), common to both groups. */
  sd: number;
  /** Within-group reliability, in (0, 1]; 1 for an error-free variable. */
  reliability: number;
  /** Within-group correlation of the observed covariate with the outcome, in (-1, 1). */
  outcomeCorrelation: number;
  /** false: a known confounder that is never observed, so never matched or adjusted on. */
  measured: boolean;
  /** true: a binary or categorical variable that must match exactly (reliability 1). */
  exact: boolean;
}

/**
 * Where a value in the plan came from, keyed in `Plan.provenance` by the
 * field's dotted path (e.g. "pretest.reliability").
 */
export type ProvenanceSource = 'entered' | 'example' | 'pilot';

export interface FieldProvenance {
  source: ProvenanceSource;
  /** Plain words shown beside the value, e.g. "from pilot file wave1.csv, alpha = .81, n = 212". */
  note: string;
  /** Confidence interval of the estimate when the source gives one (e.g. Feldt's CI of alpha). */
  interval?: { lower: number; upper: number; level: number };
}

export interface AnalysisSpec {
  /** Two-sided significance level, e.g. 0.05. */
  alpha: number;
  /** Reliability assumed by the reliability-corrected (Porter) ANCOVA. */
  assumedReliability: number;
  /** Share of the hypothesised effect that an artefact may reach and still be tolerated (default 0.25). */
  tolerableBiasShare: number;
  /** Power the study aims for when the required n is computed (default 0.8). */
  targetPower?: number;
}

export interface SimulationSpec {
  replications: number;
  seed: number;
}

export interface Plan {
  format: 'meanward-plan';
  version: 1;
  title: string;
  groups: { programme: GroupSpec; comparison: GroupSpec };
  pretest: PretestSpec;
  outcome: OutcomeSpec;
  matching: MatchingSpec;
  analysis: AnalysisSpec;
  simulation: SimulationSpec;
  /** Covariates beyond the pretest (optional; none = the one-covariate model). */
  covariates?: CovariateSpec[];
  /**
   * Observed within-group correlations among the pretest and the covariates,
   * pretest first: a symmetric (1 + k) × (1 + k) matrix with ones on the
   * diagonal. Required when `covariates` is non-empty.
   */
  covariateCorrelations?: number[][];
  /** Where values came from, by dotted field path (optional). */
  provenance?: Record<string, FieldProvenance>;
}

/** The four analyses Meanward compares, in display order. */
export const ANALYSIS_IDS = ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const;
export type AnalysisId = (typeof ANALYSIS_IDS)[number];
