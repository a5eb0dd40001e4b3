import type { AnalyticAnalysis } from './analyticResults';
import type { AnalysisId } from './plan';
import type { AnalysisSettings } from './analyseAnalysis';
import type { DesignAtN } from './requiredNPerGroup';
import { classifyArtefact } from './classifyArtefact';
import { falsePositiveRate, twoSidedPower, wrongSignRate } from './power';
import { requiredNPerGroup } from './requiredNPerGroup';
import { shareOfEffect } from './shareOfEffect';

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
    verdict: classifyArtefact(tau, bias, s.tolerableBiasShare),
  };
  if (a.precision === null) {
    if (!a.infeasibleReason) throw new Error(`The ${a.name} has no standard error, and no reason was given.`);
    return {
      ...base,
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
  return {
    ...base,
    feasible: true,
    infeasibleReason: null,
    se,
    df,
    nProgramme: a.nProgramme,
    nComparison: a.nComparison,
    power: twoSidedPower(estimate, se, df, s.alpha),
    powerWithoutBias: twoSidedPower(tau, se, df, s.alpha),
    falsePositiveRate: falsePositiveRate(bias, se, df, s.alpha),
    wrongSignRate: wrongSignRate(tau, bias, se, df, s.alpha),
    requiredNPerGroup: requiredNPerGroup(estimate, tau, design, s.alpha, s.targetPower),
  };
}
