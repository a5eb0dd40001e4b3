import { formatNumber } from './inputChecks';

/** Fewest matched programme members for which the matched difference has an SE and a t test (df = n − 1 ≥ 1). */
export const MIN_MATCHED_PROGRAMME = 2;

/**
 * Whether the matched post-test difference can be analysed at all: it needs
 * at least 2 matched programme members (a mean difference with an SE and
 * n − 1 ≥ 1 degrees of freedom). Returns null when it can, otherwise a
 * plain-English reason that says what to change.
 *
 * Reference: common practice (a paired-difference t test needs n ≥ 2).
 *
 * @param matchedProgramme expected number of matched programme members (programme pool × expected
 *   matched share; ≥ 0; NaN counts as none).
 * @param programmePool programme pool size (≥ 1).
 * @param matching whether partners may be reused, and the ratio k of partners per programme member (≥ 1).
 * @returns null when feasible; otherwise the reason (one or two sentences).
 * @throws never.
 * @example matchedDifferenceFeasibility(0.3, 200, { replacement: false, ratio: 1 })
 *   // "About 0.3 of the 200 programme members are expected to find a comparison partner within the caliper … Widen the caliper, …"
 */
export function matchedDifferenceFeasibility(
  matchedProgramme: number,
  programmePool: number,
  matching: { replacement: boolean; ratio: number },
): string | null {
  if (matchedProgramme >= MIN_MATCHED_PROGRAMME) return null;
  const expected = Number.isFinite(matchedProgramme) && matchedProgramme > 0 ? matchedProgramme : 0;
  const shown =
    expected === 0 ? 'None' : expected < 0.05 ? 'Almost none' : expected >= 1.95 ? 'Fewer than 2' : `About ${expected.toFixed(1)}`;
  const fixes = [
    'widen the caliper',
    'enlarge the comparison pool',
    'recruit a comparison group closer to the programme group on the pretest',
    ...(matching.replacement ? [] : ['allow a comparison member to be reused (matching with replacement)']),
    ...(matching.ratio > 1 ? ['ask for fewer partners per programme member'] : []),
  ];
  const list = fixes.length > 1 ? `${fixes.slice(0, -1).join(', ')} or ${fixes[fixes.length - 1]}` : fixes[0];
  return (
    `${shown} of the ${formatNumber(programmePool)} programme members ${expected === 1 ? 'is' : 'are'} expected to find ` +
    `a comparison partner within the caliper, and a matched comparison needs at least ${MIN_MATCHED_PROGRAMME}. ` +
    `No power, false-positive rate or required sample size can be given for it. To make it possible, ${list}.`
  );
}
