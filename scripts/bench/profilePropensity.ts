/*
 * Profiling aid for the propensity engine (not part of npm run bench): runs the built-in
 * maths-club example on the covariate engine for a number of replications, so that
 * `node --cpu-prof` on a bundle of this file shows where a replication's time goes.
 *
 *   npx esbuild scripts/bench/profilePropensity.ts --bundle --platform=node --outfile=/tmp/profile.cjs
 *   node --cpu-prof --cpu-prof-dir=/tmp/prof /tmp/profile.cjs [propensity|pretest|one-pretest] [replications]
 *
 * It prints the CPU milliseconds per replication (process.cpuUsage).
 */
import type { Plan } from '../../src/core/plan';
import { AFTER_SCHOOL_MATHS } from '../../src/io/examplePlans';
import { createSimulation } from '../../src/sim/createSimulation';
import { createMultivariateSimulation } from '../../src/sim/multivariate/createMultivariateSimulation';

const mode = process.argv[2] ?? 'propensity';
const reps = Number(process.argv[3] ?? 600);
const plan: Plan = structuredClone(AFTER_SCHOOL_MATHS);
if (mode !== 'propensity') plan.matching = { ...plan.matching, distance: 'pretest' };
if (mode === 'one-pretest') {
  plan.covariates = undefined;
  plan.covariateCorrelations = undefined;
}
const make = () => (mode === 'one-pretest' ? createSimulation(plan, { replications: reps }) : createMultivariateSimulation(plan, { replications: reps }));
make().runChunk(0, Math.min(reps, 100)); // warm-up
const c0 = process.cpuUsage();
const run = make();
run.runChunk(0, reps);
const c1 = process.cpuUsage(c0);
console.log(`${mode}: ${((c1.user + c1.system) / 1000 / reps).toFixed(4)} ms per replication (${run.finish().replications} replications)`);
