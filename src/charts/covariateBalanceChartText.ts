import type { ChartText } from './chartTypes';
import type { CovariateBalanceChartData, CovariateBalanceRow } from './covariateBalanceChartData';
import { fmt } from './svgHelpers';

/** "Attendance (not measured)", "Sex (matched exactly)". */
export function covariateBalanceLabel(r: Pick<CovariateBalanceRow, 'name' | 'measured' | 'exact'>): string {
  if (!r.measured) return `${r.name} (not measured)`;
  if (r.exact) return `${r.name} (matched exactly)`;
  return r.name;
}

function listNames(names: string[]): string {
  if (names.length <= 1) return names.join('');
  return `${names.slice(0, -1).join(', ')} and ${names[names.length - 1]}`;
}

/**
 * Text alternative to the per-covariate balance chart (screen readers, the
 * PDF): which variables look balanced after matching but are not on their
 * true scores, which were never measured, which variance ratios fall outside
 * 0.5–2, and a table of every plotted value.
 */
export function covariateBalanceChartText(data: CovariateBalanceChartData): ChartText {
  const [strict, lenient] = data.thresholds;
  const [lo, hi] = data.varianceRatioRange;
  const sentences: string[] = [];
  const hidden = data.rows.filter((r) => r.measured && Math.abs(r.observedAfter) < strict && Math.abs(r.trueAfter) >= strict);
  const balanced = data.rows.filter((r) => Math.abs(r.observedAfter) < strict && Math.abs(r.trueAfter) < strict);
  const unmeasured = data.rows.filter((r) => !r.measured);
  const observedOff = data.rows.filter((r) => r.measured && Math.abs(r.observedAfter) >= strict);
  if (hidden.length > 0) {
    sentences.push(
      `After matching, ${listNames(hidden.map((r) => `${r.name} (observed ${fmt(r.observedAfter, 2)}, true ${fmt(r.trueAfter, 2)})`))} ${hidden.length === 1 ? 'looks' : 'look'} balanced on the observed values but not on the true scores: measurement error leaves part of the gap.`,
    );
  }
  if (observedOff.length > 0) {
    sentences.push(
      `Still beyond the strict ${fmt(strict, 2)} threshold on the observed values after matching: ${listNames(observedOff.map((r) => `${r.name} (${fmt(r.observedAfter, 2)})`))}.`,
    );
  }
  if (unmeasured.length > 0) {
    sentences.push(
      `Not measured, so matching cannot balance ${unmeasured.length === 1 ? 'it' : 'them'}: ${listNames(unmeasured.map((r) => `${r.name} (true-score SMD ${fmt(r.trueBefore, 2)} before, ${fmt(r.trueAfter, 2)} after)`))}.`,
    );
  }
  if (balanced.length === data.rows.length) {
    sentences.push(`Every variable is within the strict ${fmt(strict, 2)} threshold after matching, on the observed values and on the true scores.`);
  }
  const vrOff = data.rows.filter((r) => r.varianceRatioOutside);
  sentences.push(
    vrOff.length > 0
      ? `Variance ratio after matching outside ${fmt(lo, 1)}–${fmt(hi, 0)} (poor balance of spread): ${listNames(vrOff.map((r) => `${r.name} (${fmt(r.varianceRatio ?? NaN, 2)})`))}.`
      : `Every variance ratio after matching is within ${fmt(lo, 1)}–${fmt(hi, 0)}.`,
  );
  sentences.push(
    `${data.source === 'simulation' ? `Figures are means over ${data.replications} simulated studies` : 'Figures are closed-form values for exact matching from an unlimited comparison pool'}; the reference lines are at ${fmt(strict, 2)} (strict) and ${fmt(lenient, 2)} (lenient).`,
  );
  return {
    title: data.title,
    sentences,
    table: {
      caption: 'Standardised mean differences (programme minus comparison, pooled SD) and variance ratios, per variable',
      columns: ['Variable', 'Observed SMD before', 'Observed SMD after', 'True-score SMD after', 'Variance ratio after'],
      rows: data.rows.map((r) => [
        covariateBalanceLabel(r),
        fmt(r.observedBefore, 2),
        fmt(r.observedAfter, 2),
        fmt(r.trueAfter, 2),
        r.varianceRatio === null ? 'not available' : `${fmt(r.varianceRatio, 2)}${r.varianceRatioOutside ? ` (outside ${fmt(lo, 1)}–${fmt(hi, 0)})` : ''}`,
      ]),
    },
  };
}
