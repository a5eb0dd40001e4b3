import type { AssignmentSpec, Plan, StudyShape } from '../../src/core/plan';
import { validatePlan } from '../../src/core/validatePlan';
import { rawSelectionPlan } from '../core/selectionPlanFixture';

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
  const a = { rule: 'cut-off' as const, basis: 'pretest' as const, cutOff: 41.6, side: 'below' as const, ...o.assignment };
  // The core tests' invented selection plan, with this file's defaults (population 2,000; posttest SD 10).
  const input = rawSelectionPlan({
    mean: o.mean ?? 50,
    sd: o.sd ?? 10,
    poolSize: o.poolSize ?? 2000,
    reliability: o.reliability ?? 0.8,
    posttestSD: o.posttestSD ?? 10,
    r: o.r ?? 0.7,
    tau: o.effect ?? 0,
    growth: o.growthGap ?? 0,
    design: o.design ?? 'two-groups',
    rule: a.rule === 'existing-groups' ? 'cut-off' : a.rule,
    basis: a.basis,
    cutOff: a.cutOff,
    side: a.side,
    ...(a.spread !== undefined ? { spread: a.spread } : {}),
    ...(a.screenerReliability !== undefined ? { screenerReliability: a.screenerReliability } : {}),
    assumedReliability: o.assumedReliability ?? o.reliability ?? 0.8,
  });
  input.title = 'Invented selection plan';
  input.matching = { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random', ...o.matching };
  input.simulation = { replications: o.replications ?? 300, seed: o.seed ?? 1 };
  const check = validatePlan(input);
  if (!check.ok) throw new Error(`Invented selection plan does not validate: ${check.problems.map((p) => `${p.field}: ${p.message}`).join('; ')}`);
  return check.plan;
}
