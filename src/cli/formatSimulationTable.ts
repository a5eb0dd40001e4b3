import type { AnalyticResults } from '../core/analyticResults';
import { ANALYSIS_IDS } from '../core/plan';
import type { SimAnalysisSummary, SimulationResult } from '../sim/types';
import { fmtPercent, fmtPoints, fmtSD } from './formatResultsTable';

/**
 * The simulated part of "meanward run": per analysis the mean estimate (with
 * its Monte Carlo SE), bias, empirical SE, RMSE, 95% CI coverage, rejection
 * rate (power, or the false-positive rate when the effect is zero) and the
 * wrong-sign rate; then the matching summary, observed balance beside the
 * hidden true-score imbalance. Formatting only: every figure comes from src/sim.
 */
export function formatSimulationTable(sim: SimulationResult, analytic: AnalyticResults): string {
  const lines: string[] = [];
  lines.push(
    `Simulated results (${sim.replications} replications, seed ${sim.seed}; the planned pools, caliper, ratio and matching order)`,
  );
  const rejection = sim.tau === 0 ? 'False-positive rate' : 'Power';
  const header = ['Analysis', 'Mean estimate', '(MC SE)', 'Bias', 'Empirical SE', 'RMSE', '95% CI coverage', rejection, 'Wrong sign'];
  const row = (name: string, s: SimAnalysisSummary): string[] => [
    name,
    fmtPoints(s.meanEstimate),
    `(${fmtPoints(s.meanEstimateMCSE)})`,
    fmtPoints(s.bias),
    fmtPoints(s.empiricalSE),
    fmtPoints(s.rmse),
    fmtPercent(s.coverage),
    fmtPercent(s.rejectionRate),
    fmtPercent(s.wrongSignRate),
  ];
  const rows = ANALYSIS_IDS.map((id) => row(analytic.analyses[id].name, sim.analyses[id]));
  rows.push(row(`${analytic.analyses.ancova.name} (matched sample)`, sim.ancovaMatchedSample));
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? '').length)));
  const line = (cells: string[]) =>
    cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c] ?? 0) : cell.padStart(widths[c] ?? 0))).join('  ');
  lines.push(line(header));
  lines.push(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) lines.push(line(r));
  const skipped = ANALYSIS_IDS.filter((id) => sim.analyses[id].replications < sim.replications);
  for (const id of skipped) {
    lines.push(
      `  ${analytic.analyses[id].name}: computed in ${sim.analyses[id].replications} of ${sim.replications} replications (too few matched sets in the others).`,
    );
  }
  const m = sim.matching;
  const nP = sim.plan.groups.programme.poolSize;
  lines.push('');
  lines.push('Matching (simulated)');
  lines.push(
    `  Programme members matched: ${fmtPoints(m.meanMatchedProgramme)} of ${nP} on average; ${fmtPercent(m.discardedProgrammeShare)} discarded (no partner within the caliper).`,
  );
  lines.push(
    `  Observed pretest difference (programme - comparison): ${fmtPoints(m.observedDifferenceBefore)} points before matching (SMD ${fmtSD(m.observedSMDBefore)}), ${fmtPoints(m.observedDifferenceAfter)} after (SMD ${fmtSD(m.observedSMDAfter)}).`,
  );
  lines.push(
    `  True-score difference (hidden imbalance): ${fmtPoints(m.trueDifferenceBefore)} points before (SMD ${fmtSD(m.trueSMDBefore)}), ${fmtPoints(m.trueDifferenceAfter)} after (SMD ${fmtSD(m.trueSMDAfter)}).`,
  );
  lines.push(`  Variance ratio of the observed pretest after matching (programme / comparison): ${fmtSD(m.varianceRatioAfter)}.`);
  lines.push('  Balance on the observed pretest can look fine while the true scores still differ: that gap is the regression artefact.');
  return `${lines.join('\n')}\n`;
}
