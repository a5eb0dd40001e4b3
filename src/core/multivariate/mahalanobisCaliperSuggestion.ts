import type { ModelParameters } from '../modelParameters';
import type { MatchingSpec } from '../plan';
import type { CovariateModel } from './covariateModel';
import { covariateMatchedShare } from './covariateMatchedShare';

/** A Mahalanobis caliper to replace a number first chosen in SDs of the pretest. */
export interface CaliperSuggestion {
  /** The suggested caliper, Mahalanobis-distance units, rounded to 2 decimals (≥ 0.01). */
  value: number;
  /** Expected share of the programme pool matched with it (approximate, covariateMatchedShare). */
  matchedShare: number;
  /** One or two plain sentences: the unit changed, and what the suggestion keeps. */
  note: string;
}

/**
 * When matching switches from the pretest to the Mahalanobis distance, the
 * caliper's number stays but its unit changes (from SDs of the pretest to
 * Mahalanobis-distance units on all measured covariates). This suggests the
 * Mahalanobis caliper that keeps about the same expected share of the
 * programme pool matched as `caliper` did in pretest SDs (bisection on the
 * approximate matched share, which grows with the caliper).
 *
 * Reference: Rubin (1980) and Rosenbaum & Rubin (1985) on Mahalanobis metric
 * matching within calipers; caliper units as Cochran & Rubin (1973).
 * @param cm the covariate model. @param m model parameters. @param matching the plan's matching (its caliper read as pretest SDs).
 * @returns the suggestion.
 * @throws Error when the caliper or ratio is out of range (covariateMatchedShare).
 * @example demo with caliper 0.2 → a Mahalanobis caliper near 0.2 (one measured variable: the same share)
 */
export function mahalanobisCaliperSuggestion(cm: CovariateModel, m: ModelParameters, matching: MatchingSpec): CaliperSuggestion {
  const target = covariateMatchedShare(cm, m, matching, 'pretest');
  const shareAt = (c: number): number => covariateMatchedShare(cm, m, { ...matching, caliper: c }, 'mahalanobis');
  let lo = 0.001;
  let hi = 20;
  if (shareAt(hi) <= target) lo = hi;
  else {
    for (let i = 0; i < 60 && hi - lo > 1e-4; i++) {
      const mid = (lo + hi) / 2;
      if (shareAt(mid) < target) lo = mid;
      else hi = mid;
    }
  }
  const value = Math.max(0.01, Math.round(hi * 100) / 100);
  const matchedShare = shareAt(value);
  const pct = (x: number): string => `${Math.round(x * 100)}%`;
  const note =
    `With Mahalanobis matching the caliper is a Mahalanobis distance on all measured variables, no longer SDs of the pretest: ` +
    `the same number means something else. A caliper of ${value.toFixed(2)} keeps about the same share of the programme pool matched ` +
    `(about ${pct(matchedShare)}) as ${matching.caliper} pretest SDs did (about ${pct(target)}).`;
  return { value, matchedShare, note };
}
