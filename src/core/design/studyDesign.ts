import type { AnalysisId, AssignmentBasis, ClusterCohort, MatchingLevel, Plan, SelectionSide, StudyShape } from '../plan';
import { TWO_GROUP_ANALYSIS_IDS } from '../plan';

/**
 * THE DESIGN SEAM. A design says how people are drawn and assigned, and so
 * which pools exist and which analyses apply. Every part of Meanward asks
 * this module, never the plan's fields directly:
 *  - 'existing-groups': two populations that already differ (the original
 *    model; with or without covariates);
 *  - 'selection': one population, a rule (cut-off or probability) on a basis
 *    (observed pretest, a separate screener, or the true score) decides who
 *    is in the programme; shape 'two-groups' compares the selected with the
 *    rest, 'one-group' re-measures the selected only.
 *  - 'clusters': two existing groups whose people sit in clusters (schools,
 *    classes, clinics); clusters or people are matched, and the analyses work
 *    on cluster means or at person level with cluster-robust SEs.
 * Adding a design means: a case in
 * StudyDesign and studyDesign(), its analyses in designAnalysisIds, its
 * closed forms behind analysePlan's dispatch (src/core/analysePlan.ts) and
 * its pool drawer behind the engine's (src/sim/multivariate/createPlanSimulation.ts).
 */
export type StudyDesign = ExistingGroupsDesign | SelectionDesign | ClustersDesign;

export interface ExistingGroupsDesign {
  kind: 'existing-groups';
  shape: 'two-groups';
}

export interface SelectionDesign {
  kind: 'selection';
  shape: StudyShape;
  rule: 'cut-off' | 'probability';
  basis: AssignmentBasis;
  cutOff: number;
  side: SelectionSide;
  /** 0 for a sharp cut-off; the probit spread for 'probability'. */
  spread: number;
  /** The screener's reliability (basis 'screener'); null otherwise. */
  screenerReliability: number | null;
}

/**
 * Two existing groups made of whole clusters. Sizes are kept per group (and
 * the code reads them per group) so that unequal cluster sizes can come later;
 * today every cluster in a plan has `clusters.size` people.
 */
export interface ClustersDesign {
  kind: 'clusters';
  shape: 'two-groups';
  /** People tested per cluster, per group. */
  clusterSize: { programme: number; comparison: number };
  /** Clusters in each pool (poolSize / clusterSize). */
  clusterCount: { programme: number; comparison: number };
  /** ICC of the observed pretest within a group. */
  pretestICC: number;
  /** ICC of the observed posttest within the comparison group (default pretestICC). */
  posttestICC: number;
  cohort: ClusterCohort;
  /** What matching pairs up (default 'people'). */
  level: MatchingLevel;
}

/**
 * The plan's design, with defaults filled in.
 * Reference: none (plan reading). @param plan a validated plan.
 * @returns the design. @throws Error when a selection rule lacks a field validation requires.
 * @example studyDesign(demoPlan()).kind // 'existing-groups'
 */
export function studyDesign(plan: Plan): StudyDesign {
  const a = plan.assignment;
  const shape = plan.design ?? 'two-groups';
  const c = plan.clusters;
  if (c !== undefined && (a === undefined || a.rule === 'existing-groups') && shape === 'two-groups') {
    const size = { programme: c.size, comparison: c.size };
    return {
      kind: 'clusters',
      shape: 'two-groups',
      clusterSize: size,
      clusterCount: {
        programme: Math.floor(plan.groups.programme.poolSize / size.programme),
        comparison: Math.floor(plan.groups.comparison.poolSize / size.comparison),
      },
      pretestICC: c.pretestICC,
      posttestICC: c.posttestICC ?? c.pretestICC,
      cohort: c.cohort,
      level: plan.matching.level ?? 'people',
    };
  }
  if ((a === undefined || a.rule === 'existing-groups') && shape === 'two-groups') return { kind: 'existing-groups', shape: 'two-groups' };
  if (a === undefined || a.rule === 'existing-groups' || a.basis === undefined || a.cutOff === undefined || a.side === undefined) {
    throw new Error('A one-group study or a selection rule needs assignment.rule ("cut-off" or "probability"), basis, cutOff and side.');
  }
  return {
    kind: 'selection',
    shape,
    rule: a.rule,
    basis: a.basis,
    cutOff: a.cutOff,
    side: a.side,
    spread: a.rule === 'probability' ? (a.spread ?? 0) : 0,
    screenerReliability: a.basis === 'screener' ? (a.screenerReliability ?? null) : null,
  };
}

/** Whether the plan forms its groups by a selection rule (or is a one-group study). */
export function isSelectionDesign(plan: Plan): boolean {
  return studyDesign(plan).kind === 'selection';
}

/** Whether the plan's people sit in clusters (the clusters design). */
export function isClusterDesign(plan: Plan): boolean {
  return studyDesign(plan).kind === 'clusters';
}

/** The analyses of a clusters design, in display order. */
export const CLUSTER_ANALYSIS_IDS = ['matchedDifference', 'ancova', 'gainScore', 'personLevelAncova'] as const;

/**
 * The analyses a design has, in display order: the four two-group analyses
 * for existing groups; for clusters the matched difference (of cluster
 * means, or of people), ANCOVA and the gain score on cluster means, and the
 * person-level ANCOVA with cluster-robust SEs; the same plus regressionDiscontinuity for a rule on
 * an observed basis (pretest or screener); prePostChange alone for a one-group study.
 * @example designAnalysisIds(demoPlan()) // ['matchedDifference', 'ancova', 'gainScore', 'correctedAncova']
 */
export function designAnalysisIds(plan: Plan): AnalysisId[] {
  const d = studyDesign(plan);
  if (d.kind === 'existing-groups') return [...TWO_GROUP_ANALYSIS_IDS];
  if (d.kind === 'clusters') return [...CLUSTER_ANALYSIS_IDS];
  if (d.shape === 'one-group') return ['prePostChange'];
  return d.basis === 'true-score' ? [...TWO_GROUP_ANALYSIS_IDS] : [...TWO_GROUP_ANALYSIS_IDS, 'regressionDiscontinuity'];
}

/**
 * The analysis the verdict leads with: the pre–post change in a one-group
 * study, the matched difference otherwise (the procedure researchers most
 * often plan when they cannot randomise).
 */
export function headlineAnalysisId(plan: Plan): AnalysisId {
  return studyDesign(plan).shape === 'one-group' ? 'prePostChange' : 'matchedDifference';
}
