import type { AssignmentSpec, Plan, StudyShape } from '../../src/core/plan';
import { validatePlan } from '../../src/core/validatePlan';

/**
 * An invented selection plan (no real study): one population with pretest
 * mean 50 and SD 10 in generic "points", a rule on a basis, validated (so
 * plan.groups are derived from the rule). Every field can be overridden.
 * @throws Error listing the problems when the plan does not validate.
 */
export function selectionPlan(o: {
  assignment?: Partial<AssignmentSpec>;
  design?: StudyShape;
  poolSize?: number;
  mean?: number;
  sd?: number;
  reliability?: number;
  r?: number;
  posttestSD?: number;
  growthGap?: number;
  effect?: number;
  matching?: Partial<Plan['matching']>;
  assumedReliability?: number;
  replications?: number;
  seed?: number;
} = {}): Plan {
  const sd = o.sd ?? 10;
  const input = {
    format: 'meanward-plan',
    version: 1,
    title: 'Invented selection plan',
    design: o.design ?? 'two-groups',
    assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 41.6, side: 'below', ...o.assignment },
    population: { label: 'Invented population', poolSize: o.poolSize ?? 2000, pretestMean: o.mean ?? 50, pretestSD: sd },
    pretest: { reliability: o.reliability ?? 0.8, referenceSD: sd },
    outcome: {
      posttestSD: o.posttestSD ?? 10,
      prePostCorrelation: o.r ?? 0.7,
      growthGap: o.growthGap ?? 0,
      hypothesisedEffect: o.effect ?? 0,
      effectScale: 'points',
    },
    matching: { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random', ...o.matching },
    analysis: { alpha: 0.05, assumedReliability: o.assumedReliability ?? o.reliability ?? 0.8, tolerableBiasShare: 0.25, targetPower: 0.8 },
    simulation: { replications: o.replications ?? 300, seed: o.seed ?? 1 },
  };
  const check = validatePlan(input);
  if (!check.ok) throw new Error(`Invented selection plan does not validate: ${check.problems.map((p) => `${p.field}: ${p.message}`).join('; ')}`);
  return check.plan;
}
