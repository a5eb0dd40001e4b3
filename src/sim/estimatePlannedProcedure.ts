import { studyDesign } from '../core/design/studyDesign';
import { usesCovariateModel } from '../core/multivariate/covariateModel';
import type { Plan } from '../core/plan';
import type { PlannedProcedureEstimates } from '../core/plannedProcedure';
import { createPlanSimulation } from './multivariate/createPlanSimulation';
import { isFeasible } from './types';

/** Fewest quick replications: the quick mean's MC error is then at most 1/sqrt(32) ≈ 0.18 empirical SEs. */
export const QUICK_MIN_REPLICATIONS = 32;
/** Most quick replications (small plans): MC error ≈ 0.065 empirical SEs. */
export const QUICK_MAX_REPLICATIONS = 240;
/**
 * Work budget of a quick run in person-replications (pool members × replications,
 * weighted by the engine's cost per member): about 20–70 ms for a one-pretest
 * plan on one core of a 2-core machine (npm run bench measures the engine).
 */
export const QUICK_WORK_BUDGET = 200_000;
/** Seed offset of the quick run, so its draws are independent of a full run with the plan's own seed. */
export const QUICK_SEED_OFFSET = 7919;

/**
 * Replications of the quick run for a plan: QUICK_WORK_BUDGET shared over the
 * pools, the covariate engine weighted by its higher cost per member
 * (propensity 6, Mahalanobis or covariates 3), clamped to
 * [QUICK_MIN_REPLICATIONS, QUICK_MAX_REPLICATIONS]. Depends only on the plan, so
 * the quick figures are reproducible. A selection design draws its whole
 * population every replication (the pools engine), so its people are
 * population.poolSize.
 * @example quickReplications(demoPlan()) // 144 (1,380 members: 200,000 / 1,380)
 */
export function quickReplications(plan: Plan): number {
  const selection = studyDesign(plan).kind === 'selection';
  const people = selection
    ? Math.max(1, plan.population?.poolSize ?? plan.groups.programme.poolSize + plan.groups.comparison.poolSize)
    : plan.groups.programme.poolSize + plan.groups.comparison.poolSize;
  const distance = plan.matching.distance ?? 'pretest';
  const weight = selection || !usesCovariateModel(plan) ? 1 : distance === 'propensity' ? 6 : 3;
  const r = Math.floor(QUICK_WORK_BUDGET / (people * weight));
  return Math.min(QUICK_MAX_REPLICATIONS, Math.max(QUICK_MIN_REPLICATIONS, r));
}

/**
 * The expected figures of the matching-based analysis for the procedure as
 * planned (these pools, caliper, ratio, matching order, replacement and
 * distance), from a short seeded run of the Monte Carlo engine itself: the
 * mean matched difference with its Monte Carlo SE, the root mean square of the
 * SE the analysis reports (which counts reuse of comparison partners), and the
 * mean number of matched programme members. The infinite-pool closed form
 * (Thorndike 1942) can be far off for tight plans (demand near the comparison
 * pool's size, finite calipers, lowest-first order); this is not.
 *
 * Full-sample analyses (ANCOVA, gain score, corrected ANCOVA, regression
 * discontinuity, the pre–post change) are not included: their closed forms
 * already hold for the planned full samples. A selection design with two
 * groups runs the pools engine (createPlanSimulation); a one-group design has
 * no matched difference, so nothing is simulated and no analyses are returned.
 *
 * Reference: Monte Carlo summaries as in Morris, White & Crowther (2019),
 * Table 6.
 *
 * @param plan a validated plan.
 * @returns estimates for analysePlan(plan, estimates). The matched difference
 *   is marked infeasible (with the reason) when it could not be computed in
 *   at least two replications or fewer than 2 programme members are matched on average.
 * @throws Error with a researcher-readable message for contradictory inputs (from the engine).
 * @example
 *   analysePlan(plan, estimatePlannedProcedure(plan)).analyses.matchedDifference.expectedEstimate
 *   // within 0.5 empirical SE of a full simulation's mean (test/sim/estimatePlannedProcedure.test.ts)
 */
export function estimatePlannedProcedure(plan: Plan): PlannedProcedureEstimates {
  const replications = quickReplications(plan);
  const seed = quickSeed(plan.simulation.seed);
  if (studyDesign(plan).shape === 'one-group') return { replications, seed, analyses: {} };
  const run = createPlanSimulation(plan, { replications, seed });
  run.runChunk(0, replications);
  const result = run.finish();
  const md = result.analyses.matchedDifference;
  if (!md) return { replications, seed, analyses: {} };
  if (!isFeasible(md)) return { replications, seed, analyses: { matchedDifference: { infeasible: true, reason: md.reason } } };
  const matched = result.matching.meanMatchedProgramme;
  if (!(matched >= 2)) {
    const reason =
      `In a quick simulation of the planned procedure about ${matched.toFixed(1)} of the ${plan.groups.programme.poolSize} programme members ` +
      'find a comparison partner on average, and a matched comparison needs at least 2. Widen the caliper, enlarge the comparison pool, ' +
      'recruit a comparison group closer to the programme group on the pretest, or allow comparison members to be reused.';
    return { replications, seed, analyses: { matchedDifference: { infeasible: true, reason } } };
  }
  return {
    replications,
    seed,
    analyses: {
      matchedDifference: {
        meanEstimate: md.meanEstimate,
        meanEstimateMCSE: md.meanEstimateMCSE,
        se: md.meanModelSE,
        nProgramme: matched,
        nComparison: matched * plan.matching.ratio,
      },
    },
  };
}

/** The quick run's seed: the plan's seed moved by QUICK_SEED_OFFSET, kept a safe integer. */
function quickSeed(seed: number): number {
  return seed + QUICK_SEED_OFFSET <= Number.MAX_SAFE_INTEGER ? seed + QUICK_SEED_OFFSET : seed - QUICK_SEED_OFFSET;
}
