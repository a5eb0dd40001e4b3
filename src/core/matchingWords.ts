import type { MatchingMethod, MatchingOrder } from './plan';

/**
 * The matching options in Meanward's own plain English, for the planner's
 * form, the PDF and anything else that shows them. The plan file keeps its
 * version-1 values ("nearest", "lowest-first", ...); only the words shown to
 * people live here. The trade's terms (caliper, ratio, with replacement) are
 * kept where a reader needs them to look a method up.
 */
export const MATCHING_WORDS = {
  /** The question the method answers, for a partner (person) or a partner cluster. */
  methodQuestion: (clusters: boolean): string => (clusters ? 'How a partner cluster is chosen' : 'How a partner is chosen'),
  /** Each method, when the distance is the pretest and when it is another distance. */
  method: {
    pretest: { nearest: 'The closest pretest score', 'random-within-caliper': 'Any one within the caliper, at random' },
    distance: { nearest: 'The closest on the chosen distance', 'random-within-caliper': 'Any one within the caliper, at random' },
  } satisfies Record<'pretest' | 'distance', Record<MatchingMethod, string>>,
  orderQuestion: 'Who picks first',
  order: {
    random: 'Anyone: a random order',
    'lowest-first': 'Those with the lowest pretest',
    'highest-first': 'Those with the highest pretest',
  } satisfies Record<MatchingOrder, string>,
  /** The with-replacement question, for people or clusters. */
  replacementQuestion: (clusters: boolean): string =>
    clusters ? 'May a comparison cluster be used more than once?' : 'May a comparison person be used more than once?',
  /** The ratio's label, for a programme member or a programme cluster. */
  ratioLabel: (clusters: boolean): string => `Ratio: comparison partners for each programme ${clusters ? 'cluster' : 'member'}`,
} as const;

/** Options for a choice field, in the order shown, from one of MATCHING_WORDS' maps. */
export function matchingChoices<T extends string>(words: Record<T, string>): { value: T; label: string }[] {
  return (Object.keys(words) as T[]).map((value) => ({ value, label: words[value] }));
}
