import type { AnalyticAnalysis, ArtefactVerdict } from './analyticResults';
import type { AnalysisId } from './plan';
import type { AnalysisSettings } from './analyseAnalysis';
import type { DesignAtN } from './requiredNPerGroup';
import { classifyArtefact } from './classifyArtefact';
import { falsePositiveRate, twoSidedPower, wrongSignRate } from './power';
import { requiredNPerGroup } from './requiredNPerGroup';
import { shareOfEffect } from './shareOfEffect';
import { judgeTolerable } from './judgeTolerable';
import { growthGapNote } from './artefactParts';

/** What the required n says for an analysis whose regression artefact is not tolerable. */
export const BIASED_REQUIRED_N_NOTE = 'biased: more people do not help';

/** What an analysis contributes before the shared power and verdict arithmetic. */
export interface AnalysisInputs {
  id: AnalysisId;
  name: string;
  assumption: string;
  /** Expected estimate of tau, posttest points. */
  estimate: number;
  /** Programme effect tau, posttest points. */
  tau: number;
  /** Comparison group's posttest SD, posttest points (> 0). */
  posttestSD: number;
  /**
   * Approximate SE and df of the estimate at the planned sizes and the SE and df
   * at n per group (for the required n); null when the analysis is not feasible.
   */
  precision: { se: number; df: number; design: DesignAtN } | null;
  /** Sizes the SE assumes (expected matched counts for the matched difference). */
  nProgramme: number;
  nComparison: number;
  /** Why the analysis cannot be carried out, or null when it can (precision is then non-null). */
  infeasibleReason: string | null;
  /** The infinite-pool formula's estimate when `estimate` is from the planned procedure (default: estimate). */
  formulaEstimate?: number;
  /** Where the estimate comes from (default 'formula'). */
  basis?: 'formula' | 'planned-procedure';
  /** Monte Carlo SE of a planned-procedure estimate (default null). */
  estimateMCSE?: number | null;
}

/**
 * One analysis' closed-form record from its expected estimate and SE: bias (in
 * points, posttest SDs and as a share of tau), verdict, power with and without
 * the bias, false-positive and wrong-sign rates, and the n per group needed
 * for the target power. Shared by the one-pretest and the several-covariate
 * paths, so both compute these quantities the same way.
 *
 * Reference: power — Cohen (1988), ch. 2 (noncentral t).
 *
 * When the analysis is not feasible (a.precision null, a.infeasibleReason
 * given) the record keeps the expected estimate, bias and verdict and gives
 * null SE, df, power, error rates and required n.
 *
 * @param a the analysis' inputs (see AnalysisInputs). @param s plan settings.
 * @returns an AnalyticAnalysis record.
 * @throws Error when a setting is out of range, or precision is null without a reason.
 * @example demo matched difference: estimate 0.5, tau 2.5 → bias −2, biasShare −0.8, verdict 'hides'
 */
export function analyticAnalysisRecord(a: AnalysisInputs, s: AnalysisSettings): AnalyticAnalysis {
  const { estimate, tau } = a;
  const bias = estimate - tau;
  // The bias in two parts: the assumed growth gap and the regression artefact (the rest).
  const growthGap = s.growthGap ?? 0;
  const regressionArtefact = bias - growthGap;
  const parts = {
    regressionArtefact,
    regressionArtefactShare: shareOfEffect(regressionArtefact, tau),
    regressionArtefactSD: regressionArtefact / a.posttestSD,
    growthGap,
    growthGapShare: shareOfEffect(growthGap, tau),
    growthGapNote: growthGapNote(regressionArtefact, growthGap, bias),
  };
  const base = {
    id: a.id,
    name: a.name,
    assumption: a.assumption,
    expectedEstimate: estimate,
    formulaEstimate: a.formulaEstimate ?? estimate,
    basis: a.basis ?? 'formula',
    expectedEstimateMCSE: a.estimateMCSE ?? null,
    bias,
    biasSD: bias / a.posttestSD,
    biasShare: shareOfEffect(bias, tau),
    ...parts,
  };
  const judge = (rates: { falsePositiveRate: number | null; power: number | null; powerWithoutBias: number | null }) => {
    const tolerability = judgeTolerable({ tau, regressionArtefact, tolerableShare: s.tolerableBiasShare, alpha: s.alpha, ...rates });
    // The direction comes from the regression artefact when it is too large; when only an
    // error rate fails, from the whole shift (which is what the error rates reflect).
    let verdict: ArtefactVerdict = 'negligible';
    if (!tolerability.artefactWithinShare) verdict = classifyArtefact(tau, regressionArtefact, s.tolerableBiasShare);
    else if (!tolerability.tolerable) verdict = classifyArtefact(tau, bias, 0);
    return { verdict, tolerability };
  };
  if (a.precision === null) {
    if (!a.infeasibleReason) throw new Error(`The ${a.name} has no standard error, and no reason was given.`);
    const judged = judge({ falsePositiveRate: null, power: null, powerWithoutBias: null });
    return {
      ...base,
      ...judged,
      requiredNNote: judged.tolerability.artefactWithinShare ? null : BIASED_REQUIRED_N_NOTE,
      feasible: false,
      infeasibleReason: a.infeasibleReason,
      se: null,
      df: null,
      nProgramme: a.nProgramme,
      nComparison: a.nComparison,
      power: null,
      powerWithoutBias: null,
      falsePositiveRate: null,
      wrongSignRate: null,
      requiredNPerGroup: null,
    };
  }
  const { se, df, design } = a.precision;
  const power = twoSidedPower(estimate, se, df, s.alpha);
  const powerWithoutBias = twoSidedPower(tau, se, df, s.alpha);
  const fpr = falsePositiveRate(bias, se, df, s.alpha);
  const judged = judge({ falsePositiveRate: fpr, power, powerWithoutBias });
  const biased = !judged.tolerability.artefactWithinShare;
  return {
    ...base,
    ...judged,
    feasible: true,
    infeasibleReason: null,
    se,
    df,
    nProgramme: a.nProgramme,
    nComparison: a.nComparison,
    power,
    powerWithoutBias,
    falsePositiveRate: fpr,
    wrongSignRate: wrongSignRate(tau, bias, se, df, s.alpha),
    // Only for analyses whose regression artefact is tolerable: for the others more people
    // only make a biased estimate more precise.
    requiredNPerGroup: biased ? null : requiredNPerGroup(estimate, tau, design, s.alpha, s.targetPower),
    requiredNNote: biased ? BIASED_REQUIRED_N_NOTE : null,
  };
}
