import type { ClusterCohort, MatchingLevel, Plan } from '../../src/core/plan';

/**
 * An invented clustered plan (no real study): programme schools 8 points
 * lower in truth on a test with SD 15 and reliability .8, 25 pupils tested
 * per school, ICC .2, pre–post r .8 with posttest SD 15 (so the slope on the
 * true pretest is 1). Every field can be overridden.
 */
export function clusterPlan(o: {
  size?: number;
  icc?: number;
  posttestICC?: number;
  cohort?: ClusterCohort;
  level?: MatchingLevel;
  clustersP?: number;
  clustersC?: number;
  gap?: number;
  effect?: number;
  reliability?: number;
  r?: number;
  caliper?: number;
  ratio?: number;
  replacement?: boolean;
  replications?: number;
  seed?: number;
} = {}): Plan {
  const size = o.size ?? 25;
  const plan: Plan = {
    format: 'meanward-plan',
    version: 1,
    title: 'Invented: reading programme in 20 schools',
    groups: {
      programme: { label: 'Programme schools', poolSize: size * (o.clustersP ?? 20), pretestMean: 100 + (o.gap ?? -8), pretestSD: 15 },
      comparison: { label: 'Comparison schools', poolSize: size * (o.clustersC ?? 60), pretestMean: 100, pretestSD: 15 },
    },
    pretest: { reliability: o.reliability ?? 0.8, referenceSD: 15 },
    outcome: { posttestSD: 15, prePostCorrelation: o.r ?? 0.8, growthGap: 0, hypothesisedEffect: o.effect ?? 0, effectScale: 'points' },
    matching: {
      method: 'nearest',
      caliper: o.caliper ?? 0.2,
      ratio: o.ratio ?? 1,
      replacement: o.replacement ?? false,
      order: 'random',
      level: o.level ?? 'clusters',
    },
    analysis: { alpha: 0.05, assumedReliability: 0.8, tolerableBiasShare: 0.25, targetPower: 0.8 },
    simulation: { replications: o.replications ?? 200, seed: o.seed ?? 7 },
    clusters: { size, pretestICC: o.icc ?? 0.2, cohort: o.cohort ?? 'new' },
  };
  if (o.posttestICC !== undefined && plan.clusters) plan.clusters.posttestICC = o.posttestICC;
  return plan;
}
