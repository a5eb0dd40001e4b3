import type { AnalysisId } from '../plan';
import { requireReliability } from '../inputChecks';
import { SEL_OUTCOME, SEL_PRETEST, type SelectionModel } from './selectionModel';
import { selectionMatchedFigures } from './selectionMatching';

/*
 * Closed-form expected estimates of every analysis in a selection design,
 * from the two groups' moments (selectionModel). Notation: tau = the effect,
 * delta = outcome.growthGap (two groups: added to the programme's outcome;
 * one group: the growth the whole population shows without the programme),
 * ΔV = programme minus comparison mean of V, Y0 = the posttest without the
 * programme. All in posttest points (the posttest is on the pretest's scale).
 */

/** Programme minus comparison mean of variable `index` (SEL_PRETEST, SEL_TRUE, SEL_OUTCOME, SEL_SCREENER). */
export function selectionGroupGap(m: SelectionModel, index: number): number {
  return (m.programme.mean[index] as number) - (m.comparison.mean[index] as number);
}

/**
 * Pooled within-group slope of the outcome on variable `index`, the
 * probability limit of the OLS slope in a regression of Y on group and that
 * variable: b = Σ n_g cov_g(V, Y0) / Σ n_g var_g(V) (common practice).
 * @example selection on the pretest, population slope of Y0 on X 0.7 → 0.7 (selection on X leaves E[Y0 | X] linear with the same slope)
 */
export function pooledWithinSlope(m: SelectionModel, index: number): number {
  const groups = [m.programme, m.comparison];
  let sxy = 0;
  let sxx = 0;
  for (const g of groups) {
    sxy += g.n * ((g.cov[index] as number[])[SEL_OUTCOME] as number);
    sxx += g.n * ((g.cov[index] as number[])[index] as number);
  }
  return sxy / sxx;
}

/**
 * A regression-discontinuity estimator: how its expected estimate and its
 * precision follow from the selection model. Pluggable, so a local-linear
 * fit within a bandwidth can be added beside the global linear one.
 */
export interface RegressionDiscontinuityEstimator {
  id: 'global-linear';
  /** Plain words for reports. */
  description: string;
  /** Expected estimate minus tau minus the growth gap, posttest points. */
  expectedArtefact(m: SelectionModel): number;
  /**
   * SE and df when the population holds `population` people (the rule's
   * split kept), and the variance inflation against a randomised design of
   * the same size and split.
   */
  precision(m: SelectionModel, population: number): { se: number; df: number; varianceInflation: number };
}

/**
 * Regression discontinuity as OLS of the posttest on group and the score the
 * rule used (pretest or screener), one common straight line (Thistlethwaite &
 * Campbell 1960; Goldberger 1972; Cappelleri, Darlington & Trochim 1994).
 *
 * Expected estimate: tau + delta + ΔY0 − b_B ΔB with b_B the pooled
 * within-group slope on B. Y0 and B are jointly normal in the population and
 * the rule looks only at B (and an independent ε), so E[Y0 | B, group] is the
 * same straight line in both groups: the artefact is 0 whatever the rule.
 *
 * Variance (OLS with homoskedastic errors, exact here because
 * Var(Y0 | B, group) = Var(Y0 | B) = σ²_e): σ²_e / (N p(1 − p)(1 − ρ²_ZB)),
 * with p the programme's share, ρ_ZB the population correlation of the group
 * indicator Z with B (ρ²_ZB = p (E[B | programme] − μ)² / ((1 − p) var B)),
 * df N − 3. The variance inflation against a randomised design of the same
 * size and split is 1 / (1 − ρ²_ZB): 1/(1 − 2/π) = 2.75 for a cut-off at the
 * mean of a normal score (Goldberger 1972, from memory).
 */
export const globalLinearDiscontinuity: RegressionDiscontinuityEstimator = {
  id: 'global-linear',
  description: 'one straight line in the selection score, common to both groups (ordinary least squares)',
  expectedArtefact(m) {
    const b = m.basisIndex;
    return selectionGroupGap(m, SEL_OUTCOME) - pooledWithinSlope(m, b) * selectionGroupGap(m, b);
  },
  precision(m, population) {
    const b = m.basisIndex;
    const S = m.populationCov;
    const varB = (S[b] as number[])[b] as number;
    const cYB = (S[SEL_OUTCOME] as number[])[b] as number;
    const residual = Math.max(0, ((S[SEL_OUTCOME] as number[])[SEL_OUTCOME] as number) - (cYB * cYB) / varB);
    const p = m.programme.share;
    const shift = (m.programme.mean[b] as number) - m.population.mean;
    const rho2 = Math.min(1 - 1e-15, (p * shift * shift) / ((1 - p) * varB));
    const varianceInflation = 1 / (1 - rho2);
    const se = Math.sqrt((residual * varianceInflation) / (population * p * (1 - p)));
    return { se, df: Math.max(1, population - 3), varianceInflation };
  },
};

/**
 * The expected estimate of one analysis in a selection design:
 * - gainScore: tau + delta + ΔY0 − ΔX;
 * - ancova: tau + delta + ΔY0 − b ΔX, b the pooled within-group slope on the pretest (Lord 1960);
 * - correctedAncova: tau + delta + ΔY0 − (b/ρ′) ΔX (Porter 1967), ρ′ the assumed reliability;
 * - regressionDiscontinuity: tau + delta + the estimator's artefact (0 for the global linear fit);
 * - matchedDifference: tau + delta + the artefact of exact matching on the pretest
 *   (selectionMatchedFigures; for a sharp cut on the pretest, where there is no
 *   overlap, the limit of a probability rule: tau + delta);
 * - prePostChange (one group): tau + growth + E[Y0 − X | selected] (Barnett, van der Pols & Dobson 2005, eq. 1
 *   for a cut on the pretest: σ(1 − r)φ(z)/Φ(z) with equal SDs).
 *
 * @param id analysis. @param m the selection model. @param effects tau and the growth (outcome.growthGap), points.
 * @param assumedReliability ρ′ in (0, 1] (corrected ANCOVA only).
 * @param rd the regression-discontinuity estimator (default the global linear fit).
 * @returns expected estimate, posttest points.
 * @throws Error when ρ′ is out of range.
 * @example population mean 50, SD 10, reliability .8, r .7, lowest fifth on the pretest, tau 0:
 *   ancova 0.00, gainScore +5.25
 */
export function selectionExpectedEstimate(
  id: AnalysisId,
  m: SelectionModel,
  effects: { tau: number; growth: number },
  assumedReliability: number,
  rd: RegressionDiscontinuityEstimator = globalLinearDiscontinuity,
): number {
  return effects.tau + effects.growth + selectionArtefact(id, m, assumedReliability, rd);
}

/** The expected estimate minus tau and the growth gap: the part due to how the groups were formed. */
export function selectionArtefact(
  id: AnalysisId,
  m: SelectionModel,
  assumedReliability: number,
  rd: RegressionDiscontinuityEstimator = globalLinearDiscontinuity,
): number {
  const dY = selectionGroupGap(m, SEL_OUTCOME);
  const dX = selectionGroupGap(m, SEL_PRETEST);
  switch (id) {
    case 'gainScore':
      return dY - dX;
    case 'ancova':
      return dY - pooledWithinSlope(m, SEL_PRETEST) * dX;
    case 'correctedAncova': {
      const rho = requireReliability(assumedReliability, 'The assumed reliability for the corrected ANCOVA');
      return dY - (pooledWithinSlope(m, SEL_PRETEST) / rho) * dX;
    }
    case 'regressionDiscontinuity':
      return rd.expectedArtefact(m);
    case 'matchedDifference':
      return selectionMatchedFigures(m).artefact;
    case 'prePostChange':
      return (m.programme.mean[SEL_OUTCOME] as number) - (m.programme.mean[SEL_PRETEST] as number);
    case 'personLevelAncova':
      throw new Error('The person-level ANCOVA belongs to clustered designs, not to a selection rule.');
  }
}
