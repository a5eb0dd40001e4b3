import type { Plan } from './plan';
import type { AnalysisSettings } from './analyseAnalysis';

/** Default target power when the plan gives none (Cohen 1988's convention of .80). */
export const DEFAULT_TARGET_POWER = 0.8;

/**
 * The settings every analysis reads from the plan (significance level,
 * assumed reliability, tolerable share, target power, matching ratio and
 * replacement) with the expected number of matched programme members.
 * Shared by every design's path through analysePlan.
 *
 * Reference: none (plan reading); the default power is Cohen (1988)'s .80.
 * @param plan a validated plan. @param matchedProgramme expected matched programme members (≥ 0).
 * @returns the AnalysisSettings.
 * @throws never.
 * @example analysisSettings(demoPlan(), 174).targetPower // 0.8
 */
export function analysisSettings(plan: Plan, matchedProgramme: number): AnalysisSettings {
  return {
    alpha: plan.analysis.alpha,
    assumedReliability: plan.analysis.assumedReliability,
    tolerableBiasShare: plan.analysis.tolerableBiasShare,
    growthGap: plan.outcome.growthGap,
    targetPower: plan.analysis.targetPower ?? DEFAULT_TARGET_POWER,
    ratio: plan.matching.ratio,
    matchedProgramme,
    replacement: plan.matching.replacement,
  };
}
