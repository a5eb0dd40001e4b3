import type { AnalysisId } from './plan';

/**
 * Figures for one analysis from a short seeded simulation of the planned
 * procedure (these pools, caliper, ratio, order, replacement, distance),
 * computed by src/sim (estimatePlannedProcedure) and handed to analysePlan
 * as plain data, so src/core stays free of the engine.
 */
export interface PlannedAnalysisFigures {
  /** Mean estimate over the quick replications, posttest points. */
  meanEstimate: number;
  /** Its Monte Carlo SE, points. */
  meanEstimateMCSE: number;
  /** Root mean square of the per-replication SEs the analysis reports, points (> 0). */
  se: number;
  /** Mean matched (or analysed) programme members. */
  nProgramme: number;
  /** Mean comparison members (partners) analysed. */
  nComparison: number;
}

/** An analysis the quick simulation could not compute (nobody, or almost nobody, matched). */
export interface PlannedAnalysisInfeasible {
  infeasible: true;
  /** Plain-English reason and what to change. */
  reason: string;
}

/** The quick simulation's figures for the analyses it covers (the matching-based ones). */
export interface PlannedProcedureEstimates {
  /** Replications the figures average over. */
  replications: number;
  /** Seed of the quick run (fixed, so the figures are reproducible). */
  seed: number;
  analyses: Partial<Record<AnalysisId, PlannedAnalysisFigures | PlannedAnalysisInfeasible>>;
}

/** Whether the quick figures say the analysis could not be computed. */
export function isPlannedInfeasible(
  f: PlannedAnalysisFigures | PlannedAnalysisInfeasible,
): f is PlannedAnalysisInfeasible {
  return (f as PlannedAnalysisInfeasible).infeasible === true;
}
