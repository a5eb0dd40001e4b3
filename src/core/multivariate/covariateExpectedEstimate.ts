import type { MatchingDistance, TwoGroupAnalysisId } from '../plan';
import type { CovariateModel } from './covariateModel';
import { covariateAncovaEstimate } from './covariateAncovaEstimate';
import { covariateCorrectedAncovaEstimate } from './covariateCorrectedAncovaEstimate';
import { covariateGainScoreEstimate } from './covariateGainScoreEstimate';
import { covariateMatchedEstimate } from './covariateMatchedEstimate';

/**
 * Expected estimate of tau for any of the four analyses under the covariate
 * model: the matched difference for the plan's matching distance, ANCOVA and
 * the corrected ANCOVA on all measured variables, and the gain score
 * (dispatches to the functions named in the reference).
 *
 * Reference: covariateMatchedEstimate, covariateAncovaEstimate,
 * covariateGainScoreEstimate, covariateCorrectedAncovaEstimate (computed; Thorndike
 * 1942, Lord 1960, Porter 1967 in one variable).
 *
 * @param id analysis. @param cm covariate model. @param distance matching distance.
 * @param assumedReliability rho' for the pretest in the corrected ANCOVA, in (0, 1].
 * @returns expected estimate, posttest points.
 * @throws Error when assumedReliability is out of range or unusable (see covariateCorrectedAncovaEstimate).
 * @example covariateExpectedEstimate('gainScore', cm, 'pretest', 0.8) === covariateGainScoreEstimate(cm)
 */
export function covariateExpectedEstimate(
  id: TwoGroupAnalysisId,
  cm: CovariateModel,
  distance: MatchingDistance,
  assumedReliability: number,
): number {
  switch (id) {
    case 'matchedDifference':
      return covariateMatchedEstimate(cm, distance);
    case 'ancova':
      return covariateAncovaEstimate(cm);
    case 'gainScore':
      return covariateGainScoreEstimate(cm);
    case 'correctedAncova':
      return covariateCorrectedAncovaEstimate(cm, assumedReliability);
  }
}
