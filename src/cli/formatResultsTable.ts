import { DEFAULT_TARGET_POWER } from '../core/analysisSettings';
import type { AnalyticResults } from '../core/analyticResults';
import { presentAnalyses } from '../core/presentAnalyses';
import type { Plan } from '../core/plan';
import { procedureBasisNote } from '../core/procedureBasisNote';
import { showControlCharacters as visible } from '../core/visibleText';
import { centralCutOffVarianceInflation } from '../core/design/centralCutOffVarianceInflation';
import { selectionModel } from '../core/design/selectionModel';

/** The caution printed under every result. */
export const PLANNING_CAUTION =
  'Caution: Meanward is a planning aid built on stated assumptions; it is not a substitute for review by a statistician or an ethics board.';

/** Display formats (formatting only; every figure comes from analysePlan). */
// A tiny negative number rounds to "-0.00"; show it as "0.00".
const fixed = (x: number, digits: number): string => x.toFixed(digits).replace(/^-(0\.?0*)$/, '$1');
export const fmtPoints = (x: number): string => fixed(x, 2);
export const fmtSD = (x: number): string => fixed(x, 3);
export const fmtReliability = (x: number): string => fixed(x, 3);
export const fmtPercent = (x: number | null): string => (x === null ? 'n/a' : `${fixed(x * 100, 1)}%`);

/**
 * The readable result of "meanward run": the design and the rule, then per analysis the expected estimate,
 * bias (points and SD units), bias as a share of the effect, power and
 * false-positive rate; with covariates, the expected balance per variable and
 * the unmeasured part of the bias; then the reliabilities, SEM and break-even
 * reliability. An analysis that is not feasible shows a dash for its power and
 * false-positive rate and its reason under the table.
 */
export function formatResultsTable(plan: Plan, results: AnalyticResults): string {
  const lines: string[] = [];
  lines.push(plan.title === '' ? 'Untitled plan' : visible(plan.title));
  lines.push('');
  lines.push(...designLines(plan, results));
  lines.push('');
  lines.push('Expected results for the procedure as planned');
  lines.push(procedureBasisNote(results));
  // With clusters matched on their means the matched difference's count is of clusters; people for the rest.
  const clusterLevel = results.clusters?.level === 'clusters';
  const header = ['Analysis', 'Expected estimate', '(MC SE)', 'Formula, unlimited pools', 'Bias (points)', 'Bias (SD)', 'Share of effect', 'SE', 'Power', 'False-positive rate', clusterLevel ? 'Programme n (people)' : 'Programme n'];
  const rows = presentAnalyses(results.analyses).map(([, a]) => {
    const rate = (x: number | null): string => (a.feasible ? fmtPercent(x) : '—');
    return [
      a.name,
      fmtPoints(a.expectedEstimate),
      a.expectedEstimateMCSE === null ? '' : `(${fmtPoints(a.expectedEstimateMCSE)})`,
      fmtPoints(a.formulaEstimate),
      fmtPoints(a.bias),
      fmtSD(a.biasSD),
      fmtPercent(a.biasShare),
      a.se === null ? '—' : fmtPoints(a.se),
      rate(a.power),
      rate(a.falsePositiveRate),
      a.nProgramme.toFixed(0),
    ];
  });
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
  const line = (cells: string[]) => cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  ');
  lines.push(line(header));
  lines.push(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) lines.push(line(r));
  for (const [, a] of presentAnalyses(results.analyses)) {
    if (!a.feasible) lines.push(`  ${a.name}: not feasible. ${a.infeasibleReason ?? ''}`.trimEnd());
    if (a.varianceInflation !== undefined) {
      lines.push(
        `  ${a.name}: its variance is ${fmtPoints(a.varianceInflation)} times a randomised study's of the same size and split ` +
          `(about ${fmtPoints(centralCutOffVarianceInflation())} at a cut-off in the middle of the scores), so it needs that many times the sample for the same power.`,
      );
    }
  }
  // Verdicts: the regression artefact and the growth gap apart, whether each analysis is tolerable and why,
  // and the sample size for the target power (none for a biased analysis), all from core.
  const power = plan.analysis.targetPower ?? DEFAULT_TARGET_POWER;
  lines.push('');
  lines.push(`Verdicts (n per group for ${fmtPercent(power)} power)`);
  for (const [, a] of presentAnalyses(results.analyses)) {
    const n = a.requiredNNote ?? (!a.feasible ? 'not feasible' : a.requiredNPerGroup === null ? 'not reachable' : `${a.requiredNPerGroup} per group`);
    const parts = a.growthGap === 0 ? '' : ` Regression artefact ${fmtPoints(a.regressionArtefact)} (${fmtPercent(a.regressionArtefactShare)}), growth gap ${fmtPoints(a.growthGap)} (${fmtPercent(a.growthGapShare)}).`;
    lines.push(`  ${a.name}: ${a.tolerability.reason}${parts} n: ${n}.`);
    if (a.growthGapNote) lines.push(`    ${a.growthGapNote}`);
  }
  if (results.requiredNCounts) lines.push(`  ${results.requiredNCounts}`);
  lines.push(...clusterAnalysisLines(results));
  lines.push(...covariateLines(results));
  lines.push('');
  lines.push('Pretest');
  if (results.design.kind === 'selection') {
    // With a rule the pretest is described in the whole population (a group the rule cut out has no reliability of its own).
    lines.push(`  Reliability in the population:        ${fmtReliability(selectionModel(plan).population.reliability)}`);
  } else {
    lines.push(`  Within-group reliability, programme:  ${fmtReliability(results.reliability.programme)}`);
    lines.push(`  Within-group reliability, comparison: ${fmtReliability(results.reliability.comparison)}`);
  }
  lines.push(`  Standard error of measurement (SEM):  ${fmtPoints(results.reliability.sem)} points`);
  if (results.clusters) {
    lines.push(`  Reliability of a cluster's observed mean: ${fmtReliability(results.clusters.clusterMeanReliability.comparison)} (comparison clusters)`);
  }
  const be = results.breakEven;
  lines.push(
    be.reliability === null
      ? `  Break-even reliability: not applicable. ${be.note}`.trimEnd()
      : `  Break-even reliability: ${fmtReliability(be.reliability)} (${be.alreadyMet ? 'already met' : 'not met'}). ${be.note}`.trimEnd(),
  );
  return `${lines.join('\n')}\n`;
}

/**
 * The design and the rule (core's design summary), the hoped-for effect and
 * the groups: for a rule, the population and the groups it forms (expected
 * sizes); for a one-group study, the change expected with no programme.
 */
function designLines(plan: Plan, results: AnalyticResults): string[] {
  const d = results.design;
  const P = plan.groups.programme;
  const C = plan.groups.comparison;
  const effect = `Hypothesised effect: ${fmtPoints(results.tau)} posttest points.`;
  if (d.kind === 'clusters') return clusterLines(plan, results);
  if (d.kind === 'existing-groups') {
    return [
      `${effect} Programme: ${visible(P.label)} (${P.poolSize}); comparison: ${visible(C.label)} (${C.poolSize}).`,
      `Design: two existing groups. ${d.rule}`,
    ];
  }
  const pop = plan.population;
  const out = [
    `Design: ${d.shape === 'one-group' ? 'one group, measured before and after (no comparison group)' : 'two groups formed by a rule'}.`,
    `Rule: ${d.rule}`,
    `What it means: ${d.meaning}`,
  ];
  if (pop) out.push(`Population: ${visible(pop.label)} (${pop.poolSize}); selected about ${fmtPercent(d.selectedShare)}.`);
  out.push(
    d.shape === 'one-group'
      ? `${effect} Selected: ${visible(P.label)} (about ${P.poolSize}). Change expected with no programme: ${d.noProgrammeChange === null ? 'n/a' : fmtPoints(d.noProgrammeChange)} points.`
      : `${effect} Programme: ${visible(P.label)} (about ${P.poolSize}); comparison: ${visible(C.label)} (about ${C.poolSize}).`,
  );
  return out;
}

/**
 * A clusters design: the groups in people and clusters, the rule and what it
 * means, the cluster-mean reliability λ and who sits the posttest, the design
 * effects, and for the headline analysis the clusters per group the target
 * power needs and the minimum detectable effect (all from core).
 */
function clusterLines(plan: Plan, results: AnalyticResults): string[] {
  const d = results.design;
  const c = results.clusters;
  const P = plan.groups.programme;
  const C = plan.groups.comparison;
  const out = [`Design: two existing groups of clusters. ${d.rule}`, `What it means: ${d.meaning}`];
  if (!c) return out;
  out.push(
    `Hypothesised effect: ${fmtPoints(results.tau)} posttest points. Programme: ${visible(P.label)} (${P.poolSize} people in ${c.clustersPerGroup.programme} clusters of ${c.size.programme}); ` +
      `comparison: ${visible(C.label)} (${C.poolSize} people in ${c.clustersPerGroup.comparison} clusters of ${c.size.comparison}).`,
  );
  out.push(
    `Clusters: pretest ICC ${fmtReliability(c.pretestICC)}, posttest ICC ${fmtReliability(c.posttestICC)}; ` +
      `${c.cohort === 'same' ? 'the same people sit the posttest' : 'a new cohort sits the posttest (not the people tested)'}; ` +
      `matching ${c.level === 'clusters' ? 'clusters on their observed means' : 'people across clusters'}.`,
  );
  out.push(
    `Reliability of a cluster's observed mean (lambda): ${fmtReliability(c.clusterMeanReliability.comparison)} (comparison), ${fmtReliability(c.clusterMeanReliability.programme)} (programme).`,
  );
  out.push(`Design effect (Kish): ${fmtPoints(c.designEffect.pretest)} for the pretest, ${fmtPoints(c.designEffect.posttest)} for the posttest.`);
  const head = results.analyses.matchedDifference;
  if (head && head.clustersPerGroupNeeded !== undefined && head.feasible) {
    out.push(
      `${head.name}: ${head.requiredNNote !== null ? `${head.requiredNNote} (no number of clusters per group is offered)` : head.clustersPerGroupNeeded === null ? 'no number of clusters per group reaches the target power' : `${head.clustersPerGroupNeeded} clusters per group for the target power`}; ` +
        `minimum detectable effect ${head.minimumDetectableEffect === null || head.minimumDetectableEffect === undefined ? 'n/a' : fmtPoints(head.minimumDetectableEffect)} points with the artefact included.`,
    );
  }
  return out;
}

/** Under the table for a clusters design: per analysis the clusters needed and MDE, and the naive SE of the person-level analysis. */
function clusterAnalysisLines(results: AnalyticResults): string[] {
  if (!results.clusters) return [];
  const out: string[] = [];
  for (const [, a] of presentAnalyses(results.analyses)) {
    if (!a.feasible || a.clustersPerGroupNeeded === undefined) continue;
    const needed = a.requiredNNote !== null ? a.requiredNNote : a.clustersPerGroupNeeded === null ? 'no number of clusters is enough' : `${a.clustersPerGroupNeeded} clusters per group needed`;
    const mde = a.minimumDetectableEffect === null || a.minimumDetectableEffect === undefined ? 'n/a' : fmtPoints(a.minimumDetectableEffect);
    const naive = a.naiveSE === undefined ? '' : `; ignoring the clustering its SE would be reported as ${fmtPoints(a.naiveSE)}`;
    out.push(`  ${a.name}: cluster-aware SE ${a.se === null ? '—' : fmtPoints(a.se)}${a.df === null ? '' : ` (df ${a.df.toFixed(0)})`}${naive}; ${needed}; MDE ${mde} points.`);
  }
  return out;
}

const DISTANCE_WORDS = {
  pretest: 'the pretest',
  propensity: 'the propensity score',
  mahalanobis: 'Mahalanobis distance',
} as const;

/** With covariates: expected balance per variable and the unmeasured part (empty otherwise). */
function covariateLines(results: AnalyticResults): string[] {
  const cm = results.covariateModel;
  const balance = results.covariateBalance;
  const hidden = results.unmeasuredBias;
  if (!cm || !balance || !hidden) return [];
  const out: string[] = [''];
  out.push(`Pretest and covariates (closed form: balance after exact matching on ${DISTANCE_WORDS[results.matchingDistance ?? 'pretest']})`);
  const yesNo = (x: boolean): string => (x ? 'yes' : 'no');
  const header = ['Variable', 'Measured', 'Exact', 'Reliability', 'SMD before', 'Observed SMD after', 'True SMD after'];
  const rows = balance.map((b, j) => [
    visible(b.name),
    yesNo(b.measured),
    yesNo(b.exact),
    fmtReliability(cm.reliability.comparison[j] as number),
    fmtSD(b.observedSMDBefore),
    fmtSD(b.observedSMDAfter),
    fmtSD(b.trueSMDAfter),
  ]);
  const widths = header.map((h, c) => Math.max(h.length, ...rows.map((r) => r[c]!.length)));
  const line = (cells: string[]) => cells.map((cell, c) => (c === 0 ? cell.padEnd(widths[c]!) : cell.padStart(widths[c]!))).join('  ');
  out.push(line(header));
  out.push(widths.map((w) => '-'.repeat(w)).join('  '));
  for (const r of rows) out.push(line(r));
  out.push('');
  out.push(
    hidden.covariates.length === 0
      ? 'Unmeasured part of the bias: none (every covariate in the plan is measured).'
      : `Unmeasured part of the bias (${hidden.covariates.map((c) => visible(c)).join(', ')}): ${fmtPoints(hidden.points)} points (${fmtSD(hidden.sd)} SD), ` +
          `${fmtPercent(hidden.share)} of the effect. No analysis of the measured covariates removes it.`,
  );
  return out;
}
