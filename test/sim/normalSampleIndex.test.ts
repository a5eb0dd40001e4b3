import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { NormalSampleIndex } from '../../src/sim/normalSampleIndex';
import { createMatchingWorkspace, matchOnPretest } from '../../src/sim/matchOnPretest';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import type { MatchingMethod } from '../../src/core/plan';

/** Reference lower/upper bound by linear scan (definition; common practice). */
function firstIndex(sorted: number[], pred: (v: number) => boolean): number {
  const i = sorted.findIndex(pred);
  return i < 0 ? sorted.length : i;
}

describe('NormalSampleIndex', () => {
  it('indexes already-sorted values for the same bounds as a linear scan (fast-check, 300 cases)', () => {
    // Reference: a linear scan (definition). indexSorted must not move the values.
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -50, max: 50, noNaN: true }), { minLength: 1, maxLength: 300 }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 1, maxLength: 20 }),
        (zs, mean, sd, queries) => {
          const sorted = Float64Array.from(zs.map((v) => mean + sd * v)).sort();
          const copy = Array.from(sorted);
          const index = new NormalSampleIndex(sorted.length);
          index.indexSorted(sorted, mean, sd);
          expect(Array.from(sorted)).toEqual(copy);
          for (const q of [...queries, ...copy.slice(0, 5), mean]) {
            expect(index.lowerBound(q)).toBe(firstIndex(copy, (v) => v >= q));
            expect(index.upperBound(q)).toBe(firstIndex(copy, (v) => v > q));
          }
        },
      ),
      { numRuns: 300, seed: 12 },
    );
  });

  it('searches exactly when only every 2nd, 4th or 8th position is indexed (few searches), ties and all (fast-check, 300 cases)', () => {
    // Reference: a linear scan (definition). `searches` picks the stride; values rounded to make ties common.
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: 1, maxLength: 400 }),
        fc.double({ min: -100, max: 100, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        fc.integer({ min: 1, max: 40 }),
        fc.boolean(),
        fc.array(fc.double({ min: -1e4, max: 1e4, noNaN: true }), { minLength: 1, maxLength: 20 }),
        (zs, mean, sd, searches, ties, queries) => {
          const sorted = Float64Array.from(zs.map((v) => mean + sd * (ties ? Math.round(v * 4) / 4 : v))).sort();
          const copy = Array.from(sorted);
          const index = new NormalSampleIndex(sorted.length, searches);
          expect([1, 2, 4, 8]).toContain(index.stride);
          index.indexSorted(sorted, mean, sd);
          for (const q of [...queries, ...copy.slice(0, 8), ...copy.slice(-3), mean]) {
            expect(index.lowerBound(q)).toBe(firstIndex(copy, (v) => v >= q));
            expect(index.upperBound(q)).toBe(firstIndex(copy, (v) => v > q));
          }
        },
      ),
      { numRuns: 300, seed: 16 },
    );
    // The stride the engine's demo plan gets (1,200 searched 180 times): sqrt(2.5 · 1200 / 180) ≈ 4.1 → 4.
    expect(new NormalSampleIndex(1200, 180).stride).toBe(4);
    expect(new NormalSampleIndex(1200).stride).toBe(1);
    expect(new NormalSampleIndex(100000, 1).stride).toBe(8);
  });

  it('refuses to index values that are not ascending, naming the position', () => {
    const index = new NormalSampleIndex(3);
    expect(() => index.indexSorted(Float64Array.from([1, 3, 2]), 0, 1)).toThrow('Values to index must be in ascending order; position 2 holds 2 after 3.');
  });

  it('gives matchOnPretest exactly the partners binary search gives (fast-check, 200 cases)', () => {
    // Reference: matchOnPretest without the index (binary search), itself checked against the naive
    // definition in matchOnPretest.test.ts. Exact equality of partners and matched count.
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: 1, maxLength: 120 }),
        fc.array(fc.double({ min: -4, max: 4, noNaN: true }), { minLength: 1, maxLength: 40 }),
        fc.double({ min: 0, max: 2, noNaN: true }),
        fc.constantFrom<MatchingMethod>('nearest', 'random-within-caliper'),
        fc.boolean(),
        fc.integer({ min: 1, max: 3 }),
        (cz, px, caliper, method, replacement, ratio) => {
          const nC = cz.length;
          const xc = Float64Array.from(cz, (v) => 50 + 10 * v).sort();
          // Sized as the engine sizes it (one or two searches per programme member: strides 1 to 8).
          const index = new NormalSampleIndex(nC, method === 'nearest' ? px.length : 2 * px.length);
          index.indexSorted(xc, 50, 10);
          const xp = Float64Array.from(px.map((v) => 50 + 10 * v));
          const cal = caliper * 10;
          const wsA = createMatchingWorkspace(xp.length, nC, ratio);
          const wsB = createMatchingWorkspace(xp.length, nC, ratio);
          const a = matchOnPretest(xc, xp, cal, method, replacement, Xoshiro128StarStar.forReplication(3, 0), wsA);
          const b = matchOnPretest(xc, xp, cal, method, replacement, Xoshiro128StarStar.forReplication(3, 0), wsB, index);
          expect(b).toBe(a);
          expect(Array.from(wsB.partners)).toEqual(Array.from(wsA.partners));
          expect(Array.from(wsB.partnerCount)).toEqual(Array.from(wsA.partnerCount));
        },
      ),
      { numRuns: 200, seed: 5 },
    );
  });

  it('searches exactly beyond 65,536 values, where buckets hold more than one value each', () => {
    // Reference: a linear scan (exact equality), as above.
    const n = 70_000;
    const rng = Xoshiro128StarStar.forReplication(9, 0);
    const z = Float64Array.from({ length: n }, () => 6 * (rng.nextFloat() - 0.5));
    const expected = Float64Array.from(z, (v) => 100 + 15 * v).sort();
    const index = new NormalSampleIndex(n);
    index.indexSorted(expected, 100, 15);
    const sorted = Array.from(expected);
    for (const q of [55, 99.5, 100, sorted[1234] as number, 160]) {
      expect(index.lowerBound(q)).toBe(firstIndex(sorted, (v) => v >= q));
      expect(index.upperBound(q)).toBe(firstIndex(sorted, (v) => v > q));
    }
  });

  it('rejects a sample size that is not a positive whole number, with a readable message', () => {
    expect(() => new NormalSampleIndex(0)).toThrow('The sample size to sort must be a whole number of at least 1; got 0.');
  });
});
