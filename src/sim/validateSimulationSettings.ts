import type { Plan } from '../core/plan';

/** Largest replication count the engine accepts (memory: about 100 bytes per replication). */
export const MAX_REPLICATIONS = 1_000_000;

/**
 * Check the plan fields the Monte Carlo engine relies on, and the run's
 * replication count and seed, throwing a message a researcher understands.
 * (The plan's other fields are checked by deriveModelParameters.)
 *
 * @param plan the plan to simulate.
 * @param replications number of replications, integer 2..1,000,000.
 * @param seed simulation seed, a whole number.
 * @throws Error naming the field, its valid range and the value given, e.g.
 *   "Comparison partners per programme member must be a whole number from 1 to 5; got 7."
 * @example validateSimulationSettings(demoPlan(), 2000, 1) // returns nothing for the demo plan
 */
export function validateSimulationSettings(plan: Plan, replications: number, seed: number): void {
  const bad = (what: string, range: string, got: unknown): never => {
    throw new Error(`${what} must be ${range}; got ${String(got)}.`);
  };
  if (!Number.isInteger(replications) || replications < 2 || replications > MAX_REPLICATIONS) {
    bad('The number of simulated replications', `a whole number from 2 to ${MAX_REPLICATIONS.toLocaleString('en')}`, replications);
  }
  if (!Number.isSafeInteger(seed)) bad('The simulation seed', 'a whole number', seed);
  for (const [who, g] of [
    ['programme', plan.groups.programme],
    ['comparison', plan.groups.comparison],
  ] as const) {
    if (!Number.isInteger(g.poolSize) || g.poolSize < 2 || g.poolSize > 10_000_000) {
      bad(`The ${who} pool size`, 'a whole number of at least 2', g.poolSize);
    }
    if (!Number.isFinite(g.pretestMean)) bad(`The ${who} pretest mean`, 'a number', g.pretestMean);
    if (!(g.pretestSD > 0) || !Number.isFinite(g.pretestSD)) bad(`The ${who} pretest SD`, 'a positive number', g.pretestSD);
  }
  const m = plan.matching;
  if (m.method !== 'nearest' && m.method !== 'random-within-caliper') {
    bad('The matching method', "'nearest' or 'random-within-caliper'", m.method);
  }
  if (!(m.caliper > 0) || !Number.isFinite(m.caliper)) bad('The caliper (in pooled pretest SDs)', 'a positive number', m.caliper);
  if (!Number.isInteger(m.ratio) || m.ratio < 1 || m.ratio > 5) {
    bad('Comparison partners per programme member', 'a whole number from 1 to 5', m.ratio);
  }
  if (typeof m.replacement !== 'boolean') bad('Matching with replacement', 'yes or no', m.replacement);
  const order = m.order ?? 'random';
  if (order !== 'random' && order !== 'lowest-first' && order !== 'highest-first') {
    bad('The matching order', "'random', 'lowest-first' or 'highest-first'", order);
  }
  const a = plan.analysis;
  if (!(a.alpha > 0 && a.alpha < 1)) bad('The significance level', 'between 0 and 1 (exclusive)', a.alpha);
  if (!(a.assumedReliability > 0 && a.assumedReliability <= 1)) {
    bad('The reliability assumed by the corrected ANCOVA', 'between 0 and 1 (exclusive of 0)', a.assumedReliability);
  }
  const o = plan.outcome;
  for (const [what, v] of [
    ['The posttest SD', o.posttestSD],
    ['The growth gap', o.growthGap],
    ['The hypothesised effect', o.hypothesisedEffect],
  ] as const) {
    if (!Number.isFinite(v)) bad(what, 'a number', v);
  }
}
