import type { Plan } from './plan';
import { isClusterDesign, isSelectionDesign, studyDesign } from './design/studyDesign';

/**
 * What the required n "per group" counts for this plan's design, in plain
 * words, so that a reader whose pools and matching ratio are unequal knows
 * which people the figure is about. It follows the sizes the required-n
 * search gives each analysis' standard error (analyseAnalysis,
 * analyseCovariateAnalysis, selectionStandardError, clusterStandardError).
 *
 * Reference: none (a description of this project's sample-size search).
 * @param plan a validated plan.
 * @returns one or two sentences.
 * @throws never.
 * @example demo (pools 180 and 1200, ratio 1) → "Per group means people analysed in each group, the same number in both …"
 */
export function requiredNCounts(plan: Plan): string {
  const ratio = plan.matching.ratio;
  const partners = ratio === 1 ? 'one comparison partner each' : `${ratio} comparison partners each (so ${ratio} × n comparison members)`;
  if (isClusterDesign(plan)) {
    return (
      'Per group counts people: clusters per group needed × people per cluster. For the matched comparison, ' +
      `matched programme clusters, with ${ratio === 1 ? 'one comparison cluster each' : `${ratio} comparison clusters each`}.`
    );
  }
  if (isSelectionDesign(plan)) {
    const d = studyDesign(plan);
    if (d.kind === 'selection' && d.shape === 'one-group') return 'Per group counts the selected people measured twice (there is one group).';
    return (
      'Per group counts programme members; the comparison group grows with them in the split the rule gives. ' +
      `For the matched difference it counts matched programme members, with ${partners}.`
    );
  }
  const { programme, comparison } = plan.groups;
  const unequal = programme.poolSize !== comparison.poolSize;
  return (
    `Per group counts people analysed in each group, the same number in both${unequal ? ` (not your pools of ${programme.poolSize} and ${comparison.poolSize})` : ''}. ` +
    `For the matched difference it counts matched programme members, with ${partners}.`
  );
}
