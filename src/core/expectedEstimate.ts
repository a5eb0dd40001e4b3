import type { TwoGroupAnalysisId } from './plan';
import type { ModelParameters } from './modelParameters';
import { requireReliability } from './inputChecks';

/*
 * Closed-form expected estimates of the programme effect tau, per analysis,
 * under the model in modelParameters.ts (normal scores, infinite pools, exact
 * matching). Notation: tau = m.effect, delta = m.growthGap, Delta = m.pretestGap,
 * beta = m.beta. All results are in posttest points.
 */

/**
 * Expected matched post-test difference when each programme member is matched
 * exactly on the observed pretest X from an unlimited comparison pool:
 * tau + delta + beta(1 − rho_C)·Delta.
 *
 * Derivation: within group g, E[T | X = x] = mu_g + rho_g(x − mu_g) (Kelley 1947).
 * The programme–comparison difference at x is tau + delta + beta[mu_P − mu_C +
 * rho_P(x − mu_P) − rho_C(x − mu_C)]; averaged over the programme's X (mean mu_P)
 * it is tau + delta + beta(1 − rho_C)Delta. With equal reliabilities this is the
 * matched-groups regression effect of Thorndike (1942) and Campbell & Erlebacher (1970).
 *
 * @param m model parameters (see deriveModelParameters).
 * @returns expected estimate, posttest points.
 * @throws never for valid model parameters.
 * @example gap 15, rho_C .9, beta 1, tau 0 → 1.5 (REFERENCES.md, computed)
 */
export function matchedDifferenceEstimate(m: ModelParameters): number {
  return m.effect + m.growthGap + m.beta * (1 - m.reliability.comparison) * m.pretestGap;
}

/**
 * Expected ANCOVA estimate on the fallible observed pretest, full sample,
 * pooled within-group slope b = beta·rho_pooled: tau + delta + beta(1 − rho_pooled)·Delta.
 *
 * Reference: Lord, F. M. (1960). Large-sample covariance analysis when the
 * control variable is fallible. JASA, 55, 307–321.
 *
 * @param m model parameters; rho_pooled = m.reliability.pooled.
 * @returns expected estimate, posttest points.
 * @throws never for valid model parameters.
 * @example gap −10, rho .75, beta 0.8, tau 2.5 → 2.5 − 2 = 0.5
 */
export function ancovaEstimate(m: ModelParameters): number {
  return m.effect + m.growthGap + m.beta * (1 - m.reliability.pooled) * m.pretestGap;
}

/**
 * Expected gain-score (change score, Y − X) estimate: tau + delta + (beta − 1)·Delta.
 * Unbiased when growth is parallel (delta = 0) and beta = 1.
 *
 * Reference: computed from the model (REFERENCES.md); Lord (1967) on the paradox
 * between gain scores and ANCOVA.
 *
 * @param m model parameters.
 * @returns expected estimate, posttest points.
 * @throws never for valid model parameters.
 * @example gap −10, beta 0.8, tau 2.5 → 2.5 + 2 = 4.5
 */
export function gainScoreEstimate(m: ModelParameters): number {
  return m.effect + m.growthGap + (m.beta - 1) * m.pretestGap;
}

/**
 * Expected reliability-corrected ANCOVA estimate (the pooled within-group
 * slope divided by an assumed reliability rho'): tau + delta + beta(1 − rho_pooled/rho')·Delta.
 * Unbiased (apart from delta) when rho' equals the true pooled within-group reliability.
 *
 * Reference: Porter, A. C. (1967). The effects of using fallible variables in the
 * analysis of covariance (doctoral dissertation, University of Wisconsin), from memory.
 *
 * @param m model parameters.
 * @param assumedReliability rho', in (0, 1].
 * @returns expected estimate, posttest points.
 * @throws Error when assumedReliability is outside (0, 1].
 * @example rho' = rho_pooled, delta = 0 → tau exactly
 */
export function correctedAncovaEstimate(m: ModelParameters, assumedReliability: number): number {
  requireReliability(assumedReliability, 'The assumed reliability for the corrected ANCOVA');
  return m.effect + m.growthGap + m.beta * (1 - m.reliability.pooled / assumedReliability) * m.pretestGap;
}

/**
 * Expected estimate for any of the four analyses (dispatches to the functions above).
 * @param id analysis id. @param m model parameters. @param assumedReliability rho' in (0, 1] (corrected ANCOVA only).
 * @returns expected estimate, posttest points.
 * @throws Error when assumedReliability is out of range.
 * @example expectedEstimate('gainScore', m, 0.8) === gainScoreEstimate(m)
 */
export function expectedEstimate(id: TwoGroupAnalysisId, m: ModelParameters, assumedReliability: number): number {
  switch (id) {
    case 'matchedDifference':
      return matchedDifferenceEstimate(m);
    case 'ancova':
      return ancovaEstimate(m);
    case 'gainScore':
      return gainScoreEstimate(m);
    case 'correctedAncova':
      return correctedAncovaEstimate(m, assumedReliability);
  }
}
