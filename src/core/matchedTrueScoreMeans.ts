import type { ModelParameters } from './modelParameters';
import { kelleyTrueScore } from './kelleyTrueScore';
import { requireFinite } from './inputChecks';

/** Expected true-score means of matched members, per group, test points. */
export interface MatchedTrueScoreMeans {
  /** Mean observed pretest of the matched members of each group (the input, or the exact-matching default). */
  observed: { programme: number; comparison: number };
  /** Expected mean true score of those members: pulled back toward their own group's mean. */
  trueScore: { programme: number; comparison: number };
  /** Programme minus comparison expected true-score mean: the hidden imbalance after matching. */
  hiddenGap: number;
}

/**
 * Expected true-score means of matched members: within each group the
 * regression of true on observed score is linear, E[T | X = x] = mu_g + rho_g (x - mu_g)
 * (Kelley 1947), and it is linear, so the mean true score of members whose
 * mean observed score is x̄ is mu_g + rho_g (x̄ - mu_g). Matched members share
 * (about) the same observed mean, yet their true means are pulled back toward
 * their own groups' means (Thorndike 1942; Campbell & Erlebacher 1970).
 *
 * @param model model parameters (deriveModelParameters).
 * @param matchedObserved mean observed pretest of the matched members of each
 *   group, test points. Default: exact matching from an unlimited comparison
 *   pool, where every programme member is matched and both matched groups
 *   have the programme's mean.
 * @returns observed means, expected true-score means and their gap, test points.
 * @throws Error when a mean is not finite or a reliability is outside (0, 1].
 * @example
 *   // mu_P 44, mu_C 54, within-group reliabilities .75, exact matching:
 *   // programme true mean 44; comparison 54 + .75 (44 - 54) = 46.5; hidden gap -2.5.
 */
export function matchedTrueScoreMeans(
  model: ModelParameters,
  matchedObserved?: { programme: number; comparison: number },
): MatchedTrueScoreMeans {
  const obs = matchedObserved ?? { programme: model.mean.programme, comparison: model.mean.programme };
  requireFinite(obs.programme, "The matched programme members' mean pretest");
  requireFinite(obs.comparison, "The matched comparison members' mean pretest");
  const tP = kelleyTrueScore(obs.programme, model.reliability.programme, model.mean.programme);
  const tC = kelleyTrueScore(obs.comparison, model.reliability.comparison, model.mean.comparison);
  return { observed: { ...obs }, trueScore: { programme: tP, comparison: tC }, hiddenGap: tP - tC };
}
