import type { Plan } from '../../src/core/plan';

/**
 * An invented test plan (no real study): pools, pretest and outcome in
 * generic "points". Every field can be overridden.
 */
export function testPlan(overrides: {
  nP?: number;
  nC?: number;
  meanP?: number;
  meanC?: number;
  sd?: number;
  reliability?: number;
  r?: number;
  posttestSD?: number;
  growthGap?: number;
  effect?: number;
  matching?: Partial<Plan['matching']>;
  alpha?: number;
  assumedReliability?: number;
  replications?: number;
  seed?: number;
}): Plan {
  const sd = overrides.sd ?? 10;
  return {
    format: 'meanward-plan',
    version: 1,
    title: 'Invented test plan',
    groups: {
      programme: { label: 'Programme', poolSize: overrides.nP ?? 150, pretestMean: overrides.meanP ?? 40, pretestSD: sd },
      comparison: { label: 'Comparison', poolSize: overrides.nC ?? 1500, pretestMean: overrides.meanC ?? 50, pretestSD: sd },
    },
    pretest: { reliability: overrides.reliability ?? 0.8, referenceSD: sd },
    outcome: {
      posttestSD: overrides.posttestSD ?? 10,
      prePostCorrelation: overrides.r ?? 0.6,
      growthGap: overrides.growthGap ?? 0,
      hypothesisedEffect: overrides.effect ?? 2,
      effectScale: 'points',
    },
    matching: { method: 'nearest', caliper: 0.05, ratio: 1, replacement: false, order: 'random', ...overrides.matching },
    analysis: {
      alpha: overrides.alpha ?? 0.05,
      assumedReliability: overrides.assumedReliability ?? overrides.reliability ?? 0.8,
      tolerableBiasShare: 0.25,
      targetPower: 0.8,
    },
    simulation: { replications: overrides.replications ?? 300, seed: overrides.seed ?? 1 },
  };
}
