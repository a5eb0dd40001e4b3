import type { AnalysisId } from '../plan';
import type { ClusterModel } from './clusterModel';

/**
 * The artefact of one analysis in a clusters design (the expected estimate
 * minus tau and the growth gap), posttest points, with Delta the groups'
 * true pretest gap and beta the outcome's slope on the true pretest:
 * - matchedDifference, clusters matched exactly on their observed means from
 *   an unlimited pool: beta(1 − λ_C)Delta — Thorndike's (1942) matched-groups
 *   artefact at cluster level, λ_C the comparison group's cluster-mean
 *   reliability (Kelley 1947 regression of the cluster's true mean on its
 *   observed mean); people matched on their own pretests: beta(1 − rho_C)Delta
 *   with rho_C the people's within-group reliability (the one-level formula);
 * - ancova on cluster means (Lord 1960 at cluster level): beta(1 − λ_pooled)Delta;
 * - gainScore on cluster means: (beta − 1)Delta (no reliability involved);
 * - personLevelAncova: with the same people, on each person's own pretest,
 *   beta(1 − rho_pooled)Delta; with a new cohort, on the cluster's pretest
 *   mean (the only pretest the posttest takers have), beta(1 − λ_pooled)Delta.
 * Reference: Thorndike (1942); Lord (1960); Campbell & Erlebacher (1970), applied to cluster means.
 * @param id an analysis of the clusters design. @param cm the clusters model.
 * @returns the artefact, posttest points.
 * @throws Error for an analysis the clusters design does not have.
 * @example gap −8, beta 1, n 25, ICC .2, new cohort (λ .8621): matchedDifference −1.103
 */
export function clusterArtefact(id: AnalysisId, cm: ClusterModel): number {
  const { beta, pretestGap: gap, reliability } = cm.person;
  switch (id) {
    case 'matchedDifference':
      return cm.design.level === 'clusters'
        ? beta * (1 - cm.comparison.clusterMeanReliability) * gap
        : beta * (1 - reliability.comparison) * gap;
    case 'ancova':
      return beta * (1 - cm.pooledClusterMeanReliability) * gap;
    case 'gainScore':
      return (beta - 1) * gap;
    case 'personLevelAncova':
      return cm.design.cohort === 'same' ? beta * (1 - reliability.pooled) * gap : beta * (1 - cm.pooledClusterMeanReliability) * gap;
    default:
      throw new Error(`The clusters design has no ${id} analysis.`);
  }
}

/**
 * Expected estimate of one analysis in a clusters design: tau + growth gap + clusterArtefact.
 * @example tau 0, growth 0, gap −8, beta 1, same people (λ .9655): matchedDifference −0.276
 */
export function clusterExpectedEstimate(id: AnalysisId, cm: ClusterModel): number {
  return cm.person.effect + cm.person.growthGap + clusterArtefact(id, cm);
}
