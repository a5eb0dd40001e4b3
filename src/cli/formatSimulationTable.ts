import type { AnalyticResults } from '../core/analyticResults';
import { studyDesign } from '../core/design/studyDesign';
import { presentAnalyses } from '../core/presentAnalyses';
import { isFeasible, type SimAnalysisResult, type SimulationResult } from '../sim/types';
import { fmtPercent, fmtPoints, fmtSD } from './formatResultsTable';

/**
 * The simulated part of "meanward run": per analysis the mean estimate (with
 * its Monte Carlo SE), bias, empirical SE, RMSE, 95% CI coverage, rejection
 * rate (power, or the false-positive rate when the effect is zero) and the
 * wrong-sign rate; then, where the design matches (not a one-group study), the
 * matching summary, observed balance beside the hidden true-score imbalance
 * (or one line when nobody could be matched in any replication). An analysis the simulation could not
 * summarise (computed in fewer than two replications) shows "not computed"
 * and its reason below the table; the others are reported as usual.
 * Formatting only: every figure comes from src/sim.
 *
 * Reference: none (formatting). @param sim the simulation result. @param analytic the closed-form
 * results (for the analyses' names). @returns the text, ending in a newline. @throws never.
 * @example formatSimulationTable(simulatePlan(plan), analysePlan(plan)).startsWith('Simulated results') // true
 */
export function formatSimulationTable(sim: SimulationResult, analytic: AnalyticResults): string {
  const lines: string[] = [];
  const design = studyDesign(sim.plan);
  const matches = sim.analyses.matchedDifference !== undefined;
  const what =
    design.kind === 'clusters'
      ? `the planned pools of clusters, ${design.level === 'clusters' ? 'clusters matched on their means' : 'people matched across clusters'}, caliper, ratio and matching order`
      : design.kind === 'existing-groups'
      ? 'the planned pools, caliper, ratio and matching order'
      : matches
        ? 'the planned population and rule, then the caliper, ratio and matching order'
        : 'the planned population and rule';
  lines.push(
    sim.partial
      ? `Simulated results, PARTIAL: stopped at the time limit after ${sim.replications.toLocaleString('en-GB')} of ${(sim.replicationsPlanned ?? sim.replications).toLocaleString('en-GB')} planned replications (seed ${sim.seed}; ${what}). Monte Carlo SEs reflect the replications done.`
      : `Simulated results (${sim.replications} replications, seed ${sim.seed}; ${what})`,
  );
  const rejection = sim.tau === 0 ? 'False-positive rate' : 'Power';
  const header = ['Analysis', 'Mean estimate', '(MC SE)', 'Bias', 'Empirical SE', 'RMSE', '95% CI coverage', rejection, 'Wrong sign'];
  const row = (name: string, s: SimAnalysisResult): string[] =>
    isFeasible(s)
      ? [
          name,
          fmtPoints(s.meanEstimate),
          `(${fmtPoints(s.meanEstimateMCSE)})`,
          fmtPoints(s.bias),
          fmtPoints(s.empiricalSE),
          fmtPoints(s.rmse),
          fmtPercent(s.coverage),
          fmtPercent(s.rejectionRate),
          fmtPercent(s.wrongSignRate),
        ]
      : [name, 'not computed', '', '', '', '', '', '', ''];
  const named: [string, SimAnalysisResult][] = presentAnalyses(sim.analyses).map(([id, s]): [string, SimAnalysisResult] => [
    analytic.analyses[id]?.name ?? id,
    s,
  ]);
  // ANCOVA in the matched sample: only where the design matches (two groups).
  if (analytic.analyses.ancova && analytic.analyses.matchedDifference) named.push([`${analytic.analyses.ancova.name} (matched sample)`, sim.ancovaMatchedSample]);
  // Clusters: the same person-level estimates with a naive SE that ignores the clustering, so its coverage shows the cost.
  const naive = sim.naivePersonLevel;
  if (naive) {
    named.push([`${analytic.analyses.personLevelAncova?.name ?? 'Person-level ANCOVA'}, naive SE (ignores clustering)`, naive.personLevelAncova]);
    if (naive.matchedDifference) named.push([`${analytic.analyses.matchedDifference?.name ?? 'Matched difference'}, naive SE (ignores clustering)`, naive.matchedDifference]);
  }
  const rows = named.map(([name, s]) => row(name, s));
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => (r[c] ?? '').length)));
  const line = (cells: string[]) =>
    cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c] ?? 0) : cell.padStart(widths[c] ?? 0))).join('  ');
  lines.push(line(header));
  lines.push(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) lines.push(line(r));
  for (const [name, s] of named) {
    if (!isFeasible(s)) lines.push(`  ${name}: not computed. ${s.reason}`);
    else if (s.replications < sim.replications) {
      lines.push(`  ${name}: computed in ${s.replications} of ${sim.replications} replications (too few matched sets in the others).`);
    }
  }
  // The matching summary only where the design matches (not in a one-group study).
  if (matches) {
    const m = sim.matching;
    const nP = sim.plan.groups.programme.poolSize;
    const ofP =
      design.kind === 'existing-groups'
        ? `${nP}`
        : design.kind === 'clusters'
          ? design.level === 'clusters'
            ? `${design.clusterCount.programme} clusters (counts below are clusters)`
            : `${nP} (people, in ${design.clusterCount.programme} clusters)`
          : `about ${nP} selected`;
    lines.push('');
    lines.push('Matching (simulated)');
    if (m.replicationsWithMatches === 0 && design.kind !== 'existing-groups') {
      lines.push(`  No programme ${design.kind === 'clusters' && design.level === 'clusters' ? 'cluster' : 'member'} was matched in any simulated study (the reason is given above).`);
      lines.push(
        `  Observed pretest difference (programme - comparison): ${fmtPoints(m.observedDifferenceBefore)} points (SMD ${fmtSD(m.observedSMDBefore)}); true-score difference ${fmtPoints(m.trueDifferenceBefore)} points (SMD ${fmtSD(m.trueSMDBefore)}).`,
      );
    } else {
      const members = design.kind === 'clusters' && design.level === 'clusters' ? 'Programme clusters' : 'Programme members';
      lines.push(
        `  ${members} matched: ${fmtPoints(m.meanMatchedProgramme)} of ${ofP} on average; ${fmtPercent(m.discardedProgrammeShare)} discarded (no partner within the caliper).`,
      );
      lines.push(
        `  Observed pretest difference (programme - comparison): ${fmtPoints(m.observedDifferenceBefore)} points before matching (SMD ${fmtSD(m.observedSMDBefore)}), ${fmtPoints(m.observedDifferenceAfter)} after (SMD ${fmtSD(m.observedSMDAfter)}).`,
      );
      lines.push(
        `  True-score difference (hidden imbalance): ${fmtPoints(m.trueDifferenceBefore)} points before (SMD ${fmtSD(m.trueSMDBefore)}), ${fmtPoints(m.trueDifferenceAfter)} after (SMD ${fmtSD(m.trueSMDAfter)}).`,
      );
      lines.push(`  Variance ratio of the observed pretest after matching (programme / comparison): ${fmtSD(m.varianceRatioAfter)}.`);
      lines.push(
        design.kind === 'clusters' && design.level === 'clusters'
          ? '  Differences are of cluster means. Balance on the observed means can look fine while the clusters\' true means still differ: that gap is the regression artefact.'
          : '  Balance on the observed pretest can look fine while the true scores still differ: that gap is the regression artefact.',
      );
    }
  }
  return `${lines.join('\n')}\n`;
}
