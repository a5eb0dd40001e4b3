import type { AnalysisId, AnalysisRecord, MatchingDistance } from './plan';
import type { ModelParameters } from './modelParameters';
import type { CovariateModel } from './multivariate/covariateModel';
import type { ExpectedCovariateBalance } from './multivariate/expectedCovariateBalance';
import type { Tolerability } from './judgeTolerable';
import type { CaliperSuggestion } from './multivariate/mahalanobisCaliperSuggestion';

/** How an expected artefact changes the study's conclusion about a hoped-for effect. */
export type ArtefactVerdict =
  | 'negligible' // |bias| within the tolerable share of the effect
  | 'hides' // same sign as nothing/opposite to effect, shrinks the estimate toward zero
  | 'reverses' // expected estimate has the opposite sign to the hoped-for effect
  | 'inflates' // bias has the effect's sign: the programme looks better than it is
  | 'invents'; // hoped-for effect is zero, yet a non-trivial difference is expected

/** Closed-form (infinite pool) results for one analysis. */
export interface AnalyticAnalysis {
  id: AnalysisId;
  /** Plain name, e.g. "Matched post-test difference". */
  name: string;
  /** One-line statement of the assumption under which this analysis is unbiased. */
  assumption: string;
  /**
   * Expected estimate of the programme effect, posttest points, for the
   * procedure as planned: with basis 'planned-procedure' the mean of a short
   * seeded simulation of these pools, caliper, ratio, order and replacement;
   * with basis 'formula' the closed form (for full-sample analyses that is the
   * planned procedure; for the matched difference it assumes unlimited pools).
   */
  expectedEstimate: number;
  /** The closed-form estimate for unlimited pools and exact matching (Thorndike 1942; Lord 1960; Porter 1967). */
  formulaEstimate: number;
  /** Where expectedEstimate, se and nProgramme come from (see expectedEstimate). */
  basis: 'formula' | 'planned-procedure';
  /** Monte Carlo SE of expectedEstimate when basis is 'planned-procedure'; null for closed forms. */
  expectedEstimateMCSE: number | null;
  /** expectedEstimate - tau, posttest points. */
  bias: number;
  /** bias / posttest SD (comparison group). */
  biasSD: number;
  /** bias / tau; null when tau = 0. */
  biasShare: number | null;
  /**
   * What the artefact does to the conclusion, judged on the regression
   * artefact (the growth gap left out) and the error rates: 'negligible'
   * only when `tolerability.tolerable`.
   */
  verdict: ArtefactVerdict;
  /** The part of `bias` due to regression toward the mean and the analysis (bias − growthGap), points. */
  regressionArtefact: number;
  /** regressionArtefact / posttest SD (comparison group). */
  regressionArtefactSD: number;
  /** regressionArtefact / tau; null when tau = 0. */
  regressionArtefactShare: number | null;
  /** The part of `bias` due to the assumed growth gap (outcome.growthGap), points. */
  growthGap: number;
  /** growthGap / tau; null when tau = 0. */
  growthGapShare: number | null;
  /** A plain sentence when the growth gap offsets the regression artefact; null otherwise. */
  growthGapNote: string | null;
  /** The three conditions of "tolerable" and which failed, with a plain reason. */
  tolerability: Tolerability;
  /** "biased: more people do not help" when the regression artefact is not tolerable (requiredNPerGroup is then null); null otherwise. */
  requiredNNote: string | null;
  /**
   * Whether the analysis can be carried out with the planned pools. Only the
   * matched difference can be infeasible: when fewer than 2 programme members
   * are expected to find a partner. Then se, df, power, powerWithoutBias,
   * falsePositiveRate, wrongSignRate and requiredNPerGroup are null; the
   * expected estimate and bias (what matching would do with unlimited pools) remain.
   */
  feasible: boolean;
  /** Plain-English reason and what to change, when not feasible; null otherwise. */
  infeasibleReason: string | null;
  /** Approximate standard error of the estimate for the planned sample, points; null when not feasible. */
  se: number | null;
  /** Degrees of freedom of the t test (Welch–Satterthwaite for the full-sample analyses; may be fractional); null when not feasible. */
  df: number | null;
  /** Sample sizes the SE assumes (programme, comparison); for the matched difference the expected matched counts (may be below 2 when not feasible). */
  nProgramme: number;
  nComparison: number;
  /** P(p < alpha) when the true effect is tau and the bias is as above; null when not feasible. */
  power: number | null;
  /** Power the same design would have with no bias; null when not feasible. */
  powerWithoutBias: number | null;
  /** P(p < alpha) when the programme does nothing (tau = 0) but the bias remains; null when not feasible. */
  falsePositiveRate: number | null;
  /** P(significant with the sign opposite to the hoped-for effect); null when tau = 0 or not feasible. */
  wrongSignRate: number | null;
  /**
   * Per-group n for the plan's target power given tau + bias; null when
   * unreachable, not feasible, or the regression artefact is not tolerable
   * (see requiredNNote; what "per group" counts: requiredNCounts in the results).
   */
  requiredNPerGroup: number | null;
  /**
   * Regression discontinuity only: the variance of its estimate relative to a
   * randomised design of the same size and split (Goldberger 1972: 2.75 for
   * a cut-off at the mean of a normal assignment variable).
   */
  varianceInflation?: number;
  /**
   * How the SE was obtained when it is a rough approximation worth saying on
   * screen (selection designs' matched difference before the quick
   * simulation replaces it); absent otherwise.
   */
  standardErrorNote?: string;
  /**
   * Clusters only: clusters per group needed for the target power given the
   * expected estimate (requiredNPerGroup is then this times the cluster
   * size, in people); null when unreachable or not feasible.
   */
  clustersPerGroupNeeded?: number | null;
  /**
   * Clusters only: the minimum detectable effect at the target power with the
   * artefact included (Bloom 1995), posttest points, signed in the hoped-for
   * direction; null when not feasible.
   */
  minimumDetectableEffect?: number | null;
  /**
   * Clusters, person-level ANCOVA only: the SE a person-level analysis that
   * ignores the clustering would report (OLS), posttest points.
   */
  naiveSE?: number;
}

/**
 * The study's design in plain words, for the verdict, the PDF and the CLI
 * (src/core/design). Present for every plan.
 */
export interface DesignSummary {
  kind: 'existing-groups' | 'selection' | 'clusters';
  shape: 'two-groups' | 'one-group';
  /** How people got into the programme, one sentence (e.g. "People whose screener score was below 41 were selected (a sharp cut-off)."). */
  rule: string;
  /**
   * What the rule means for the analyses, one or two sentences, e.g. "ANCOVA
   * on the variable the rule used is unbiased here; matching and gain scores
   * are not." or "Selection used something you did not measure: every analysis
   * on the pretest is biased."
   */
  meaning: string;
  /** Expected share of the population selected into the programme; null for existing groups. */
  selectedShare: number | null;
  /**
   * One-group study only: the expected pre–post change of the selected people
   * if the programme did nothing (regression toward the mean plus any growth
   * the population shows), posttest points; null otherwise.
   */
  noProgrammeChange: number | null;
}

export interface BreakEven {
  /** Within-group (comparison) reliability at which |matched-difference artefact| = tolerable share × |tau|; null when tau = 0 or no artefact. */
  reliability: number | null;
  /** Whether the current pretest already meets it. */
  alreadyMet: boolean;
  /** Averaged parallel pretests (Spearman–Brown) needed to reach it, rounded up; null when not applicable. */
  parallelForms: number | null;
  /** Plain-language explanation when a figure is null. */
  note: string;
}

export interface Remedy {
  id:
    | 'more-reliable-pretest'
    | 'corrected-ancova'
    | 'gain-score'
    | 'tighter-caliper'
    | 'looser-caliper'
    | 'larger-pools'
    /** Only with covariates: match on all measured covariates instead of the pretest alone. */
    | 'match-all-measured'
    /** Only with unmeasured covariates: measure them and match on them too. */
    | 'measure-confounders'
    /** Selection on the pretest (two groups): adjust for it (regression discontinuity). */
    | 'adjust-for-rule-score'
    /** Selection on a screener (two groups): keep its scores and adjust for them. */
    | 'record-screener'
    /** Selection on judged need (two groups): write the judgement down as a scored rule and use it. */
    | 'scored-rule'
    /** One group: select on one measurement, take the change from a second, separate baseline. */
    | 'separate-baseline'
    /** One group: select on, and measure change from, the average of several baselines. */
    | 'average-baselines'
    /** One group: add a comparison group from the same population (regression discontinuity). */
    | 'comparison-group'
    /** Clusters: test more people per cluster (Spearman–Brown on the cluster mean). */
    | 'more-people-per-cluster'
    /** Clusters: match on the average of several years' cluster means. */
    | 'several-years-means'
    /** Clusters (new cohort): match on a cluster mean of the people who sit the posttest. */
    | 'same-people-cluster-mean'
    /** Clusters: adjust at person level for the people's own pretests. */
    | 'person-level-own-pretests'
    /** Clusters: use the people's own pretests within matched clusters. */
    | 'pretests-within-matched-clusters';
  title: string;
  /** What the remedy buys, plain language with numbers. */
  summary: string;
  /** Expected artefact (points) with the remedy in place. */
  remainingBias: number;
  /** remainingBias / tau; null when tau = 0. */
  remainingBiasShare: number | null;
  /** Approximate share of the programme pool discarded; null when not applicable. */
  discardedShare: number | null;
  assumption: string;
  /** Whom the estimate then describes, when the remedy discards programme members (the matched members, not the programme); null or absent otherwise. */
  estimand?: string | null;
  /** Why the remedy is unrealistic and what is feasible instead (e.g. more than 4 parallel forms); null or absent when realistic. */
  feasibility?: string | null;
  /** Corrected ANCOVA only: the pooled within-group reliability the correction needs to leave no artefact. */
  neededReliability?: number;
  /** Matching on more variables with the Mahalanobis distance: the caliper in the new unit to use instead. */
  caliperSuggestion?: CaliperSuggestion;
}

/**
 * The part of every analysis' bias that no analysis of the measured
 * covariates can remove (see unmeasuredBias): carried by covariates that are
 * never observed. The growth gap is reported separately (not included).
 */
export interface UnmeasuredBias {
  /** Posttest points. */
  points: number;
  /** points / posttest SD (comparison group). */
  sd: number;
  /** points / tau; null when tau = 0. */
  share: number | null;
  /** Names of the unmeasured covariates (empty when every covariate is measured, and points is then 0). */
  covariates: string[];
}

export interface AnalyticResults {
  /** The one-pretest model (pretest and outcome as the plan states them; with covariates, beta is the outcome's slope on the true pretest alone). */
  model: ModelParameters;
  /**
   * Within-group reliabilities of people's pretest scores and the SEM; with
   * clusters also `clusterMean`: the comparison group's cluster-mean
   * reliability λ (ICC(2) for a new cohort at posttest), which the
   * matched-cluster artefact beta(1 − λ)Delta uses.
   */
  reliability: { programme: number; comparison: number; sem: number; clusterMean?: number };
  tau: number;
  /**
   * Per analysis. With the covariate model (usesCovariateModel: covariates
   * listed, or a propensity/Mahalanobis distance), the matched difference is
   * for the plan's matching distance and ANCOVA / corrected ANCOVA adjust for
   * all measured covariates.
   */
  analyses: AnalysisRecord<AnalyticAnalysis>;
  breakEven: BreakEven;
  remedies: Remedy[];
  /** The matching distance the matched difference refers to. Present only with the covariate model. */
  matchingDistance?: MatchingDistance;
  /** Present only with the covariate model (absent, not 0, for one-pretest plans, whose results are unchanged). */
  unmeasuredBias?: UnmeasuredBias;
  /** The several-covariate model, pretest first. Present only with the covariate model. */
  covariateModel?: CovariateModel;
  /** Closed-form balance per variable (pretest first) after matching. Present only with the covariate model. */
  covariateBalance?: ExpectedCovariateBalance[];
  /**
   * How the figures before a full simulation were obtained: 'formula' (closed
   * forms only) or 'planned-procedure' (the matching-based analyses from a
   * short seeded simulation of the planned procedure).
   */
  procedure: ProcedureBasis;
  /** How the groups were formed and what that means for the analyses. */
  design: DesignSummary;
  /** Present only for the clusters design. */
  clusters?: ClusterSummary;
  /** Mahalanobis matching only: the caliper is in a new unit; a value that keeps the matched share (mahalanobisCaliperSuggestion). */
  caliperSuggestion?: CaliperSuggestion;
  /** What "per group" counts in every analysis' requiredNPerGroup, one or two plain sentences (requiredNCounts). */
  requiredNCounts?: string;
}

/** The clusters design's own figures (src/core/clusters). */
export interface ClusterSummary {
  /** People per cluster, per group. */
  size: { programme: number; comparison: number };
  /** Clusters in each pool. */
  clustersPerGroup: { programme: number; comparison: number };
  cohort: 'same' | 'new';
  level: 'clusters' | 'people';
  pretestICC: number;
  posttestICC: number;
  /** λ per group and pooled (cluster-count weighted). */
  clusterMeanReliability: { programme: number; comparison: number; pooled: number };
  /** Kish (1965) design effects 1 + (n − 1)·ICC of the comparison group, for the pretest and the posttest. */
  designEffect: { pretest: number; posttest: number };
  /** beta(1 − λ_C)Delta: the artefact of matching clusters on their observed means, points. */
  matchedClusterArtefact: number;
  /** beta(1 − λ_pooled)Delta: the artefact of ANCOVA on cluster means, points. */
  clusterMeansAncovaArtefact: number;
  /** beta(1 − rho_C)Delta: the artefact of matching people on their own pretests, points. */
  personMatchingArtefact: number;
  /** People per cluster whose mean reaches the break-even λ; null when none is needed or it cannot be reached. */
  breakEvenClusterSize: number | null;
}

/** How the quick figures were obtained (see AnalyticResults.procedure). */
export interface ProcedureBasis {
  basis: 'formula' | 'planned-procedure';
  /** Replications of the quick simulation; null for 'formula'. */
  replications: number | null;
  /** Its seed; null for 'formula'. */
  seed: number | null;
}
