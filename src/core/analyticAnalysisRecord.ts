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
  /** Approximate SE and df of the estimate at the planned sizes, and those sizes. */
  se: number;
  df: number;
  nProgramme: number;
  nComparison: number;
  /** SE and df at n per group, for the required n. */
  design: DesignAtN;
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
 * @param a the analysis' inputs (see AnalysisInputs). @param s plan settings.
 * @returns an AnalyticAnalysis record.
 * @throws Error when a setting is out of range.
 * @example demo matched difference: estimate 0.5, tau 2.5 → bias −2, biasShare −0.8, verdict 'hides'
 */
export function analyticAnalysisRecord(a: AnalysisInputs, s: AnalysisSettings): AnalyticAnalysis {
  const { estimate, tau, se, df } = a;
  const bias = estimate - tau;
  return {
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
    se,
    df,
    nProgramme: a.nProgramme,
    nComparison: a.nComparison,
    power: twoSidedPower(estimate, se, df, s.alpha),
    powerWithoutBias: twoSidedPower(tau, se, df, s.alpha),
    falsePositiveRate: falsePositiveRate(bias, se, df, s.alpha),
    wrongSignRate: wrongSignRate(tau, bias, se, df, s.alpha),
    requiredNPerGroup: requiredNPerGroup(estimate, tau, a.design, s.alpha, s.targetPower),
  };
}
