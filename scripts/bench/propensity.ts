/*
 * Benchmark of the propensity-score engine (part of npm run bench; scripts/bench.ts calls
 * propensityBench() and prints its fields under `propensity`). All figures are ratios of
 * CPU time (process.cpuUsage, user + system) measured in this one run, the median over
 * interleaved rounds after a warm-up, like the rest of the bench:
 *
 *   propensityRatio   CPU time per replication of the built-in invented propensity example
 *                     (the after-school maths club: 250 programme and 2,000 comparison pupils,
 *                     the pretest and three measured covariates in the score, one of them
 *                     matched exactly, one confounder unmeasured; nearest 1:1, caliper 0.2 SDs
 *                     of the logit) ÷ CPU time per replication of the same plan matched on the
 *                     pretest alone by the one-pretest engine (no covariates: same pools, same
 *                     caliper, ratio and method). Target ≤ 5 (issue #16).
 *   demoRatio         the same for the demo's invented covariate variant (180 and 1,200 people,
 *                     three measured covariates besides the pretest; scripts/bench.ts's
 *                     demoWithCovariates) ÷ the demo plan on the one-pretest engine.
 *   fitRatio          the maths example matched on the propensity score ÷ the same plan,
 *                     covariates and all, matched on the pretest by the covariate engine: what
 *                     the logistic regression itself adds (1 = nothing).
 *   covariateFloorRatio  that pretest-matched covariate run ÷ the one-pretest engine: what
 *                     drawing and analysing several covariates costs before any fit, the floor
 *                     under propensityRatio.
 *
 * Per-replication times are printed alongside. The machine may be shared, so times are CPU
 * time and each ratio is the median over rounds of that round's ratio.
 *
 * Which engine runs which task: the propensity, covariatesOnPretest and demoPropensity tasks run
 * the several-covariate engine (src/sim/multivariate/createMultivariateSimulation.ts); pretest
 * and demoPretest run the one-pretest engine (src/sim/createSimulation.ts). Both draw their
 * normal variates with the same sampler (NormalSampler.fillStandard; the one-pretest engine also
 * fillSortedStandard); the speed-ups of issue #16's second round are all in the covariate engine's
 * own code (docs/simulation.md, "The propensity fit's tolerance, its start, and its speed"), and
 * the one-pretest engine, the denominator, is unchanged.
 *
 * Run this part alone: npx tsx scripts/bench/propensity.ts (prints the JSON fields).
 * Where a replication's time goes: scripts/bench/profilePropensity.ts.
 */
import { pathToFileURL } from 'node:url';
import type { Plan } from '../../src/core/plan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { createSimulation } from '../../src/sim/createSimulation';
import { createMultivariateSimulation } from '../../src/sim/multivariate/createMultivariateSimulation';
import { demoWithCovariates } from './benchPlans';

const ROUNDS = 11;
const PROPENSITY_REPS = 150;
const PRETEST_REPS = 1500;

let sink = 0;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}

function round(x: number, d: number): number {
  const f = 10 ** d;
  return Math.round(x * f) / f;
}

/** CPU milliseconds of one call. */
function cpuMs(f: () => void): number {
  const c0 = process.cpuUsage();
  f();
  const c1 = process.cpuUsage(c0);
  return (c1.user + c1.system) / 1000;
}

/** The plan without covariates, matched on the pretest (the one-pretest engine's plan). */
function pretestOnly(plan: Plan): Plan {
  const p = structuredClone(plan);
  p.covariates = undefined;
  p.covariateCorrelations = undefined;
  p.matching = { ...p.matching, distance: 'pretest' };
  return p;
}


/** CPU ms per replication of a run of `reps` replications (the engine chosen by the caller). */
function perReplication(engine: 'one-pretest' | 'covariates', plan: Plan, reps: number): number {
  return (
    cpuMs(() => {
      const run = engine === 'one-pretest' ? createSimulation(plan, { replications: reps }) : createMultivariateSimulation(plan, { replications: reps });
      run.runChunk(0, reps);
      sink += run.finish().replications;
    }) / reps
  );
}

/** The propensity bench's JSON fields (see the header comment). */
export async function propensityBench(): Promise<Record<string, unknown>> {
  const maths = structuredClone(AFTER_SCHOOL_MATHS);
  const mathsPretest = pretestOnly(maths);
  const mathsCovariatesOnPretest: Plan = { ...structuredClone(maths), matching: { ...maths.matching, distance: 'pretest' } };
  const demo = demoWithCovariates('propensity', 1);
  const demoPretest = pretestOnly(demo);
  const tasks = {
    propensity: () => perReplication('covariates', maths, PROPENSITY_REPS),
    pretest: () => perReplication('one-pretest', mathsPretest, PRETEST_REPS),
    covariatesOnPretest: () => perReplication('covariates', mathsCovariatesOnPretest, PROPENSITY_REPS),
    demoPropensity: () => perReplication('covariates', demo, PROPENSITY_REPS),
    demoPretest: () => perReplication('one-pretest', demoPretest, PRETEST_REPS),
  };
  for (let w = 0; w < 2; w++) for (const f of Object.values(tasks)) f();
  const rounds: Record<keyof typeof tasks, number>[] = [];
  for (let r = 0; r < ROUNDS; r++) {
    rounds.push({
      propensity: tasks.propensity(),
      pretest: tasks.pretest(),
      covariatesOnPretest: tasks.covariatesOnPretest(),
      demoPropensity: tasks.demoPropensity(),
      demoPretest: tasks.demoPretest(),
    });
  }
  const ratio = (a: keyof typeof tasks, b: keyof typeof tasks) => rounds.map((t) => t[a] / t[b]);
  const propensityRatio = ratio('propensity', 'pretest');
  const demoRatio = ratio('demoPropensity', 'demoPretest');
  const fitRatio = ratio('propensity', 'covariatesOnPretest');
  const floorRatio = ratio('covariatesOnPretest', 'pretest');
  const ms = (name: keyof typeof tasks) => round(median(rounds.map((t) => t[name])), 4);
  const range = (xs: number[]) => [round(Math.min(...xs), 2), round(Math.max(...xs), 2)];
  if (sink === 42.4242) console.log('');
  return {
    plan: "built-in invented example 'after-school maths club' (250 and 2,000 people; pretest and 3 measured covariates in the score, 1 matched exactly; nearest 1:1, caliper 0.2)",
    propensityMsPerReplication: ms('propensity'),
    pretestMsPerReplication: ms('pretest'),
    covariatesMatchedOnPretestMsPerReplication: ms('covariatesOnPretest'),
    demoPropensityMsPerReplication: ms('demoPropensity'),
    demoPretestMsPerReplication: ms('demoPretest'),
    propensityRatio: round(median(propensityRatio), 2),
    demoRatio: round(median(demoRatio), 2),
    fitRatio: round(median(fitRatio), 2),
    covariateFloorRatio: round(median(floorRatio), 2),
    roundRanges: { propensityRatio: range(propensityRatio), demoRatio: range(demoRatio), fitRatio: range(fitRatio), covariateFloorRatio: range(floorRatio) },
    targets: { propensityRatio: '<= 5' },
    met: { propensityRatio: median(propensityRatio) <= 5 },
  };
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  console.log(JSON.stringify(await propensityBench(), null, 2));
}
