/*
 * Benchmark of the Monte Carlo engine (npm run bench; --json prints one JSON object).
 * All figures are ratios measured in this one run, so they do not depend on the machine's speed:
 *   floorRatio    engine time for the demo plan at 2,000 replications ÷ time just to draw the
 *                 normal variates it needs with the same generator (target ≤ 2)
 *   naiveSpeedup  time per replication of a straightforward baseline (Math.random Box–Muller,
 *                 arrays of objects, linear-scan matching, t quantiles and p-values per estimate)
 *                 ÷ engine time per replication (target ≥ 20)
 *   doublingRatio engine time with both pools doubled ÷ engine time (target ≤ 2.3; O(n log n))
 * and, for the several-covariate engine on the demo's invented covariate variant
 * (demoWithCovariates in scripts/bench/benchPlans.ts), measured in rounds of their own after those above:
 *   covariates.doublingRatio             propensity-score matching, pools doubled ÷ as given
 *                                        (target ≤ 2.3: no quadratic work in pool size)
 *   covariates.mahalanobisDoublingRatio  the same plan matched on the Mahalanobis distance
 *                                        (target ≤ 2.3: k-d tree search, O(n log n))
 *   covariates.mahalanobisFarRatio       the Mahalanobis plan with the comparison pretest mean
 *                                        moved to 1e20 ÷ as given (target ≤ 1.5: the search's
 *                                        work does not grow with the coordinates' magnitude)
 * and, for the clusters design on the pools engine (clusterBenchPlan below), in rounds of their own:
 *   clusters.doublingRatio        schools matched on their means, twice the clusters in both groups
 *                                 ÷ as given (target ≤ 2.3)
 *   clusters.peopleDoublingRatio  pupils matched across schools, twice the clusters ÷ as given (≤ 2.3)
 * and propensity.* from scripts/bench/propensity.ts (propensityRatio: a propensity-score replication of the
 * built-in maths-club example ÷ a one-pretest replication of the same pools, target ≤ 5; see its header).
 * and, in a real browser (scripts/bench/browserGrid.ts, wall clock; see its header):
 *   browserGrid.gridRatio      a 25-cell explorer grid ÷ (2 × one run × 25 ÷ workers) (target ≤ 1)
 *   browserGrid.longestTaskMs  longest main-thread task during the grid (target ≤ 50)
 * Each ratio is the median over several interleaved rounds (after a warm-up) of that
 * round's ratio. Times are this
 * process's CPU time (process.cpuUsage, user + system), not wall-clock time: the machine
 * may be shared, and time spent descheduled while other programs run belongs to neither
 * side of a ratio. Wall-clock ratios are printed alongside for comparison.
 * The command line's start-up (cliStartRatio, cliNoSimSeconds, cliStart) is measured in wall time
 * by scripts/bench/cliStart.ts (see its header).
 */
import jStat from 'jstat';
import '../src/core/allEngines'; // every design's closed forms (src/core/engineRegistry.ts)
import { demoPlan } from '../src/io/demoPlan';
import type { Plan } from '../src/core/plan';
import { deriveModelParameters } from '../src/core/deriveModelParameters';
import { createSimulation } from '../src/sim/createSimulation';
import { createMultivariateSimulation } from '../src/sim/multivariate/createMultivariateSimulation';
import { createPlanSimulation } from '../src/sim/multivariate/createPlanSimulation';
import { NormalSampler } from '../src/sim/normalSampler';
import { drawReplicationVariates } from '../src/sim/drawReplicationVariates';
import { Xoshiro128StarStar } from '../src/sim/xoshiro128StarStar';
import { demoWithCovariates } from './bench/benchPlans';
import { parallelBench } from './bench/parallel';
import { cliStartBench } from './bench/cliStart';
import { propensityBench } from './bench/propensity';
import { browserGridBench } from './bench/browserGrid';

const json = process.argv.includes('--json');
const REPS = 2000;
const RUNS = 11;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.floor(s.length / 2)] as number;
}


let sink = 0; // keeps results alive so nothing is optimised away

function engine(plan: Plan, reps: number): void {
  const run = createSimulation(plan, { replications: reps });
  run.runChunk(0, reps);
  sink += run.finish().analyses.ancova!.replications;
}

/**
 * Just the normal variates the engine draws, with the engine's own sampler and layout
 * (drawReplicationVariates: the comparison pool's pretest as a sorted sample, the rest
 * ziggurat normals), per-replication streams.
 */
function normalsOnly(plan: Plan, reps: number): void {
  const nP = plan.groups.programme.poolSize;
  const nC = plan.groups.comparison.poolSize;
  const g = new Xoshiro128StarStar();
  const z = new NormalSampler(g);
  const buffer = new Float64Array(3 * (nP + nC));
  let s = 0;
  for (let i = 0; i < reps; i++) {
    g.reseed(plan.simulation.seed, i);
    drawReplicationVariates(z, buffer, nC, nP, false);
    s += buffer[buffer.length - 1] as number;
  }
  sink += s;
}

interface Person {
  group: 'P' | 'C';
  x: number;
  t: number;
  y: number;
  used: boolean;
}

function boxMuller(): number {
  return Math.sqrt(-2 * Math.log(1 - Math.random())) * Math.cos(2 * Math.PI * Math.random());
}

/** The straightforward way: objects, Math.random, linear scans, array methods, t functions per estimate. */
function naive(plan: Plan, reps: number): void {
  const m = deriveModelParameters(plan);
  const tau = m.effect;
  const caliperSD = plan.matching.caliper;
  const rhoA = plan.analysis.assumedReliability;
  const results: { est: number; p: number; lo: number; hi: number }[][] = [];
  const test = (est: number, se: number, df: number) => {
    const p = 2 * (1 - jStat.studentt.cdf(Math.abs(est / se), df));
    const q = jStat.studentt.inv(0.975, df);
    return { est, p, lo: est - q * se, hi: est + q * se };
  };
  const mean = (a: number[]) => a.reduce((s, v) => s + v, 0) / a.length;
  const variance = (a: number[]) => {
    const mu = mean(a);
    return a.reduce((s, v) => s + (v - mu) ** 2, 0) / (a.length - 1);
  };
  const ancova = (ps: Person[], cs: Person[], r: number) => {
    const within = (g: Person[]) => {
      const mx = mean(g.map((p) => p.x));
      const my = mean(g.map((p) => p.y));
      return {
        mx,
        my,
        sxx: g.reduce((s, p) => s + (p.x - mx) ** 2, 0),
        sxy: g.reduce((s, p) => s + (p.x - mx) * (p.y - my), 0),
        syy: g.reduce((s, p) => s + (p.y - my) ** 2, 0),
      };
    };
    const a = within(ps);
    const b = within(cs);
    const slope = (a.sxy + b.sxy) / (a.sxx + b.sxx);
    const est = a.my - b.my - (slope / r) * (a.mx - b.mx);
    const df = ps.length + cs.length - 3;
    const s2 = (a.syy + b.syy - slope * slope * (a.sxx + b.sxx)) / df;
    const se = Math.sqrt(s2 * (1 / ps.length + 1 / cs.length + (a.mx - b.mx) ** 2 / (r * r * (a.sxx + b.sxx))));
    return test(est, se, df);
  };
  for (let rep = 0; rep < reps; rep++) {
    const people: Person[] = [];
    for (const [group, n, mu, tsd] of [
      ['P', m.n.programme, m.mean.programme, m.trueSD.programme],
      ['C', m.n.comparison, m.mean.comparison, m.trueSD.comparison],
    ] as const) {
      for (let i = 0; i < n; i++) {
        const t = mu + tsd * boxMuller();
        const x = t + m.sem * boxMuller();
        const y = (group === 'P' ? m.growthGap + tau : 0) + m.beta * t + m.residualSD * boxMuller();
        people.push({ group, x, t, y, used: false });
      }
    }
    const ps = people.filter((p) => p.group === 'P');
    const cs = people.filter((p) => p.group === 'C');
    const caliper = caliperSD * Math.sqrt((variance(ps.map((p) => p.x)) + variance(cs.map((p) => p.x))) / 2);
    const sets: { p: Person; c: Person }[] = [];
    for (const p of ps) {
      let best: Person | null = null;
      for (const c of cs) {
        if (c.used || Math.abs(c.x - p.x) > caliper) continue;
        if (!best || Math.abs(c.x - p.x) < Math.abs(best.x - p.x)) best = c;
      }
      if (best) {
        best.used = true;
        sets.push({ p, c: best });
      }
    }
    const d = sets.map((s) => s.p.y - s.c.y);
    const gain = (g: Person[]) => g.map((p) => p.y - p.x);
    const gp = gain(ps);
    const gc = gain(cs);
    const sp = Math.sqrt(((gp.length - 1) * variance(gp) + (gc.length - 1) * variance(gc)) / (gp.length + gc.length - 2));
    results.push([
      test(mean(d), Math.sqrt(variance(d) / d.length), d.length - 1),
      ancova(ps, cs, 1),
      test(mean(gp) - mean(gc), sp * Math.sqrt(1 / gp.length + 1 / gc.length), gp.length + gc.length - 2),
      ancova(ps, cs, rhoA),
      ancova(
        sets.map((s) => s.p),
        sets.map((s) => s.c),
        1,
      ),
    ]);
  }
  sink += mean(results.map((r) => (r[1] as { est: number }).est));
}

const plan = demoPlan();
const doubled = demoPlan();
doubled.groups.programme.poolSize *= 2;
doubled.groups.comparison.poolSize *= 2;
const NAIVE_REPS = 200;

// Interleaved rounds: the machine may be shared, so each round times the engine, the
// normals alone, the doubled pools and the naive baseline back to back, and each ratio
// is the median over rounds of that round's ratio (like compared with like, under the
// same load). Times are CPU time; wall-clock ratios are computed the same way.
type Timing = { cpu: number; wall: number };
function timeOnce(f: () => void): Timing {
  const c0 = process.cpuUsage();
  const t0 = performance.now();
  f();
  const t1 = performance.now();
  const c1 = process.cpuUsage(c0);
  return { cpu: (c1.user + c1.system) / 1000, wall: t1 - t0 };
}
const tasks = {
  engine: () => engine(plan, REPS),
  normals: () => normalsOnly(plan, REPS),
  doubled: () => engine(doubled, REPS),
  naive: () => naive(plan, NAIVE_REPS),
};
// Warm-up: three runs of each task, so every timing is of steady-state code (the naive
// baseline in particular runs several times slower on its first two runs, before the
// JIT and the heap settle, which would flatter the engine).
for (let w = 0; w < 3; w++) for (const f of Object.values(tasks)) f();
const rounds: Record<keyof typeof tasks, Timing>[] = [];
for (let r = 0; r < RUNS; r++) {
  rounds.push({
    engine: timeOnce(tasks.engine),
    normals: timeOnce(tasks.normals),
    doubled: timeOnce(tasks.doubled),
    naive: timeOnce(tasks.naive),
  });
}
const ratios = (clock: keyof Timing) => {
  const floor = rounds.map((t) => t.engine[clock] / t.normals[clock]);
  const naiveR = rounds.map((t) => t.naive[clock] / NAIVE_REPS / (t.engine[clock] / REPS));
  const doubling = rounds.map((t) => t.doubled[clock] / t.engine[clock]);
  return { floor, naive: naiveR, doubling };
};
const cpuRatios = ratios('cpu');
const wallRatios = ratios('wall');
const medianOf = (name: keyof typeof tasks) => median(rounds.map((t) => t[name].cpu));
const tEngine = medianOf('engine');
const tNormals = medianOf('normals');
const tDoubled = medianOf('doubled');
const tNaive = medianOf('naive');
const wall = {
  floorRatio: round(median(wallRatios.floor), 3),
  naiveSpeedup: round(median(wallRatios.naive), 2),
  doublingRatio: round(median(wallRatios.doubling), 3),
};
const range = (xs: number[], d: number) => [round(Math.min(...xs), d), round(Math.max(...xs), d)];
const floorRatio = median(cpuRatios.floor);
const naiveSpeedup = median(cpuRatios.naive);
const doublingRatio = median(cpuRatios.doubling);
const COVARIATE_REPS = 200;
function covariateEngine(p: Plan): void {
  const run = createMultivariateSimulation(p, { replications: COVARIATE_REPS });
  run.runChunk(0, COVARIATE_REPS);
  sink += run.finish().analyses.ancova!.replications;
}
const covariateTasks = {
  propensity: () => covariateEngine(demoWithCovariates('propensity', 1)),
  propensityDoubled: () => covariateEngine(demoWithCovariates('propensity', 2)),
  mahalanobis: () => covariateEngine(demoWithCovariates('mahalanobis', 1)),
  mahalanobisDoubled: () => covariateEngine(demoWithCovariates('mahalanobis', 2)),
  mahalanobisFar: () => covariateEngine(demoWithCovariates('mahalanobis', 1, 1e20)),
};
for (let w = 0; w < 2; w++) for (const f of Object.values(covariateTasks)) f();
const covariateRounds: Record<keyof typeof covariateTasks, Timing>[] = [];
for (let r = 0; r < RUNS; r++) {
  covariateRounds.push({
    propensity: timeOnce(covariateTasks.propensity),
    propensityDoubled: timeOnce(covariateTasks.propensityDoubled),
    mahalanobis: timeOnce(covariateTasks.mahalanobis),
    mahalanobisDoubled: timeOnce(covariateTasks.mahalanobisDoubled),
    mahalanobisFar: timeOnce(covariateTasks.mahalanobisFar),
  });
}
const covariateDoubling = covariateRounds.map((t) => t.propensityDoubled.cpu / t.propensity.cpu);
const mahalanobisDoubling = covariateRounds.map((t) => t.mahalanobisDoubled.cpu / t.mahalanobis.cpu);
const mahalanobisFar = covariateRounds.map((t) => t.mahalanobisFar.cpu / t.mahalanobis.cpu);
const covariateMs = median(covariateRounds.map((t) => t.propensity.cpu));
const mahalanobisMs = median(covariateRounds.map((t) => t.mahalanobis.cpu));
const covariateBench = {
  plan: "demo plan's invented covariate variant (4 covariates, one unmeasured, one matched exactly; propensity caliper 0.2, Mahalanobis caliper 0.5)",
  replications: COVARIATE_REPS,
  propensityMsPerReplication: round(covariateMs / COVARIATE_REPS, 4),
  mahalanobisMsPerReplication: round(mahalanobisMs / COVARIATE_REPS, 4),
  doublingRatio: round(median(covariateDoubling), 3),
  mahalanobisDoublingRatio: round(median(mahalanobisDoubling), 3),
  mahalanobisFarRatio: round(median(mahalanobisFar), 3),
  roundRanges: {
    doublingRatio: range(covariateDoubling, 3),
    mahalanobisDoublingRatio: range(mahalanobisDoubling, 3),
    mahalanobisFarRatio: range(mahalanobisFar, 3),
  },
  targets: { doublingRatio: '<= 2.3', mahalanobisDoublingRatio: '<= 2.3', mahalanobisFarRatio: '<= 1.5' },
  met: {
    doublingRatio: median(covariateDoubling) <= 2.3,
    mahalanobisDoublingRatio: median(mahalanobisDoubling) <= 2.3,
    mahalanobisFarRatio: median(mahalanobisFar) <= 1.5,
  },
};

/**
 * INVENTED: a reading programme in 40 schools against 120 comparison schools, 25 pupils tested in
 * each, ICC .2, reliability .8; schools matched on their observed means (or pupils across schools,
 * the same pupils retested). `scale` multiplies the number of schools in both groups.
 */
function clusterBenchPlan(scale: number, level: 'clusters' | 'people'): Plan {
  const p = demoPlan();
  p.groups.programme = { ...p.groups.programme, poolSize: 25 * 40 * scale, pretestMean: 92, pretestSD: 15 };
  p.groups.comparison = { ...p.groups.comparison, poolSize: 25 * 120 * scale, pretestMean: 100, pretestSD: 15 };
  p.pretest = { reliability: 0.8, referenceSD: 15 };
  p.outcome = { ...p.outcome, posttestSD: 15, prePostCorrelation: 0.8 };
  p.matching = { method: 'nearest', caliper: 0.2, ratio: 1, replacement: false, order: 'random', level };
  p.covariates = undefined;
  p.covariateCorrelations = undefined;
  p.clusters = { size: 25, pretestICC: 0.2, cohort: level === 'clusters' ? 'new' : 'same' };
  return p;
}
const CLUSTER_REPS = 100;
function clusterEngine(p: Plan): void {
  const run = createPlanSimulation(p, { replications: CLUSTER_REPS });
  run.runChunk(0, CLUSTER_REPS);
  sink += run.finish().replications;
}
const clusterTasks = {
  clusters: () => clusterEngine(clusterBenchPlan(1, 'clusters')),
  clustersDoubled: () => clusterEngine(clusterBenchPlan(2, 'clusters')),
  people: () => clusterEngine(clusterBenchPlan(1, 'people')),
  peopleDoubled: () => clusterEngine(clusterBenchPlan(2, 'people')),
};
for (let w = 0; w < 2; w++) for (const f of Object.values(clusterTasks)) f();
const clusterRounds: Record<keyof typeof clusterTasks, Timing>[] = [];
for (let r = 0; r < RUNS; r++) {
  clusterRounds.push({
    clusters: timeOnce(clusterTasks.clusters),
    clustersDoubled: timeOnce(clusterTasks.clustersDoubled),
    people: timeOnce(clusterTasks.people),
    peopleDoubled: timeOnce(clusterTasks.peopleDoubled),
  });
}
const clusterDoubling = clusterRounds.map((t) => t.clustersDoubled.cpu / t.clusters.cpu);
const peopleDoubling = clusterRounds.map((t) => t.peopleDoubled.cpu / t.people.cpu);
const clusterBench = {
  plan: 'invented clusters plan (40 programme and 120 comparison schools of 25; schools matched on their means, or pupils across schools)',
  replications: CLUSTER_REPS,
  clustersMsPerReplication: round(median(clusterRounds.map((t) => t.clusters.cpu)) / CLUSTER_REPS, 4),
  peopleMsPerReplication: round(median(clusterRounds.map((t) => t.people.cpu)) / CLUSTER_REPS, 4),
  doublingRatio: round(median(clusterDoubling), 3),
  peopleDoublingRatio: round(median(peopleDoubling), 3),
  roundRanges: { doublingRatio: range(clusterDoubling, 3), peopleDoublingRatio: range(peopleDoubling, 3) },
  targets: { doublingRatio: '<= 2.3', peopleDoublingRatio: '<= 2.3' },
  met: { doublingRatio: median(clusterDoubling) <= 2.3, peopleDoublingRatio: median(peopleDoubling) <= 2.3 },
};

// The worker pool (scripts/bench/parallel.ts: wall-clock, on worker threads).
const parallel = await parallelBench();
// The command line's start-up (scripts/bench/cliStart.ts: cliStartRatio, cliNoSimSeconds; wall time).
const cliStart = await cliStartBench();

const propensity = await propensityBench(); // scripts/bench/propensity.ts: propensityRatio and friends
const out = {
  plan: 'demo plan (180 programme, 1,200 comparison; nearest 1:1, caliper 0.2, no replacement)',
  replications: REPS,
  engineMs: round(tEngine),
  engineMsPerReplication: round(tEngine / REPS, 4),
  normalsOnlyMs: round(tNormals),
  doubledPoolsMs: round(tDoubled),
  naiveMsPerReplication: round(tNaive / NAIVE_REPS, 4),
  floorRatio: round(floorRatio, 3),
  naiveSpeedup: round(naiveSpeedup, 2),
  doublingRatio: round(doublingRatio, 3),
  targets: { floorRatio: '<= 2', naiveSpeedup: '>= 20', doublingRatio: '<= 2.3' },
  roundRanges: {
    floorRatio: range(cpuRatios.floor, 3),
    naiveSpeedup: range(cpuRatios.naive, 2),
    doublingRatio: range(cpuRatios.doubling, 3),
  },
  wallClockRatios: wall,
  met: { floorRatio: floorRatio <= 2, naiveSpeedup: naiveSpeedup >= 20, doublingRatio: doublingRatio <= 2.3 },
  covariates: covariateBench,
  clusters: clusterBench,
  ...parallel,
  cliStartRatio: cliStart.cliStartRatio,
  cliNoSimSeconds: cliStart.cliNoSimSeconds,
  cliStart,
  propensity,
  // The design explorer in a real browser (scripts/bench/browserGrid.ts): gridRatio <= 1, longestTaskMs <= 50.
  ...(await browserGridBench()),
};

function round(x: number, d = 1): number {
  const f = 10 ** d;
  return Math.round(x * f) / f;
}

if (json) {
  process.stdout.write(`${JSON.stringify(out)}\n`);
} else {
  const line = (name: string, value: number, target: string, ok: boolean, meaning: string) =>
    console.log(`${name.padEnd(14)} ${value.toFixed(2).padStart(7)}  target ${target.padEnd(6)} ${ok ? 'met' : 'NOT met'}\n  ${meaning}`);
  console.log(`Monte Carlo engine benchmark: ${out.plan}, ${REPS} replications, median over ${RUNS} interleaved rounds (CPU time) after a warm-up`);
  console.log(`engine ${out.engineMs} ms (${out.engineMsPerReplication} ms per replication); normals alone ${out.normalsOnlyMs} ms; doubled pools ${out.doubledPoolsMs} ms; naive ${out.naiveMsPerReplication} ms per replication`);
  line('floorRatio', floorRatio, '<= 2', out.met.floorRatio, 'engine time ÷ time just to draw the normal variates it needs (1 = nothing but sampling)');
  line('naiveSpeedup', naiveSpeedup, '>= 20', out.met.naiveSpeedup, 'straightforward baseline (Math.random, objects, linear-scan matching) ÷ engine, per replication');
  console.log(`(wall-clock ratios, for comparison: floor ${wall.floorRatio}, naive ${wall.naiveSpeedup}, doubling ${wall.doublingRatio})`);
  line('doublingRatio', doublingRatio, '<= 2.3', out.met.doublingRatio, 'engine time with both pools doubled ÷ engine time (2 = linear; O(n^2) would give 4)');
  const c = covariateBench;
  console.log(`\nSeveral-covariate engine: ${c.plan}, ${c.replications} replications, median over ${RUNS} rounds (CPU time)`);
  console.log(`propensity ${c.propensityMsPerReplication} ms per replication; Mahalanobis ${c.mahalanobisMsPerReplication} ms per replication`);
  line('covariates.doublingRatio', c.doublingRatio, '<= 2.3', c.met.doublingRatio, `propensity matching, pools doubled ÷ as given (2 = linear; quadratic would give 4); rounds ${c.roundRanges.doublingRatio.join('–')}`);
  line('covariates.mahalanobisDoublingRatio', c.mahalanobisDoublingRatio, '<= 2.3', c.met.mahalanobisDoublingRatio, `Mahalanobis matching (k-d tree), pools doubled ÷ as given (2 = linear; quadratic would give 4); rounds ${c.roundRanges.mahalanobisDoublingRatio.join('–')}`);
  line('covariates.mahalanobisFarRatio', c.mahalanobisFarRatio, '<= 1.5', c.met.mahalanobisFarRatio, `Mahalanobis matching with the comparison pretest mean at 1e20 ÷ as given (the search does not grow with the coordinates' size); rounds ${c.roundRanges.mahalanobisFarRatio.join('–')}`);
  const k = clusterBench;
  console.log(`\nClusters design (pools engine): ${k.plan}, ${k.replications} replications, median over ${RUNS} rounds (CPU time)`);
  console.log(`schools matched ${k.clustersMsPerReplication} ms per replication; pupils matched ${k.peopleMsPerReplication} ms per replication`);
  line('clusters.doublingRatio', k.doublingRatio, '<= 2.3', k.met.doublingRatio, `twice the schools in both groups ÷ as given (2 = linear); rounds ${k.roundRanges.doublingRatio.join('–')}`);
  line('clusters.peopleDoublingRatio', k.peopleDoublingRatio, '<= 2.3', k.met.peopleDoublingRatio, `pupils matched across schools, twice the schools ÷ as given; rounds ${k.roundRanges.peopleDoublingRatio.join('–')}`);
  const p = parallel.parallelDetail;
  console.log(`\nWorker pool: ${p.plan}, ${p.replications} replications, ${p.measure}; 1 worker ${p.medianSeconds.oneWorker} s, 2 workers ${p.medianSeconds.twoWorkers} s`);
  line('parallelEfficiency', parallel.parallelEfficiency, '>= 0.8', p.met, `speedup on 2 worker threads ÷ 2; same numbers bit for bit: ${parallel.parallelIdentical ? 'yes' : 'NO'}; rounds ${p.roundRange.join('–')}`);
  console.log(`  all ${parallel.parallelEfficiencyAllCores.workers} cores: efficiency ${parallel.parallelEfficiencyAllCores.efficiency} (speedup ÷ workers, no target)`);
  console.log(`\nCommand-line start (wall time, median of ${cliStart.rounds} interleaved rounds; ${cliStart.ran} CLI, code cache ${cliStart.codeCache}): ${cliStart.cliNoSimSeconds} s for run --no-sim, bare node ${cliStart.bareNodeSeconds} s`);
  line('cliStart.cliStartRatio', cliStart.cliStartRatio, '<= 4', cliStart.met.cliStartRatio, `${cliStart.command}; rounds ${cliStart.roundRange.join('–')}`);
  console.log(`\nPropensity engine (scripts/bench/propensity.ts), CPU time: ${JSON.stringify(propensity)}`);
}
if (!json) console.log(`\nDesign explorer in the browser (wall clock): ${JSON.stringify(out.browserGrid)}`);
if (sink === 42.4242) console.log(''); // use the sink
