import type { Plan } from '../core/plan';

/**
 * The built-in demo plan. INVENTED EXAMPLE: the scenario and every number in
 * it are made up to illustrate the planner; they describe no real study.
 *
 * A community falls-prevention exercise programme for older adults. People
 * are referred to it because their balance is poor, so programme members
 * start about one SD lower than the comparison pool drawn from general
 * practice registers, on a balance-and-mobility score (0–100) whose manual
 * reports reliability .75 in a norm sample with SD 10. The evaluators plan to
 * match each participant to one register patient on the baseline score and
 * hope to detect a 2.5-point gain at follow-up.
 */
export const DEMO_PLAN: Plan = {
  format: 'meanward-plan',
  version: 1,
  title: 'Invented example: falls-prevention exercise classes, matched on a baseline balance score',
  groups: {
    programme: { label: 'Exercise class members', poolSize: 180, pretestMean: 44, pretestSD: 10 },
    comparison: { label: 'Register patients not referred', poolSize: 1200, pretestMean: 54, pretestSD: 10 },
  },
  pretest: { reliability: 0.75, referenceSD: 10 },
  outcome: {
    posttestSD: 10,
    prePostCorrelation: 0.6,
    growthGap: 0,
    hypothesisedEffect: 2.5,
    effectScale: 'points',
  },
  matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random' },
  analysis: { alpha: 0.05, assumedReliability: 0.75, tolerableBiasShare: 0.25, targetPower: 0.8 },
  simulation: { replications: 2000, seed: 20261201 },
};

/** A fresh deep copy of the demo plan (callers may mutate it). */
export function demoPlan(): Plan {
  return structuredClone(DEMO_PLAN);
}
