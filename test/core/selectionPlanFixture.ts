import type { Plan } from '../../src/core/plan';
import { validatePlan } from '../../src/core/validatePlan';
import { DEMO_PLAN } from '../../src/io/demoPlan';

/** Settings of an invented selection plan (one population; the rule forms the groups). */
export interface SelectionSettings {
  mean?: number;
  sd?: number;
  poolSize?: number;
  reliability?: number;
  sem?: number;
  posttestSD?: number;
  r?: number;
  tau?: number;
  growth?: number;
  design?: 'two-groups' | 'one-group';
  rule?: 'cut-off' | 'probability';
  basis?: 'pretest' | 'screener' | 'true-score';
  cutOff: number;
  side?: 'below' | 'above';
  spread?: number;
  screenerReliability?: number;
  assumedReliability?: number;
}

/** The raw plan object (before validation). Invented: no real study. */
export function rawSelectionPlan(s: SelectionSettings): Record<string, unknown> {
  const p = structuredClone(DEMO_PLAN) as unknown as Record<string, unknown>;
  delete p.groups;
  p.title = 'Invented example: a tutoring offer for pupils picked by a rule';
  p.design = s.design ?? 'two-groups';
  p.population = { label: 'Invented pupils', poolSize: s.poolSize ?? 20000, pretestMean: s.mean ?? 50, pretestSD: s.sd ?? 10 };
  p.pretest = s.sem !== undefined ? { sem: s.sem } : { reliability: s.reliability ?? 0.8 };
  p.outcome = {
    posttestSD: s.posttestSD ?? s.sd ?? 10,
    prePostCorrelation: s.r ?? 0.7,
    growthGap: s.growth ?? 0,
    hypothesisedEffect: s.tau ?? 0,
    effectScale: 'points',
  };
  p.assignment = {
    rule: s.rule ?? 'cut-off',
    basis: s.basis ?? 'pretest',
    cutOff: s.cutOff,
    side: s.side ?? 'below',
    ...(s.spread !== undefined ? { spread: s.spread } : {}),
    ...(s.screenerReliability !== undefined ? { screenerReliability: s.screenerReliability } : {}),
  };
  p.analysis = { alpha: 0.05, assumedReliability: s.assumedReliability ?? 0.8, tolerableBiasShare: 0.25, targetPower: 0.8 };
  return p;
}

/** A validated invented selection plan; throws with the problems when validation refuses it. */
export function selectionPlan(s: SelectionSettings): Plan {
  const r = validatePlan(rawSelectionPlan(s));
  if (!r.ok) throw new Error(r.problems.map((x) => `${x.field}: ${x.message}`).join('\n'));
  return r.plan;
}
