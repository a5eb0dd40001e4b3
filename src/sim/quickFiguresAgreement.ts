import type { AnalyticResults } from '../core/analyticResults';
import { ANALYSIS_IDS, type AnalysisId } from '../core/plan';
import { isFeasible, type SimulationResult } from './types';

/** How far a figure shown before simulation lies from the full simulation's. */
export interface QuickFigureDisagreement {
  id: AnalysisId;
  /** The analysis' plain name. */
  name: string;
  /** Expected estimate shown before simulation, points. */
  quick: number;
  /** The full simulation's mean estimate, points. */
  simulated: number;
  /** |quick − simulated| in combined Monte Carlo SEs (quick MCSE, 0 for closed forms, and the simulation's). */
  monteCarloSEs: number;
  /** Plain-English note saying which figure to trust. */
  note: string;
}

/** Disagreements beyond this many combined Monte Carlo SEs are reported (common practice: a 3-SE rule). */
export const DISAGREEMENT_MCSE_LIMIT = 3;

/**
 * The analyses whose expected estimate shown before simulation (analytic,
 * a closed form or the quick planned-procedure figure) and the full
 * simulation's mean differ by more than DISAGREEMENT_MCSE_LIMIT combined Monte
 * Carlo SEs, sqrt(MCSE_quick² + MCSE_sim²), each with a note saying to trust
 * the simulation (it runs the planned procedure in full, with many more
 * replications). Only for a simulation of the same plan.
 *
 * @param analytic the figures shown before simulation. @param simulation a full simulation of the same plan.
 * @returns the disagreements, in analysis order (empty when all agree).
 * @example a closed-form ANCOVA of 0.31 against a simulated 0.80 ± 0.05 → one entry, about 10 MC SEs
 */
export function quickFiguresAgreement(analytic: AnalyticResults, simulation: SimulationResult): QuickFigureDisagreement[] {
  const out: QuickFigureDisagreement[] = [];
  for (const id of ANALYSIS_IDS) {
    const a = analytic.analyses[id];
    const r = simulation.analyses[id] as SimulationResult['analyses'][AnalysisId] | undefined;
    const s = r && isFeasible(r) ? r : null;
    if (!a || !s || !Number.isFinite(s.meanEstimate) || !Number.isFinite(a.expectedEstimate)) continue;
    const combined = Math.hypot(a.expectedEstimateMCSE ?? 0, s.meanEstimateMCSE);
    if (!(combined > 0)) continue;
    const z = Math.abs(a.expectedEstimate - s.meanEstimate) / combined;
    if (z <= DISAGREEMENT_MCSE_LIMIT) continue;
    const what = a.basis === 'planned-procedure' ? 'quick figure (a short simulation)' : 'closed-form figure';
    out.push({
      id,
      name: a.name,
      quick: a.expectedEstimate,
      simulated: s.meanEstimate,
      monteCarloSEs: z,
      note:
        `The ${what} for the ${a.name.toLowerCase()} and the full simulation differ by ${z.toFixed(1)} Monte Carlo SEs: ` +
        `trust the simulation, which runs the planned procedure in full with ${simulation.replications.toLocaleString('en-GB')} replications.`,
    });
  }
  return out;
}
