import type { AnalyticAnalysis, AnalyticResults, BreakEven, ClusterSummary, DesignSummary } from '../analyticResults';
import type { AnalysisSettings } from '../analyseAnalysis';
import type { ModelParameters } from '../modelParameters';
import type { AnalysisId, AnalysisRecord, Plan } from '../plan';
import type { PlannedProcedureEstimates } from '../plannedProcedure';
import { ANALYSIS_DESCRIPTIONS } from '../analysisDescriptions';
import { analysisSettings } from '../analysisSettings';
import { analyticAnalysisRecord } from '../analyticAnalysisRecord';
import { assertFiniteOutput } from '../assertFiniteOutput';
import { breakEvenReliability } from '../breakEvenReliability';
import { expectedMatchedShare } from '../expectedMatchedShare';
import { formatNumber } from '../inputChecks';
import { requiredNPerGroup } from '../requiredNPerGroup';
import { withPlannedFigures } from '../withPlannedFigures';
import { designAnalysisIds } from '../design/studyDesign';
import { clusterArtefact, clusterExpectedEstimate } from './clusterEstimates';
import { clusterModel, type ClusterModel } from './clusterModel';
import { clusterRemedies } from './clusterRemedies';
import { clusterSizeForReliability } from './clusterSizeForReliability';
import { clusterStandardError } from './clusterStandardError';
import { designEffect } from './designEffect';
import { minimumDetectableEffect } from './minimumDetectableEffect';

/** Names of the clusters design's analyses (the shared descriptions name the one-level versions). */
export const CLUSTER_ANALYSIS_NAMES: Partial<Record<AnalysisId, { clusters: string; people?: string }>> = {
  matchedDifference: { clusters: 'Matched difference of cluster means', people: 'Matched post-test difference (people matched across clusters)' },
  ancova: { clusters: 'ANCOVA on cluster means' },
  gainScore: { clusters: 'Gain score on cluster means' },
  personLevelAncova: { clusters: 'Person-level ANCOVA with cluster-robust SEs' },
};

/** Why matching clusters is impossible when too few clusters find partners. */
export function clusterMatchingReason(matched: number, pool: number): string {
  return (
    `About ${matched.toFixed(1)} of the ${formatNumber(pool)} programme clusters are expected to find a comparison cluster within the caliper, and a matched comparison needs at least 2. ` +
    'Widen the caliper (it is in SDs of the cluster means), recruit more comparison clusters, or allow a comparison cluster to be reused.'
  );
}

/**
 * Everything the planner shows without simulation for a clusters design
 * (two existing groups made of whole clusters): per analysis the expected
 * estimate, bias, verdict, cluster-aware SE and df, power, error rates, the
 * clusters per group needed and the minimum detectable effect with the
 * artefact included; the cluster-mean reliability λ
 * (reliability.clusterMean, the comparison group's); the design effects; the
 * break-even λ and the people per cluster that reach it; ranked remedies.
 * analysePlan dispatches here when the plan has `clusters` (the design seam).
 *
 * Estimates: clusterArtefact (beta(1 − λ)Delta for matched clusters, Thorndike
 * 1942 at cluster level). SEs: clusterStandardError. Power: Cohen (1988) with
 * those SEs; clusters needed by the same search as requiredNPerGroup, over
 * clusters per group; MDE: Bloom (1995), Raudenbush (1997).
 *
 * @param plan a validated plan with a clusters section.
 * @param planned optional quick figures of the planned procedure (matched difference).
 * @returns AnalyticResults in which every number is finite.
 * @throws Error (ClusterModelError) when the ICCs contradict the other inputs.
 * @example n 25, ICC .2, reliability .8, SDs 15, gap −8, slope 1, new cohort, clusters matched:
 *   reliability.clusterMean 0.8621, analyses.matchedDifference.expectedEstimate −1.10 (tau 0)
 */
export function analyseClusterPlan(plan: Plan, planned?: PlannedProcedureEstimates): AnalyticResults {
  const cm = clusterModel(plan);
  const m = cm.person;
  const ids = designAnalysisIds(plan);
  const level = cm.design.level;
  const share = matchedShare(cm, plan);
  const unitsP = level === 'clusters' ? cm.programme.clusters : m.n.programme;
  const settings = analysisSettings(plan, unitsP * share);
  const formula = Object.fromEntries(ids.map((id) => [id, clusterAnalysis(id, cm, settings, share)])) as AnalysisRecord<AnalyticAnalysis>;
  // The quick simulation's figures replace the matched difference's record: its clusters needed and MDE
  // follow the planned procedure's estimate and bias, with the same cluster-aware SEs.
  const analyses = withClusterPlanning(withPlannedFigures(formula, planned, m.effect, m.posttestSD.comparison, settings), formula, cm, settings, share);
  const summary = clusterSummary(cm, plan.analysis.tolerableBiasShare);
  const results: AnalyticResults = {
    model: m,
    reliability: {
      programme: m.reliability.programme,
      comparison: m.reliability.comparison,
      sem: m.sem,
      clusterMean: cm.comparison.clusterMeanReliability,
    },
    tau: m.effect,
    analyses,
    breakEven: clusterBreakEven(cm, plan.analysis.tolerableBiasShare, summary.breakEvenClusterSize),
    remedies: clusterRemedies(cm, summary.breakEvenClusterSize),
    procedure: planned
      ? { basis: 'planned-procedure', replications: planned.replications, seed: planned.seed }
      : { basis: 'formula', replications: null, seed: null },
    design: clusterDesignSummary(cm),
    clusters: summary,
  };
  return assertFiniteOutput(results, 'results');
}

/**
 * The expected share of programme units (clusters, or people) that find
 * partners: expectedMatchedShare on the cluster means' distributions
 * (clusterMeansModel), or on the people's pretests.
 */
export function matchedShare(cm: ClusterModel, plan: Plan): number {
  return cm.design.level === 'clusters' ? expectedMatchedShare(clusterMeansModel(cm), plan.matching) : expectedMatchedShare(cm.person, plan.matching);
}

/**
 * The clusters as units: a one-level model whose "people" are the clusters'
 * observed pretest means (SD sqrt(var X̄)), true scores what those means
 * measure (reliability λ), and pools the cluster counts. Used for the matched
 * share and the caliper in SDs of the cluster means.
 * @example n 25, ICC .2, SD 15 → observedSD sqrt(52.2) = 7.22
 */
export function clusterMeansModel(cm: ClusterModel): ModelParameters {
  const m = cm.person;
  const P = cm.programme;
  const C = cm.comparison;
  const sd = (v: number) => Math.sqrt(v);
  return {
    ...m,
    observedSD: { programme: sd(P.clusterMeanVar), comparison: sd(C.clusterMeanVar) },
    trueSD: { programme: sd(P.clusterMeanReliability * P.clusterMeanVar), comparison: sd(C.clusterMeanReliability * C.clusterMeanVar) },
    sem: sd((1 - C.clusterMeanReliability) * C.clusterMeanVar),
    reliability: { programme: P.clusterMeanReliability, comparison: C.clusterMeanReliability, pooled: cm.pooledClusterMeanReliability },
    posttestSD: { programme: sd(P.outcomeMeanVar), comparison: sd(C.outcomeMeanVar) },
    n: { programme: P.clusters, comparison: C.clusters },
  };
}

/** One analysis' record in a clusters design. */
function clusterAnalysis(id: AnalysisId, cm: ClusterModel, s: AnalysisSettings, share: number): AnalyticAnalysis {
  const m = cm.person;
  const level = cm.design.level;
  const names = CLUSTER_ANALYSIS_NAMES[id];
  const name = (id === 'matchedDifference' && level === 'people' ? names?.people : names?.clusters) ?? ANALYSIS_DESCRIPTIONS[id].name;
  const assumption =
    id === 'personLevelAncova' || (id === 'matchedDifference' && level === 'people')
      ? ANALYSIS_DESCRIPTIONS[id].assumption
      : `${ANALYSIS_DESCRIPTIONS[id].assumption} Here the pretest is the cluster's observed mean, whose reliability λ counts both measurement error and which people were tested.`;
  const estimate = clusterExpectedEstimate(id, cm);
  const common = { id, name, assumption, estimate, tau: m.effect, posttestSD: m.posttestSD.comparison };
  const nP = cm.programme.size * cm.programme.clusters;
  const nC = cm.comparison.size * cm.comparison.clusters;
  if (id === 'matchedDifference') {
    const matchedUnits = s.matchedProgramme;
    const pool = level === 'clusters' ? cm.programme.clusters : nP;
    if (!(matchedUnits >= 2)) {
      const reason = level === 'clusters' ? clusterMatchingReason(matchedUnits, pool) : clusterMatchingReason(matchedUnits / cm.programme.size, cm.programme.clusters).replace('programme clusters', 'programme clusters\u2019 worth of people');
      const record = analyticAnalysisRecord({ ...common, precision: null, infeasibleReason: reason, nProgramme: Math.max(0, matchedUnits), nComparison: Math.max(0, matchedUnits) * s.ratio }, s);
      return { ...record, clustersPerGroupNeeded: null, minimumDetectableEffect: null };
    }
  }
  const options = { ratio: s.ratio, matchedShare: share };
  const now = clusterStandardError(id, cm, options);
  const design = (J: number) => clusterStandardError(id, cm, { ...options, clustersPerGroup: Math.max(2, J) });
  const matchedPeople = id === 'matchedDifference';
  const sizes = matchedPeople
    ? level === 'clusters'
      ? { nProgramme: s.matchedProgramme * cm.programme.size, nComparison: s.matchedProgramme * s.ratio * cm.comparison.size }
      : { nProgramme: s.matchedProgramme, nComparison: s.matchedProgramme * s.ratio }
    : { nProgramme: nP, nComparison: nC };
  const record = analyticAnalysisRecord({ ...common, precision: { se: now.se, df: now.df, design }, infeasibleReason: null, ...sizes }, s);
  return clusterPlanningFigures(id, record, cm, s, share);
}

/**
 * An analysis record with the clusters design's planning figures: clusters
 * per group for the target power (the same search as requiredNPerGroup, over
 * clusters, for the record's expected estimate), the people that makes, the
 * minimum detectable effect with the record's bias (Bloom 1995) and, for the
 * person-level analysis, the naive SE. An infeasible record gets nulls.
 */
function clusterPlanningFigures(id: AnalysisId, record: AnalyticAnalysis, cm: ClusterModel, s: AnalysisSettings, share: number): AnalyticAnalysis {
  if (!record.feasible) return { ...record, clustersPerGroupNeeded: null, minimumDetectableEffect: null };
  const biased = !record.tolerability.artefactWithinShare;
  const m = cm.person;
  const options = { ratio: s.ratio, matchedShare: share };
  const now = clusterStandardError(id, cm, options);
  const design = (J: number) => clusterStandardError(id, cm, { ...options, clustersPerGroup: Math.max(2, J) });
  // Only for analyses whose regression artefact is tolerable (as analyticAnalysisRecord).
  const clustersNeeded = biased ? null : requiredNPerGroup(record.expectedEstimate, m.effect, design, s.alpha, s.targetPower);
  const direction: 1 | -1 = m.effect < 0 ? -1 : 1;
  const out: AnalyticAnalysis = {
    ...record,
    requiredNPerGroup: clustersNeeded === null ? null : clustersNeeded * cm.comparison.size,
    clustersPerGroupNeeded: clustersNeeded,
    minimumDetectableEffect: minimumDetectableEffect(now.se, now.df, record.bias, s.alpha, s.targetPower, direction),
  };
  if (now.naiveSE !== undefined) out.naiveSE = now.naiveSE;
  return out;
}

/** The records after the quick simulation's figures: every record the planned figures replaced gets its cluster planning figures again. */
function withClusterPlanning(
  analyses: AnalysisRecord<AnalyticAnalysis>,
  formula: AnalysisRecord<AnalyticAnalysis>,
  cm: ClusterModel,
  s: AnalysisSettings,
  share: number,
): AnalysisRecord<AnalyticAnalysis> {
  if (analyses === formula) return analyses;
  const out = { ...analyses };
  for (const [id, record] of Object.entries(analyses) as [AnalysisId, AnalyticAnalysis][]) {
    if (record !== formula[id]) out[id] = clusterPlanningFigures(id, record, cm, s, share);
  }
  return out;
}

/** The clusters design's own figures. */
function clusterSummary(cm: ClusterModel, tolerableShare: number): ClusterSummary {
  const C = cm.comparison;
  const target = breakEvenLambda(cm, tolerableShare);
  const size = target === null || target <= C.clusterMeanReliability ? null : clusterSizeForReliability(C, target, cm.design.cohort === 'same');
  const { beta, pretestGap, reliability } = cm.person;
  return {
    size: { ...cm.design.clusterSize },
    clustersPerGroup: { ...cm.design.clusterCount },
    cohort: cm.design.cohort,
    level: cm.design.level,
    pretestICC: cm.design.pretestICC,
    posttestICC: cm.design.posttestICC,
    clusterMeanReliability: { programme: cm.programme.clusterMeanReliability, comparison: C.clusterMeanReliability, pooled: cm.pooledClusterMeanReliability },
    designEffect: { pretest: designEffect(C.size, cm.design.pretestICC), posttest: designEffect(C.size, cm.design.posttestICC) },
    matchedClusterArtefact: clusterArtefact('matchedDifference', { ...cm, design: { ...cm.design, level: 'clusters' } }),
    clusterMeansAncovaArtefact: clusterArtefact('ancova', cm),
    personMatchingArtefact: beta * (1 - reliability.comparison) * pretestGap,
    breakEvenClusterSize: size,
  };
}

/**
 * The cluster-mean reliability at which the matched-cluster artefact equals
 * the tolerable share of tau: λ* = 1 − share·|tau| / |beta·Delta| (Thorndike's
 * formula solved for λ); null when tau = 0 or there is no gap (no artefact to tolerate).
 */
function breakEvenLambda(cm: ClusterModel, tolerableShare: number): number | null {
  const { beta, pretestGap, effect } = cm.person;
  const scale = Math.abs(beta * pretestGap);
  if (effect === 0 || scale === 0) return null;
  return Math.max(0, 1 - (tolerableShare * Math.abs(effect)) / scale);
}

/** The break-even figure: for matched clusters the cluster-mean λ and the people per cluster that reach it; for matched people the one-level pretest reliability. */
function clusterBreakEven(cm: ClusterModel, tolerableShare: number, size: number | null): BreakEven {
  if (cm.design.level === 'people') return breakEvenReliability(cm.person, tolerableShare);
  const target = breakEvenLambda(cm, tolerableShare);
  const lambda = cm.comparison.clusterMeanReliability;
  if (target === null) {
    return { reliability: null, alreadyMet: false, parallelForms: null, note: 'No break-even cluster-mean reliability: the hoped-for effect is 0 or the groups start level, so there is no artefact to set against it.' };
  }
  if (lambda >= target) {
    return { reliability: target, alreadyMet: true, parallelForms: 1, note: `The comparison clusters' mean reliability (${formatNumber(lambda)}) already reaches the break-even ${formatNumber(target)}.` };
  }
  return {
    reliability: target,
    alreadyMet: false,
    parallelForms: null,
    note:
      `The comparison clusters' mean reliability must rise from ${formatNumber(lambda)} to ${formatNumber(target)}: ` +
      (size !== null ? `testing ${size} people per cluster would do it (Spearman–Brown on the cluster mean).` : 'only a perfectly reliable cluster mean would do.'),
  };
}

/** The design in plain words. */
function clusterDesignSummary(cm: ClusterModel): DesignSummary {
  const d = cm.design;
  const lambda = formatNumber(Number(cm.comparison.clusterMeanReliability.toFixed(3)));
  const cohort = d.cohort === 'same' ? 'the same people sit the posttest' : 'a new cohort of the same clusters sits the posttest';
  return {
    kind: 'clusters',
    shape: 'two-groups',
    rule:
      `The programme and comparison groups already existed as whole clusters (${d.clusterCount.programme} and ${d.clusterCount.comparison} clusters of ${d.clusterSize.comparison} people); ` +
      `${d.level === 'clusters' ? 'matching pairs clusters on their observed pretest means' : 'matching pairs people across clusters on their own pretests'}, and ${cohort}.`,
    meaning:
      `A cluster's observed pretest mean measures what predicts its posttest mean with reliability λ = ${lambda} (${d.cohort === 'new' ? 'ICC(2): a new cohort at posttest' : 'the same people retested'}); ` +
      'matching or adjusting on cluster means leaves (1 − λ) of the true gap in place, and every person-level SE must count the clustering.',
    selectedShare: null,
    noProgrammeChange: null,
  };
}
