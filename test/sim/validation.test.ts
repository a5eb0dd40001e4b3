import { describe, expect, it } from 'vitest';
import { simulatePlan } from '../../src/sim/simulatePlan';
import { createSimulation } from '../../src/sim/createSimulation';
import { testPlan } from './planFixtures';
import { isFeasible } from '../../src/sim/types';

// Bad input gets a specific message naming the field, the valid range and the value given (DESIGN.md).
describe('clear messages for bad simulation settings', () => {
  const base = testPlan({ nP: 20, nC: 50, replications: 10 });
  it.each([
    [{ replications: 1 }, /number of simulated replications must be a whole number from 2 to 1,000,000; got 1/],
    [{ replications: 2.5 }, /got 2.5/],
    [{ seed: 1.5 }, /simulation seed must be a whole number; got 1.5/],
  ])('options %o', (opts, msg) => {
    expect(() => simulatePlan(base, opts)).toThrow(msg);
  });

  it('names a bad ratio, caliper, order and reliability', () => {
    expect(() => simulatePlan({ ...base, matching: { ...base.matching, ratio: 7 } })).toThrow(
      'Comparison partners per programme member must be a whole number from 1 to 5; got 7.',
    );
    expect(() => simulatePlan({ ...base, matching: { ...base.matching, caliper: -0.2 } })).toThrow(/caliper.*positive number; got -0.2/);
    expect(() => simulatePlan({ ...base, analysis: { ...base.analysis, assumedReliability: 1.4 } })).toThrow(
      /between 0 and 1 \(exclusive of 0\); got 1.4/,
    );
    expect(() => simulatePlan({ ...base, groups: { ...base.groups, comparison: { ...base.groups.comparison, poolSize: 1 } } })).toThrow(
      /comparison pool size must be a whole number of at least 2; got 1/,
    );
  });

  it('passes on the model’s own message for impossible inputs (r^2 > reliability)', () => {
    expect(() => simulatePlan(testPlan({ reliability: 0.5, r: 0.8 }))).toThrow(/cannot exceed the square root of its reliability/);
  });

  it('explains when almost no one can be matched instead of returning NaN, and still reports the other analyses', () => {
    // Pools 10 SD apart with a 0.01 SD caliper: no programme member finds a partner.
    const plan = testPlan({ nP: 20, nC: 50, meanP: 0, meanC: 100, replications: 5, matching: { caliper: 0.01 } });
    const r = simulatePlan(plan);
    const md = r.analyses.matchedDifference!;
    expect(isFeasible(md)).toBe(false);
    expect(md).not.toHaveProperty('meanEstimate');
    expect(!isFeasible(md) && md.reason).toMatch(/matched post-test difference could be computed in only 0 of 5 simulated studies/);
    expect(isFeasible(r.ancovaMatchedSample)).toBe(false);
    for (const id of ['ancova', 'gainScore', 'correctedAncova'] as const) {
      const s = r.analyses[id]!;
      expect(isFeasible(s) && s.replications).toBe(5);
      expect(isFeasible(s) && Number.isFinite(s.meanEstimate)).toBe(true);
    }
  });

  it('an analysis computed in only some replications is summarised over those, and the others over all', () => {
    // Pools 2.5 SD apart, 10 programme members, caliper 0.05 SD: two or more matched sets in only some
    // replications (94 of 200 with this seed); the full-pool analyses are computed in all of them.
    const plan = testPlan({ nP: 10, nC: 40, meanP: 25, meanC: 50, replications: 200, seed: 3, matching: { caliper: 0.05 } });
    const r = simulatePlan(plan);
    const md = r.analyses.matchedDifference!;
    expect(isFeasible(md) && md.replications > 1 && md.replications < 200).toBe(true);
    expect(isFeasible(md) && Number.isFinite(md.coverage)).toBe(true);
    expect(r.estimates.matchedDifference!.length).toBe(md.replications);
    for (const id of ['ancova', 'gainScore', 'correctedAncova'] as const) {
      expect(r.analyses[id]!.replications).toBe(200);
      expect(isFeasible(r.analyses[id]!)).toBe(true);
    }
  });

  it('refuses to summarise before every replication has run', () => {
    const run = createSimulation(base);
    run.runChunk(0, 3);
    expect(() => run.finish()).toThrow('Only 3 of 10 replications have run; cannot summarise yet.');
    expect(() => run.runChunk(5, 11)).toThrow(/outside 0..10/);
  });
});
