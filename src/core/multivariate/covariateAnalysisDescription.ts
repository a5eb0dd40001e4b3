import type { MatchingDistance, TwoGroupAnalysisId } from '../plan';

const MATCHED_ON: Record<MatchingDistance, string> = {
  pretest: 'matched on the pretest',
  propensity: 'matched on the propensity score',
  mahalanobis: 'matched on Mahalanobis distance',
};

/**
 * Plain name and one-line assumption of each analysis when the plan has
 * covariates (the matched difference names its distance; ANCOVA and the
 * corrected ANCOVA adjust for every measured covariate). Shown on screen and
 * in reports: use these, never retype them.
 *
 * Reference: Rosenbaum & Rubin (1983, 1985); Rubin (1980); Lord (1960); Porter (1967); common practice.
 *
 * @param id analysis. @param distance the plan's matching distance.
 * @returns { name, assumption }.
 * @throws never.
 * @example covariateAnalysisDescription('ancova', 'pretest').name // "ANCOVA on the pretest and measured covariates"
 */
export function covariateAnalysisDescription(id: TwoGroupAnalysisId, distance: MatchingDistance): { name: string; assumption: string } {
  switch (id) {
    case 'matchedDifference':
      return {
        name: `Matched post-test difference (${MATCHED_ON[distance]})`,
        assumption:
          'Unbiased only if every confounder is measured without error and matched on, and growth is parallel.',
      };
    case 'ancova':
      return {
        name: 'ANCOVA on the pretest and measured covariates',
        assumption:
          'Unbiased only if every confounder is measured without error and adjusted for, and growth is parallel.',
      };
    case 'gainScore':
      return {
        name: 'Gain score (post-test minus pretest)',
        assumption:
          'Unbiased only if both groups would have grown alike without the programme: parallel growth, a slope of 1 on the pretest, and no other confounder.',
      };
    case 'correctedAncova':
      return {
        name: 'Reliability-corrected ANCOVA on the pretest and measured covariates',
        assumption:
          'Unbiased only if the assumed reliabilities are the true within-group ones, every confounder is measured, and growth is parallel.',
      };
  }
}
