import type { MatchingDistance } from './plan';

/**
 * What the matched comparison matches on, in plain words, for headings and
 * sentences ("Matching on …"): the observed pretest, the propensity score
 * or the Mahalanobis distance. Shared by the verdict, the charts and the PDF
 * so no text says "matched on the observed score" when it was not.
 * Reference: none (wording).
 */
export const MATCHED_ON: Record<MatchingDistance, string> = {
  pretest: 'the observed pretest',
  propensity: 'the propensity score',
  mahalanobis: 'the Mahalanobis distance',
};
