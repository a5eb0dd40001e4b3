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
  /**
   * With `clusters`: match whole clusters on their observed pretest means
   * ('clusters'), or people across clusters on their own pretests ('people',
   * the default; needs the same people at posttest). The caliper is then in
   * SDs of the cluster means, or of the people's pretests, respectively.
   */
  level?: MatchingLevel;
}

/** What matching pairs up when people sit in clusters: whole clusters, or people. */
export type MatchingLevel = 'clusters' | 'people';

/** Whether the posttest is taken by the people who sat the pretest, or by a new cohort of the same clusters. */
export type ClusterCohort = 'same' | 'new';

/**
 * People nested in clusters (schools, classes, clinics, wards). Both groups'
 * pools are made of whole clusters of `size` people; `groups.<g>.poolSize`
 * stays the number of PEOPLE and must be a multiple of `size`. ICCs are of
 * observed scores within a group (the share of the within-group observed
 * variance that lies between clusters); the pretest's reliability still
 * refers to the within-group observed variance of people.
 */
export interface ClusterSpec {
  /** People tested per cluster (whole number ≥ 2). */
  size: number;
  /** ICC of the observed pretest within a group, in (0, 1). */
  pretestICC: number;
  /** ICC of the observed posttest within the comparison group, in (0, 1); default pretestICC. */
  posttestICC?: number;
  /** 'same': the pretested people sit the posttest; 'new': a new cohort of the same clusters does. */
  cohort: ClusterCohort;
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

/**
 * The study's shape: two groups compared ('two-groups', the default), or one
 * group re-measured with no comparison group ('one-group': the pre–post
 * change of the people the rule selected).
 */
export type StudyShape = 'two-groups' | 'one-group';

/**
 * How people got into the programme: 'existing-groups' (the default and the
 * original model: two populations that already differ), 'cut-off' (everyone
 * on one side of a cut-off on the basis), 'probability' (a chance that rises
 * smoothly across the cut-off: P = Φ((cutOff − basis) / spread) for 'below').
 */
export type AssignmentRule = 'existing-groups' | 'cut-off' | 'probability';

/**
 * What the rule looked at: the observed pretest itself, a separate screener
 * (the same true score with its own independent error), or the true score
 * (staff judgement of real need, which no analysis can adjust for).
 */
export type AssignmentBasis = 'pretest' | 'screener' | 'true-score';

/** Who is selected into the programme: those below the cut-off, or those above it. */
export type SelectionSide = 'below' | 'above';

/**
 * How people got into the programme. With rule 'existing-groups' nothing
 * else is read; with a selection rule, `basis`, `cutOff` and `side` are
 * required, `spread` with 'probability', `screenerReliability` with basis 'screener'.
 */
export interface AssignmentSpec {
  rule: AssignmentRule;
  basis?: AssignmentBasis;
  /** On the pretest's scale (the screener and the true score share the pretest's mean). */
  cutOff?: number;
  side?: SelectionSide;
  /** 'probability' only: SD of the normal ogive, on the pretest's scale (> 0). */
  spread?: number;
  /** Basis 'screener' only: the screener's reliability in the population, in (0, 1). */
  screenerReliability?: number;
}

/**
 * The one population people are picked from, with a selection rule or a
 * one-group design (instead of `groups`; the groups follow from the rule).
 * `pretest.reliability` (its default reference SD is this pretestSD),
 * `outcome.posttestSD` and `outcome.prePostCorrelation` then describe this
 * whole population before selection.
 */
export interface PopulationSpec {
  label: string;
  /** People in the population (integer). */
  poolSize: number;
  pretestMean: number;
  pretestSD: number;
}

export interface Plan {
  format: 'meanward-plan';
  version: 1;
  title: string;
  /**
   * The two pools. With a selection rule these are derived by validatePlan
   * from `population` and the rule (expected sizes, means and SDs; only the
   * labels are read from a file), so every part of the planner can name them.
   */
  groups: { programme: GroupSpec; comparison: GroupSpec };
  /** Default 'two-groups'. */
  design?: StudyShape;
  /** Default { rule: 'existing-groups' }. */
  assignment?: AssignmentSpec;
  /** Required with a selection rule (and with a one-group design). */
  population?: PopulationSpec;
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
  /** People nested in clusters (optional; none = people sampled one by one). */
  clusters?: ClusterSpec;
  /** Where values came from, by dotted field path (optional). */
  provenance?: Record<string, FieldProvenance>;
}

/**
 * Every analysis Meanward knows, in display order. Which of them a plan gets
 * depends on its design (designAnalysisIds in src/core/design): the first
 * four for two groups formed any way, regressionDiscontinuity as well when a
 * rule used an observed basis, prePostChange alone for a one-group study,
 * and, for people in clusters, the matched difference, ANCOVA and gain score
 * on cluster means with personLevelAncova (a person-level regression with
 * cluster-robust SEs).
 */
export const ANALYSIS_IDS = [
  'matchedDifference',
  'ancova',
  'gainScore',
  'correctedAncova',
  'regressionDiscontinuity',
  'prePostChange',
  'personLevelAncova',
] as const;
export type AnalysisId = (typeof ANALYSIS_IDS)[number];

/** The four analyses of two existing groups (the original model), in display order. */
export const TWO_GROUP_ANALYSIS_IDS = ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova'] as const;
export type TwoGroupAnalysisId = (typeof TWO_GROUP_ANALYSIS_IDS)[number];

/** Analyses keyed by id, holding only those the plan's design has. */
export type AnalysisRecord<T> = Partial<Record<AnalysisId, T>>;
