/** How many problems are listed before the rest are summed up in one line (common practice: a screenful). */
export const PROBLEMS_SHOWN = 50;

/**
 * A long list of problems cut to its first `max` items, with one closing line
 * that says how many more there are, so a file with 50,000 bad entries gives
 * a readable screenful rather than 100,000 lines. The CLI and the planner's
 * notices use it wherever a list of problems is printed or shown.
 *
 * Reference: common practice (compilers and linters stop listing after a cap).
 *
 * @param lines the problem messages, in order.
 * @param max how many to list (default PROBLEMS_SHOWN = 50); a whole number ≥ 1.
 * @returns the first `max` lines, then — only when some were left out — a
 *   line "…and N more problems of the same kind; fix those above and check again."
 * @throws never.
 * @example capProblemList(['a', 'b', 'c'], 2) // ['a', 'b', '…and 1 more problem of the same kind; fix those above and check again.']
 */
export function capProblemList(lines: readonly string[], max: number = PROBLEMS_SHOWN): string[] {
  const keep = Math.max(1, Math.floor(max));
  if (lines.length <= keep) return [...lines];
  return [...lines.slice(0, keep), moreProblemsLine(lines.length - keep)];
}

/**
 * The closing line of a cut list of problems (capProblemList; the planner's
 * form summary uses it too).
 * @param more how many problems were left out (≥ 1).
 * @returns e.g. "…and 49,950 more problems of the same kind; fix those above and check again."
 * @throws never.
 * @example moreProblemsLine(1) // "…and 1 more problem of the same kind; fix those above and check again."
 */
export function moreProblemsLine(more: number): string {
  return `…and ${more.toLocaleString('en-GB')} more problem${more === 1 ? '' : 's'} of the same kind; fix those above and check again.`;
}
