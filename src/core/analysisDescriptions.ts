import type { AnalysisId } from './plan';

/**
 * Plain names of the analyses and the one-line assumption under which
 * each is unbiased (Lord 1960; Porter 1967; Campbell & Erlebacher 1970;
 * common practice). Shown on screen and in reports: use these, never retype them.
 */
export const ANALYSIS_DESCRIPTIONS: Record<AnalysisId, { name: string; assumption: string }> = {
  matchedDifference: {
    name: 'Matched post-test difference',
    assumption:
      'Unbiased only if the groups do not differ in true pretest scores, or the pretest is perfectly reliable, and growth is parallel.',
  },
  ancova: {
    name: 'ANCOVA on the observed pretest',
    assumption:
      'Unbiased only if assignment depended on the observed pretest itself, or the pretest is perfectly reliable, and growth is parallel.',
  },
  gainScore: {
    name: 'Gain score (post-test minus pretest)',
    assumption:
      'Unbiased only if both groups would have grown alike without the programme: parallel growth and a slope of 1 on the pretest.',
  },
  correctedAncova: {
    name: 'Reliability-corrected ANCOVA',
    assumption:
      'Unbiased only if the assumed reliability equals the true within-group reliability and growth is parallel.',
  },
  regressionDiscontinuity: {
    name: 'Regression discontinuity (outcome on group and the selection score)',
    assumption:
      'Unbiased only if the rule was applied as stated to the score adjusted for, the relation of outcome to that score is correctly specified (linear here), scores were not manipulated, and growth is parallel.',
  },
  prePostChange: {
    name: 'Pre–post change of the selected group',
    assumption:
      'Unbiased only if people were not selected on the baseline measurement (or it is perfectly reliable) and nothing else changes the scores between the measurements.',
  },
  personLevelAncova: {
    name: 'Person-level ANCOVA with cluster-robust SEs',
    assumption:
      'Unbiased only if the groups do not differ in true pretest scores, or the pretest used is perfectly reliable, and growth is parallel; its SE counts the clustering (CR2).',
  },
};
