import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { createMatchingWorkspace, matchOnPretest } from '../../src/sim/matchOnPretest';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import type { MatchingMethod } from '../../src/core/plan';
import type { RandomSource } from '../../src/sim/randomSource';

/**
 * Naive O(n_P · n_C · k) reference for greedy caliper matching, written
 * straight from the definition (Cochran & Rubin 1973, caliper matching;
 * common practice for greedy 1:k matching): for each programme member in
 * order, each of its k partners is chosen among comparison members still
 * available with x - c <= x_c <= x + c, either the closest (earliest in
 * ascending order on ties) or the j-th in ascending order with
 * j = floor(U · count).
 */
function naiveMatch(
  comparisonX: number[],
  programmeX: number[],
  caliper: number,
  method: MatchingMethod,
  replacement: boolean,
  ratio: number,
  rng: RandomSource,
): number[][] {
  const usedGlobally = new Array<boolean>(comparisonX.length).fill(false);
  const result: number[][] = [];
  for (const x of programmeX) {
    const mine: number[] = [];
    for (let j = 0; j < ratio; j++) {
      const eligible: number[] = [];
      comparisonX.forEach((c, idx) => {
        const free = replacement ? !mine.includes(idx) : !usedGlobally[idx];
        if (free && c >= x - caliper && c <= x + caliper) eligible.push(idx);
      });
      if (eligible.length === 0) break;
      let pick: number;
      if (method === 'nearest') {
        pick = eligible[0] as number;
        for (const idx of eligible) {
          if (Math.abs((comparisonX[idx] as number) - x) < Math.abs((comparisonX[pick] as number) - x)) pick = idx;
        }
      } else {
        pick = eligible[Math.floor(rng.nextFloat() * eligible.length)] as number;
      }
      mine.push(pick);
      usedGlobally[pick] = true;
    }
    result.push(mine);
  }
  return result;
}

function fastMatch(
  comparisonX: number[],
  programmeX: number[],
  caliper: number,
  method: MatchingMethod,
  replacement: boolean,
  ratio: number,
  rng: RandomSource,
): { sets: number[][]; matched: number } {
  const ws = createMatchingWorkspace(programmeX.length, comparisonX.length, ratio);
  const matched = matchOnPretest(
    Float64Array.from(comparisonX),
    Float64Array.from(programmeX),
    caliper,
    method,
    replacement,
    rng,
    ws,
  );
  const sets = programmeX.map((_, i) => Array.from(ws.partners.subarray(i * ratio, i * ratio + (ws.partnerCount[i] as number))));
  return { sets, matched };
}

describe('matchOnPretest (O(n log n)) against the naive O(n^2) definition', () => {
  // Exact equality: both consume the same random stream in the same order.
  // Comparison scores are distinct (continuous pretests tie with probability 0);
  // a few programme scores are drawn from the comparison scores to exercise zero distances and caliper edges.
  const scenario = fc
    .record({
      comparison: fc.uniqueArray(fc.integer({ min: -400, max: 400 }), { minLength: 1, maxLength: 40 }),
      programme: fc.array(fc.integer({ min: -450, max: 450 }), { minLength: 1, maxLength: 30 }),
      caliper: fc.integer({ min: 0, max: 120 }),
      method: fc.constantFrom<MatchingMethod>('nearest', 'random-within-caliper'),
      replacement: fc.boolean(),
      ratio: fc.integer({ min: 1, max: 5 }),
      seed: fc.integer({ min: 0, max: 2 ** 31 }),
      scale: fc.constantFrom(1, 0.1, 0.37),
    })
    .map((s) => ({
      ...s,
      comparison: s.comparison.map((v) => v * s.scale).sort((a, b) => a - b),
      programme: s.programme.map((v) => v * s.scale),
      caliper: s.caliper * s.scale,
    }));

  it('gives identical matched sets for random small cases (500 cases)', () => {
    fc.assert(
      fc.property(scenario, (s) => {
        const a = fastMatch(s.comparison, s.programme, s.caliper, s.method, s.replacement, s.ratio, Xoshiro128StarStar.forReplication(s.seed, 0));
        const b = naiveMatch(s.comparison, s.programme, s.caliper, s.method, s.replacement, s.ratio, Xoshiro128StarStar.forReplication(s.seed, 0));
        expect(a.sets).toEqual(b);
        expect(a.matched).toBe(b.filter((m) => m.length > 0).length);
      }),
      { numRuns: 500, seed: 4242 },
    );
  });

  it('matches a hand-worked case and discards a member with no partner in the caliper', () => {
    // Hand-worked: comparison 1, 2, 3; programme 2.1 then 2.2; caliper 0.5; nearest, no replacement.
    // 2.1 takes 2 (index 1); for 2.2 the nearest left, 3, is 0.8 away (> 0.5): discarded.
    const r = fastMatch([1, 2, 3], [2.1, 2.2], 0.5, 'nearest', false, 1, Xoshiro128StarStar.forReplication(1, 0));
    expect(r.sets).toEqual([[1], []]);
    expect(r.matched).toBe(1);
  });

  it('shows why greedy order matters without replacement: the first member takes the shared partner', () => {
    // Hand-worked: one comparison member at 0 within caliper of both programme members.
    const first = fastMatch([0], [0.1, -0.3], 0.5, 'nearest', false, 1, Xoshiro128StarStar.forReplication(1, 0));
    const second = fastMatch([0], [-0.3, 0.1], 0.5, 'nearest', false, 1, Xoshiro128StarStar.forReplication(1, 0));
    expect(first.sets).toEqual([[0], []]);
    expect(second.sets).toEqual([[0], []]);
  });

  it('rejects a negative caliper with a clear message', () => {
    expect(() => fastMatch([0], [0], -1, 'nearest', false, 1, Xoshiro128StarStar.forReplication(1, 0))).toThrow(
      /caliper must be a non-negative number/,
    );
  });
});
