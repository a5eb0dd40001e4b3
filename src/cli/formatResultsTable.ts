import type { AnalyticResults } from '../core/analyticResults';
import { presentAnalyses } from '../core/presentAnalyses';
import type { Plan } from '../core/plan';
import { procedureBasisNote } from '../core/procedureBasisNote';
import { showControlCharacters as visible } from '../core/visibleText';

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
 * The readable result of "meanward run": per analysis the expected estimate,
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
  lines.push(
    `Hypothesised effect: ${fmtPoints(results.tau)} posttest points. Programme: ${visible(plan.groups.programme.label)} (${plan.groups.programme.poolSize}); comparison: ${visible(plan.groups.comparison.label)} (${plan.groups.comparison.poolSize}).`,
  );
  lines.push('');
  lines.push('Expected results for the procedure as planned');
  lines.push(procedureBasisNote(results));
  const header = ['Analysis', 'Expected estimate', '(MC SE)', 'Formula, unlimited pools', 'Bias (points)', 'Bias (SD)', 'Share of effect', 'SE', 'Power', 'False-positive rate', 'Programme n'];
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
  }
  lines.push(...covariateLines(results));
  lines.push('');
  lines.push('Pretest');
  lines.push(`  Within-group reliability, programme:  ${fmtReliability(results.reliability.programme)}`);
  lines.push(`  Within-group reliability, comparison: ${fmtReliability(results.reliability.comparison)}`);
  lines.push(`  Standard error of measurement (SEM):  ${fmtPoints(results.reliability.sem)} points`);
  const be = results.breakEven;
  lines.push(
    be.reliability === null
      ? `  Break-even reliability: not applicable. ${be.note}`.trimEnd()
      : `  Break-even reliability: ${fmtReliability(be.reliability)} (${be.alreadyMet ? 'already met' : 'not met'}). ${be.note}`.trimEnd(),
  );
  return `${lines.join('\n')}\n`;
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
