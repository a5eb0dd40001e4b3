/**
 * The covariate parts of the PDF summary: the covariates and their
 * correlation matrix in the assumptions, balance per covariate in the
 * simulated results, and the covariate model in brief. Values are shown as
 * entered or as src/core and src/sim return them (formatting only).
 */
import { isVarianceRatioOutside } from '../charts/covariateBalanceChartData';
import type { AnalyticResults } from '../core/analyticResults';
import type { MatchingDistance, Plan } from '../core/plan';
import type { CovariateBalance } from '../sim/types';
import { formatCount, formatInput, formatPoints, formatSD, formatShare, formatSignedPoints, withMcse } from './format';
import type { PdfWriter, TableColumn } from './pdfWriter';

/** Plain words for each matching distance. */
export const DISTANCE_WORDS: Record<MatchingDistance, string> = {
  pretest: 'the observed pretest',
  propensity: 'the linear propensity score (logit) fitted on all measured variables',
  mahalanobis: 'the Mahalanobis distance on all measured variables',
};

/** The caliper's unit for each matching distance. */
export const CALIPER_UNIT_WORDS: Record<MatchingDistance, string> = {
  pretest: 'SD of the pretest',
  propensity: 'SD of the logit of the propensity score',
  mahalanobis: 'Mahalanobis-distance units',
};

/** "0.2 SD of the pretest", "0.2 SD of the logit of the propensity score", … */
export function caliperPhrase(plan: Plan): string {
  return `${plan.matching.caliper} ${CALIPER_UNIT_WORDS[plan.matching.distance ?? 'pretest']}`;
}

/** A table as plain data (so tests can check it without drawing). */
export interface ReportTable {
  columns: TableColumn[];
  rows: string[][];
}

/** The covariates as entered, one row each (empty when the plan has none). */
export function covariateInputTable(plan: Plan): ReportTable {
  const columns: TableColumn[] = [
    { header: 'Covariate', width: 16 },
    { header: 'Programme mean', width: 13, align: 'right' },
    { header: 'Comparison mean', width: 14, align: 'right' },
    { header: 'SD within a group', width: 11, align: 'right' },
    { header: 'Reliability', width: 12, align: 'right' },
    { header: 'Correlation with the outcome', width: 13, align: 'right' },
    { header: 'Measured', width: 11 },
    { header: 'Matched exactly', width: 10 },
  ];
  const rows = (plan.covariates ?? []).map((c, i) => [
    `${i + 1}. ${c.name}`,
    formatInput(c.programmeMean),
    formatInput(c.comparisonMean),
    formatInput(c.sd),
    formatInput(c.reliability),
    formatInput(c.outcomeCorrelation),
    formatInput(c.measured),
    formatInput(c.exact),
  ]);
  return { columns, rows };
}

/** The observed correlation matrix as entered, pretest first (empty when the plan has no covariates). */
export function correlationMatrixTable(plan: Plan): ReportTable {
  const covariates = plan.covariates ?? [];
  const matrix = plan.covariateCorrelations;
  if (covariates.length === 0 || !matrix) return { columns: [], rows: [] };
  const names = ['Pretest', ...covariates.map((c, i) => `${i + 1}. ${c.name}`)];
  const columns: TableColumn[] = [
    { header: '', width: 26 },
    ...names.map((_, j) => ({ header: j === 0 ? 'Pretest' : String(j), width: 74 / names.length, align: 'right' as const })),
  ];
  const rows = names.map((name, i) => [name, ...names.map((_, j) => formatInput(matrix[i]?.[j]))]);
  return { columns, rows };
}

/** Write the covariates and their correlations into the assumptions (nothing when the plan has none). */
export function writeCovariateInputs(w: PdfWriter, plan: Plan): void {
  const table = covariateInputTable(plan);
  if (table.rows.length === 0) return;
  w.heading('Covariates besides the pretest', 3);
  w.paragraph(
    `Matching uses ${DISTANCE_WORDS[plan.matching.distance ?? 'pretest']}; ANCOVA adjusts for every measured variable. Means and SDs are of the observed values; reliability 1 means measured without error. An unmeasured covariate is a confounder the study knows of but will not observe: its share of the bias cannot be removed.`,
    { size: 9, muted: true },
  );
  w.table(table.columns, table.rows, { boldFirstColumn: true, fontSize: 8 });
  const m = correlationMatrixTable(plan);
  w.heading('Observed correlations within a group (pretest first)', 3);
  w.table(m.columns, m.rows, { boldFirstColumn: true, fontSize: 8 });
}

/** Balance per variable from the simulation, with Monte Carlo SEs (empty when the run has none). */
export function covariateBalanceTable(balance: readonly CovariateBalance[] | undefined): ReportTable {
  const columns: TableColumn[] = [
    { header: 'Variable', width: 28 },
    { header: 'Observed SMD before', width: 13, align: 'right' },
    { header: 'Observed SMD after', width: 18, align: 'right' },
    { header: 'True-score SMD after (hidden)', width: 21, align: 'right' },
    { header: 'Variance ratio after (0.5–2 acceptable)', width: 20, align: 'right' },
  ];
  const rows = (balance ?? []).map((b) => [
    `${b.name}${b.measured ? (b.exact ? ' (matched exactly)' : '') : ' (not measured)'}`,
    formatSD(b.observedSMDBefore),
    withMcse(formatSD(b.observedSMDAfter), b.observedSMDAfterMCSE, (x) => formatPoints(x)),
    withMcse(formatSD(b.trueSMDAfter), b.trueSMDAfterMCSE, (x) => formatPoints(x)),
    withMcse(formatPoints(b.varianceRatioAfter), b.varianceRatioAfterMCSE, (x) => formatPoints(x)) +
      (isVarianceRatioOutside(b.varianceRatioAfter) ? ' outside' : ''),
  ]);
  return { columns, rows };
}

/** Write the simulated balance per covariate (nothing when the run has no per-covariate balance). */
export function writeCovariateBalance(w: PdfWriter, balance: readonly CovariateBalance[] | undefined, replications: number): void {
  const table = covariateBalanceTable(balance);
  if (table.rows.length === 0) return;
  w.heading('Balance on each covariate (simulated)', 3);
  w.paragraph(
    `Standardised mean differences (SMD: programme minus comparison, pooled SD of the full pools) before and after matching, means over ${formatCount(replications)} simulated studies with their Monte Carlo SEs. An SMD below 0.1 is commonly read as balanced and below 0.25 as roughly balanced; a variance ratio outside 0.5–2 says the spread differs (Rubin 2001; Stuart 2010). The true-score column is what the observed balance hides: a variable can look balanced as measured and not be.`,
    { size: 9, muted: true },
  );
  w.table(table.columns, table.rows, { boldFirstColumn: true, fontSize: 8 });
}

/** The covariate model in brief, added to "How this was computed" when the plan has covariates. */
export const COVARIATE_MODEL_LINES: string[] = [
  'Several covariates (classical test theory in several variables): the pretest is variable 0 and each covariate j has its own reliability; errors are independent, so the true-score covariance matrix is Σ_T = Σ_X − diag(SEM²), with Σ_X built from the observed within-group SDs and correlations. The outcome’s true-score slopes β solve Σ_T β = the covariates’ covariances with the outcome.',
  'Expected artefact (multivariate normal, equal within-group covariances): exact matching on all measured covariates, exact matching on the linear propensity score, and ANCOVA on all measured covariates share the bias δ + β′(Δ − Σ_T[:, m] Σ_X[m, m]⁻¹ Δ[m]), m the measured covariates. A multivariate reliability correction removes the measured part; the part carried by unmeasured covariates remains whatever the analysis.',
];

/** Caution added when the plan lists covariates. */
export const COVARIATE_CAUTION =
  'Covariates are modelled as jointly normal with linear relations and the same correlations in both groups. A category matched exactly is treated as a normal variable with no measurement error, an approximation. Confounders not listed at all (neither measured nor marked unmeasured) are not in these figures.';

/** "A", "A and B", "A, B and C". */
function listNames(names: readonly string[]): string {
  return names.length <= 1 ? names.join('') : `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

/**
 * The unmeasured part of the bias in plain words (core's unmeasuredBias), or
 * null when the plan lists no covariates.
 */
export function unmeasuredPartText(plan: Plan, analytic: AnalyticResults): string | null {
  const u = analytic.unmeasuredBias;
  if (!u || (plan.covariates?.length ?? 0) === 0) return null;
  if (u.covariates.length === 0) {
    return 'Every covariate listed in the plan is measured, so no part of the expected bias comes from a known confounder left unobserved. Confounders not listed are not in these figures.';
  }
  const one = u.covariates.length === 1;
  const share = u.share === null ? '' : `, ${formatShare(Math.abs(u.share))} of the hoped-for effect`;
  return `Not measured: ${listNames(u.covariates)}. ${formatSignedPoints(u.points)} post-test points (${formatSD(u.sd)} post-test SD${share}) of the expected bias come from ${one ? 'this confounder' : 'these confounders'}. No matching, adjustment or reliability correction on the measured variables removes that part, in any of the analyses above; only measuring ${one ? 'it' : 'them'} could.`;
}

/** Write the unmeasured part under the results (nothing for plans without covariates). */
export function writeUnmeasuredPart(w: PdfWriter, plan: Plan, analytic: AnalyticResults): void {
  const text = unmeasuredPartText(plan, analytic);
  if (text === null) return;
  w.heading('What was never measured', 3);
  w.paragraph(text);
}
