import { describe, expect, it } from 'vitest';
import { designAnalysisIds } from '../../src/core/design/studyDesign';
import type { Plan } from '../../src/core/plan';
import { demoPlan } from '../../src/io/demoPlan';
import { createSimulation } from '../../src/sim/createSimulation';
import { createPoolsSimulation } from '../../src/sim/design/createPoolsSimulation';
import { existingGroupsPoolDrawer } from '../../src/sim/design/existingGroupsPoolDrawer';
import { createPoolsMatching, matchPoolsOnPretest } from '../../src/sim/design/matchPoolsOnPretest';
import { selectionPoolDrawer } from '../../src/sim/design/selectionPoolDrawer';
import { SortedValuesIndex } from '../../src/sim/design/sortedValuesIndex';
import { estimatePlannedProcedure } from '../../src/sim/estimatePlannedProcedure';
import { createPlanSimulation } from '../../src/sim/multivariate/createPlanSimulation';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { isFeasible, type SimAnalysisResult, type SimulationResult } from '../../src/sim/types';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { mulberry32 } from '../core/independentNormals';
import { selectionPlan } from './selectionFixtures';

function runInChunks(plan: Plan, total: number, seed: number, cuts: number[]): SimulationResult {
  const run = createPlanSimulation(plan, { replications: total, seed });
  let from = 0;
  for (const to of [...cuts, total]) {
    run.runChunk(from, to);
    from = to;
  }
  run.runChunk(3, 9); // re-running replications changes nothing
  return run.finish();
}

describe('pools engine: determinism (each replication from its own stream)', () => {
  const plans: [string, Plan][] = [
    ['probability rule, random order, no replacement', selectionPlan({ assignment: { rule: 'probability', basis: 'pretest', cutOff: 45, side: 'below', spread: 5 }, poolSize: 600 })],
    ['screener rule, random within caliper, with replacement, 1:3', selectionPlan({ assignment: { rule: 'cut-off', basis: 'screener', cutOff: 45, side: 'below', screenerReliability: 0.7 }, poolSize: 600, matching: { method: 'random-within-caliper', replacement: true, ratio: 3 } })],
    ['true-score rule, highest-first', selectionPlan({ assignment: { rule: 'cut-off', basis: 'true-score', cutOff: 55, side: 'above' }, poolSize: 600, matching: { order: 'highest-first', ratio: 2 } })],
    ['one group', selectionPlan({ design: 'one-group', assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 42, side: 'below' }, poolSize: 600 })],
  ];
  for (const [name, plan] of plans) {
    it(`chunked runs are bit-identical to one run: ${name}`, () => {
      const whole = simulatePlan(plan, { replications: 60, seed: 9, chunkSize: 60 });
      expect(runInChunks(plan, 60, 9, [1, 17, 40])).toEqual(whole);
      expect(simulatePlan(plan, { replications: 60, seed: 9, chunkSize: 7 })).toEqual(whole);
      // Another seed gives other numbers (the check above can fail).
      expect(simulatePlan(plan, { replications: 60, seed: 10 }).estimates).not.toEqual(whole.estimates);
    });
  }
  it('the existing-groups drawer is deterministic across chunkings too', () => {
    const plan = demoPlan();
    const one = createPoolsSimulation(plan, { replications: 30, seed: 4 }, existingGroupsPoolDrawer(plan));
    one.runChunk(0, 30);
    const two = createPoolsSimulation(plan, { replications: 30, seed: 4 }, existingGroupsPoolDrawer(plan));
    two.runChunk(20, 30);
    two.runChunk(0, 20);
    expect(two.finish()).toEqual(one.finish());
  });
});

describe('pools engine: designs and their analyses', () => {
  it('a sharp cut-off on the pretest: the matched analyses are not feasible (no overlap), everything else is reported', () => {
    const plan = selectionPlan({ assignment: { rule: 'cut-off', basis: 'pretest', cutOff: 44, side: 'below' }, poolSize: 600 });
    const r = simulatePlan(plan, { replications: 50, seed: 3 });
    const md = r.analyses.matchedDifference as SimAnalysisResult;
    expect(isFeasible(md)).toBe(false);
    if (!isFeasible(md)) expect(md.reason).toContain('no overlap');
    expect(isFeasible(r.ancovaMatchedSample)).toBe(false);
    for (const id of ['ancova', 'gainScore', 'correctedAncova', 'regressionDiscontinuity'] as const) {
      expect(isFeasible(r.analyses[id] as SimAnalysisResult), id).toBe(true);
    }
    expect(r.matching.replicationsWithMatches).toBe(0);
  });

  it('a probability rule on the pretest overlaps: programme members are matched, the discarded share is per replication', () => {
    const plan = selectionPlan({ assignment: { rule: 'probability', basis: 'pretest', cutOff: 45, side: 'below', spread: 5 }, poolSize: 600 });
    const r = simulatePlan(plan, { replications: 50, seed: 3 });
    expect(isFeasible(r.analyses.matchedDifference as SimAnalysisResult)).toBe(true);
    expect(r.matching.discardedProgrammeShare).toBeGreaterThanOrEqual(0);
    expect(r.matching.discardedProgrammeShare).toBeLessThan(1);
    expect(r.example.pairs.length).toBeGreaterThan(0);
    // Every example pair is within the caliper of its partners (caliper 0.2 pooled SDs; the pooled SD is below the population's 10).
    for (const p of r.example.pairs) for (const c of p.comparison) expect(Math.abs(p.programme.observed - c.observed)).toBeLessThanOrEqual(0.2 * 10);
  });

  it('the analyses simulated are exactly the design\u2019s (designAnalysisIds)', () => {
    for (const plan of [
      selectionPlan({ assignment: { rule: 'cut-off', basis: 'true-score', cutOff: 45, side: 'below' }, poolSize: 400 }),
      selectionPlan({ design: 'one-group', poolSize: 400 }),
      selectionPlan({ assignment: { rule: 'cut-off', basis: 'screener', cutOff: 45, side: 'below', screenerReliability: 0.6 }, poolSize: 400 }),
    ]) {
      const r = simulatePlan(plan, { replications: 20, seed: 1 });
      expect(Object.keys(r.analyses).sort()).toEqual([...designAnalysisIds(plan)].sort());
    }
  });

  it('quick figures: the matched difference for a two-group rule; nothing (and no failure) for a one-group study', () => {
    const two = estimatePlannedProcedure(selectionPlan({ assignment: { rule: 'probability', basis: 'screener', cutOff: 45, side: 'below', spread: 3, screenerReliability: 0.7 }, poolSize: 800 }));
    const md = two.analyses.matchedDifference;
    expect(md && 'meanEstimate' in md ? Number.isFinite(md.meanEstimate) : false).toBe(true);
    const one = estimatePlannedProcedure(selectionPlan({ design: 'one-group', poolSize: 800 }));
    expect(one.analyses).toEqual({});
    const sharp = estimatePlannedProcedure(selectionPlan({ poolSize: 800 }));
    expect(sharp.analyses.matchedDifference && 'infeasible' in sharp.analyses.matchedDifference).toBe(true);
  });
});

describe('pools engine: the existing-groups drawer agrees with the one-pretest engine', () => {
  it('demo plan: every analysis and the matched count within 3 combined MC SEs of createSimulation', () => {
    // Two independent simulations of the same model (deriveModelParameters) and procedure: their means differ by
    // Monte Carlo error only, SD sqrt(MCSE₁² + MCSE₂²) (Morris, White & Crowther 2019, Table 6).
    const plan = demoPlan();
    const fast = createSimulation(plan, { replications: 400, seed: 11 });
    fast.runChunk(0, 400);
    const pools = createPoolsSimulation(plan, { replications: 400, seed: 12 }, existingGroupsPoolDrawer(plan));
    pools.runChunk(0, 400);
    const a = fast.finish();
    const b = pools.finish();
    const pairs: [string, SimAnalysisResult, SimAnalysisResult][] = designAnalysisIds(plan).map((id) => [id, a.analyses[id] as SimAnalysisResult, b.analyses[id] as SimAnalysisResult]);
    pairs.push(['ancovaMatchedSample', a.ancovaMatchedSample, b.ancovaMatchedSample]);
    for (const [id, x, y] of pairs) {
      if (!isFeasible(x) || !isFeasible(y)) throw new Error(`${id} not simulated`);
      expect(Math.abs(x.meanEstimate - y.meanEstimate), id).toBeLessThanOrEqual(3 * Math.hypot(x.meanEstimateMCSE, y.meanEstimateMCSE));
      expect(Math.abs(x.empiricalSE - y.empiricalSE), id).toBeLessThanOrEqual(3 * Math.hypot(x.empiricalSEMCSE, y.empiricalSEMCSE));
    }
    const ma = a.matching;
    const mb = b.matching;
    expect(Math.abs(ma.meanMatchedProgramme - mb.meanMatchedProgramme)).toBeLessThanOrEqual(3 * Math.hypot(ma.meanMatchedProgrammeMCSE, mb.meanMatchedProgrammeMCSE) + 1e-9);
    expect(Math.abs(ma.trueDifferenceAfter - mb.trueDifferenceAfter)).toBeLessThanOrEqual(3 * Math.hypot(ma.trueDifferenceAfterMCSE, mb.trueDifferenceAfterMCSE));
  });
});

describe('pools matching: sorted and unsorted paths against brute-force greedy matching', () => {
  /** Greedy caliper matching by brute force (common practice): each member in order takes the nearest available within the caliper. */
  function bruteForce(x: number[], nC: number, order: number[], caliper: number, k: number, replacement: boolean): number[][] {
    const used = new Set<number>();
    return order.map((j) => {
      const mine = new Set<number>();
      const got: number[] = [];
      while (got.length < k) {
        let best = -1;
        for (let c = 0; c < nC; c++) {
          if ((replacement ? mine : used).has(c)) continue;
          const d = Math.abs((x[c] as number) - (x[nC + j] as number));
          if (d > caliper) continue;
          if (best < 0 || d < Math.abs((x[best] as number) - (x[nC + j] as number)) || (d === Math.abs((x[best] as number) - (x[nC + j] as number)) && (x[c] as number) < (x[best] as number))) best = c;
        }
        if (best < 0) break;
        got.push(best);
        mine.add(best);
        used.add(best);
      }
      return got;
    });
  }

  it('nearest, lowest-first, with and without replacement, 1:1 and 1:2, sorted and unsorted pools', () => {
    const rand = mulberry32(5);
    for (let trial = 0; trial < 40; trial++) {
      const nC = 5 + Math.floor(rand() * 60);
      const nP = 1 + Math.floor(rand() * 30);
      const xc = Array.from({ length: nC }, () => 50 + 10 * (rand() - 0.5) * 2).sort((a, b) => a - b);
      const xp = Array.from({ length: nP }, () => 45 + 10 * (rand() - 0.5) * 2).sort((a, b) => a - b);
      const k = 1 + (trial % 2);
      const replacement = trial % 3 === 0;
      const caliper = 0.5 + rand();
      const order = Array.from({ length: nP }, (_, j) => j); // lowest-first on ascending programme rows
      const expected = bruteForce([...xc, ...xp], nC, order, caliper, k, replacement);
      for (const sorted of [true, false]) {
        // Unsorted path: shuffle each group's rows, then map back.
        const permC = Array.from({ length: nC }, (_, j) => j);
        const permP = Array.from({ length: nP }, (_, j) => j);
        if (!sorted) {
          permC.sort(() => rand() - 0.5);
          permP.sort(() => rand() - 0.5);
        }
        const x = Float64Array.from([...permC.map((j) => xc[j] as number), ...permP.map((j) => xp[j] as number)]);
        const ws = createPoolsMatching(nC + nP, k);
        matchPoolsOnPretest(x, nC, nP, { caliper, method: 'nearest', replacement, order: 'lowest-first' }, new Xoshiro128StarStar(), ws, sorted);
        for (let q = 0; q < nP; q++) {
          const row = permP.indexOf(q);
          const got = Array.from(ws.partners.subarray(row * k, row * k + (ws.partnerCount[row] as number)), (c) => permC[c] as number);
          expect(got, `trial ${trial}, sorted ${sorted}, member ${q}`).toEqual(expected[q]);
        }
      }
    }
  });

  it('SortedValuesIndex finds the same positions as binary search (ties, ends, repeated values)', () => {
    const rand = mulberry32(8);
    const idx = new SortedValuesIndex(200);
    for (let trial = 0; trial < 50; trial++) {
      const n = Math.floor(rand() * 120);
      const v = Float64Array.from({ length: n }, () => Math.round(rand() * 40) / 4).sort();
      idx.index(v, n);
      for (let t = 0; t < 30; t++) {
        const x = Math.round((rand() * 14 - 2) * 4) / 4;
        expect(idx.lowerBound(x)).toBe(v.findIndex((y) => y >= x) < 0 ? n : v.findIndex((y) => y >= x));
        expect(idx.upperBound(x)).toBe(v.findIndex((y) => y > x) < 0 ? n : v.findIndex((y) => y > x));
      }
    }
  });
});

describe('the selection drawer', () => {
  it('draws the whole population each replication, each group ascending by pretest', () => {
    const plan = selectionPlan({ assignment: { rule: 'probability', basis: 'screener', cutOff: 45, side: 'below', spread: 4, screenerReliability: 0.7 }, poolSize: 500 });
    const d = selectionPoolDrawer(plan);
    expect(d.capacity).toBe(500);
    const run = createPoolsSimulation(plan, { replications: 2, seed: 1 }, d);
    run.runChunk(0, 2);
    expect(run.finish().analyses.regressionDiscontinuity).toBeDefined();
  });
});
