import { groupDigits } from '../format/groupDigits';
import type { AnalyticResults } from './analyticResults';

/**
 * One sentence saying where the figures shown before a full simulation come
 * from, for the screen, the PDF and the CLI alike: the quick simulation of the
 * planned procedure (with its replications) for the matching-based analysis and
 * closed forms for the full-sample analyses, or, before the quick figures are
 * in, closed forms that assume unlimited pools and exact matching; for a
 * design without a matched difference (one group), closed forms alone.
 *
 * @param r analytic results (analysePlan).
 * @returns the sentence.
 * @example procedureBasisNote(analysePlan(demoPlan())) // "Expected figures come from closed forms: …"
 */
export function procedureBasisNote(r: AnalyticResults): string {
  // A one-group study matches nobody: its one analysis is a closed form for the population and the rule.
  if (r.analyses.matchedDifference === undefined) {
    return 'Expected figures come from closed forms for this population and rule (nobody is matched, so no quick simulation is needed).';
  }
  if (r.procedure.basis === 'planned-procedure') {
    return (
      `Expected figures are for the procedure as planned: the matched difference from a quick simulation of these pools, ` +
      `caliper, ratio and matching order (${groupDigits(r.procedure.replications ?? 0)} replications, an approximation ` +
      `with its Monte Carlo SE), the full-sample analyses from closed forms. The formula for unlimited pools and exact matching is shown beside it.`
    );
  }
  return (
    'Expected figures come from closed forms; for the matched difference these assume unlimited pools and exact matching, ' +
    'which can be far off for tight plans (figures for the procedure as planned follow from a quick simulation).'
  );
}
