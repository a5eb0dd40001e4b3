import type { ChartText } from './chartTypes';
import type { CovariateBalanceChartData, CovariateBalanceRow, CovariateBalanceStatus } from './covariateBalanceChartData';
import { fmt } from './svgHelpers';

/** "Attendance (not measured)", "Sex (matched exactly)". */
export function covariateBalanceLabel(r: Pick<CovariateBalanceRow, 'name' | 'measured' | 'exact'>): string {
  if (!r.measured) return `${r.name} (not measured)`;
  if (r.exact) return `${r.name} (matched exactly)`;
  return r.name;
}

/** Each status in our own plain words (chart rows, table, text). */
export const COVARIATE_BALANCE_STATUS_WORDS: Record<CovariateBalanceStatus, string> = {
  hidden: 'looks balanced, is not',
  balanced: 'balanced, underneath too',
  apart: 'still apart as measured',
  unmeasured: "out of matching's reach",
};

function listNames(names: string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

/**
 * Text alternative to the per-covariate balance chart (screen readers, the
 * PDF): which variables look balanced as measured after matching but are not
 * on their true scores, which stay apart, which were never measured, which
 * variance ratios fall outside 0.5–2, and a table of every plotted value with
 * the trade's terms (SMD, variance ratio).
 */
export function covariateBalanceChartText(data: CovariateBalanceChartData): ChartText {
  const [strict, lenient] = data.thresholds;
  const [lo, hi] = data.varianceRatioRange;
  const sentences: string[] = [];
  const having = (s: CovariateBalanceStatus) => data.rows.filter((r) => r.status === s);
  const hidden = having('hidden');
  const apart = having('apart');
  const unmeasured = having('unmeasured');
  if (hidden.length > 0) {
    sentences.push(
      `Looks balanced, is not: after matching, ${listNames(hidden.map((r) => `${r.name} (observed SMD ${fmt(r.observedAfter, 2)}, true-score SMD ${fmt(r.trueAfter, 2)})`))} ${hidden.length === 1 ? 'is' : 'are'} within ${fmt(strict, 2)} as measured but not on the true scores: measurement error hides part of the gap.`,
    );
  }
  if (apart.length > 0) {
    sentences.push(
      `Still apart as measured after matching (observed SMD ${fmt(strict, 2)} or more): ${listNames(apart.map((r) => `${r.name} (${fmt(r.observedAfter, 2)}; true-score SMD ${fmt(r.trueAfter, 2)})`))}.`,
    );
  }
  if (unmeasured.length > 0) {
    sentences.push(
      `Not measured, so matching cannot reach ${unmeasured.length === 1 ? 'it' : 'them'}: ${listNames(unmeasured.map((r) => `${r.name} (true-score SMD ${fmt(r.trueBefore, 2)} before, ${fmt(r.trueAfter, 2)} after)`))}.`,
    );
  }
  if (having('balanced').length === data.rows.length) {
    sentences.push(`Every variable is within ${fmt(strict, 2)} after matching, as measured and on the true scores.`);
  }
  const vrOff = data.rows.filter((r) => r.varianceRatioOutside);
  sentences.push(
    vrOff.length > 0
      ? `Spread differs after matching (variance ratio outside ${fmt(lo, 1)}–${fmt(hi, 0)}): ${listNames(vrOff.map((r) => `${r.name} (${fmt(r.varianceRatio ?? NaN, 2)})`))}.`
      : `Every variance ratio after matching is within ${fmt(lo, 1)}–${fmt(hi, 0)}.`,
  );
  sentences.push(
    `${data.source === 'simulation' ? `Figures are means over ${data.replications} simulated studies` : 'Figures are closed-form values for exact matching from an unlimited comparison pool'}; an SMD below ${fmt(strict, 2)} is commonly read as balanced, below ${fmt(lenient, 2)} as roughly balanced.`,
  );
  return {
    title: data.title,
    sentences,
    table: {
      caption: 'Standardised mean differences (programme minus comparison, pooled SD), as measured and on the true scores, and variance ratios, per variable',
      columns: ['Variable', 'After matching', 'Observed SMD before', 'Observed SMD after', 'True-score SMD before', 'True-score SMD after', 'Variance ratio after'],
      rows: data.rows.map((r) => [
        covariateBalanceLabel(r),
        COVARIATE_BALANCE_STATUS_WORDS[r.status],
        fmt(r.observedBefore, 2),
        fmt(r.observedAfter, 2),
        fmt(r.trueBefore, 2),
        fmt(r.trueAfter, 2),
        r.varianceRatio === null ? 'not available' : `${fmt(r.varianceRatio, 2)}${r.varianceRatioOutside ? ` (outside ${fmt(lo, 1)}–${fmt(hi, 0)})` : ''}`,
      ]),
    },
  };
}
