import { describe, expect, it } from 'vitest';
import type { MatchingOrder } from '../../src/core/plan';
import type { MatchSettings } from '../../src/sim/multivariate/covariateMatching';
import { exactStrata, groupByStratum } from '../../src/sim/multivariate/exactStrata';
import { createMahalanobisMatchingWorkspace, matchOnMahalanobis } from '../../src/sim/multivariate/matchOnMahalanobis';
import { createScoreMatchingWorkspace, matchOnScore } from '../../src/sim/multivariate/matchOnScore';
import { createSortWorkspace, sortIndicesByScore } from '../../src/sim/multivariate/sortIndicesByScore';
import { NormalSampler } from '../../src/sim/normalSampler';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

/*
 * The matchers against brute-force O(n²) references written from the definitions
 * (greedy caliper matching: Cochran & Rubin 1973; Rosenbaum & Rubin 1985; Rubin 1980 for the
 * Mahalanobis metric; exact strata: common practice). Small random pools (invented data), every
 * method × replacement × order, with and without exact strata. Exact equality of every partner:
 * the references consume the random stream in the same order as the matchers.
 */

interface Pools {
  nP: number;
  nC: number;
  coords: Float64Array[];
  stratumColumn: Float64Array | null;
}

function randomPools(seed: number, nP: number, nC: number, dims: number, withStrata: boolean): Pools {
  const rng = Xoshiro128StarStar.forReplication(seed, 0);
  const z = new NormalSampler(rng);
  const N = nP + nC;
  const coords = Array.from({ length: dims }, () => new Float64Array(N));
  for (let i = 0; i < N; i++) {
    for (let d = 0; d < dims; d++) coords[d]![i] = z.next() + (i >= nC ? 0.4 : 0);
  }
  const stratumColumn = withStrata ? Float64Array.from({ length: N }, () => Math.floor(rng.nextFloat() * 3)) : null;
  return { nP, nC, coords, stratumColumn };
}

/** Programme processing order by the reference's definition. */
function programmeOrder(p: Pools, members: number[], order: MatchingOrder, replacement: boolean, score: Float64Array): number[] {
  if (replacement || order === 'random') return members;
  const sorted = [...members].sort((a, b) => (score[a]! - score[b]! !== 0 ? score[a]! - score[b]! : a - b));
  return order === 'highest-first' ? sorted.reverse() : sorted;
}

/** Strata in order of first appearance over the whole pool (comparison first), as exactStrata numbers them. */
function strataOf(p: Pools): number[][] {
  const N = p.nP + p.nC;
  if (!p.stratumColumn) return [Array.from({ length: N }, (_, i) => i)];
  const seen = new Map<number, number[]>();
  for (let i = 0; i < N; i++) {
    const v = p.stratumColumn[i]!;
    if (!seen.has(v)) seen.set(v, []);
    seen.get(v)!.push(i);
  }
  return [...seen.values()];
}

/** Brute-force greedy matching with a distance function. */
function bruteForce(
  p: Pools,
  dist: (a: number, b: number) => number,
  within: (programme: number, comparison: number) => boolean,
  settings: MatchSettings,
  k: number,
  rng: Xoshiro128StarStar,
  orderScore: Float64Array,
  randomList: 'by-score' | 'by-index',
  score: Float64Array | null,
): { partners: number[][]; matched: number } {
  const partners: number[][] = Array.from({ length: p.nP }, () => []);
  const used = new Set<number>();
  let matched = 0;
  for (const members of strataOf(p)) {
    const comp = members.filter((i) => i < p.nC);
    const prog = programmeOrder(p, members.filter((i) => i >= p.nC), settings.order, settings.replacement, orderScore);
    if (comp.length === 0) continue;
    for (const pi of prog) {
      const chosen: number[] = [];
      let eligible = comp.filter((c) => (settings.replacement || !used.has(c)) && within(pi, c));
      if (settings.method === 'nearest') {
        eligible.sort((a, b) => {
          const da = dist(pi, a);
          const db = dist(pi, b);
          if (da !== db) return da - db;
          // 1-D score ties: the lower score first (then index); Mahalanobis: lower index.
          return score ? score[a]! - score[b]! || a - b : a - b;
        });
        chosen.push(...eligible.slice(0, k));
      } else if (randomList === 'by-score') {
        // matchOnPretest: the floor(U × count)-th eligible in score order, drawn one at a time.
        eligible.sort((a, b) => score![a]! - score![b]! || a - b);
        while (chosen.length < k && eligible.length > 0) {
          const j = Math.floor(rng.nextFloat() * eligible.length);
          chosen.push(eligible[j]!);
          eligible = eligible.filter((_, q) => q !== j);
        }
      } else {
        // Partial Fisher–Yates over the eligible listed by index.
        eligible.sort((a, b) => a - b);
        const want = Math.min(k, eligible.length);
        for (let t = 0; t < want; t++) {
          const j = t + Math.floor(rng.nextFloat() * (eligible.length - t));
          [eligible[t], eligible[j]] = [eligible[j]!, eligible[t]!];
          chosen.push(eligible[t]!);
        }
      }
      partners[pi - p.nC] = chosen;
      if (chosen.length > 0) matched++;
      if (!settings.replacement) for (const c of chosen) used.add(c);
    }
  }
  return { partners, matched };
}

function strataFor(p: Pools): { ids: Int32Array | null; count: number } {
  if (!p.stratumColumn) return { ids: null, count: 1 };
  const ids = new Int32Array(p.nP + p.nC);
  const count = exactStrata([p.stratumColumn], p.nP + p.nC, ids);
  return { ids, count };
}

const combos: { method: MatchSettings['method']; replacement: boolean; order: MatchingOrder; k: number }[] = [];
for (const method of ['nearest', 'random-within-caliper'] as const) {
  for (const replacement of [false, true]) {
    for (const order of ['random', 'lowest-first', 'highest-first'] as const) {
      for (const k of [1, 3]) combos.push({ method, replacement, order, k });
    }
  }
}

describe('exact strata and the score sort', () => {
  it('numbers strata by first appearance and groups them stably (hand-worked)', () => {
    const out = new Int32Array(6);
    const count = exactStrata([Float64Array.of(0, 1, 0, 2, 1, 0), Float64Array.of(5, 5, 6, 5, 5, 5)], 6, out);
    // Pairs (0,5) (1,5) (0,6) (2,5) (1,5) (0,5) → strata 0 1 2 3 1 0.
    expect(count).toBe(4);
    expect([...out]).toEqual([0, 1, 2, 3, 1, 0]);
    const order = new Int32Array(6);
    const start = new Int32Array(5);
    groupByStratum(out, 0, 6, 4, order, start);
    expect([...order]).toEqual([0, 5, 1, 4, 2, 3]);
    expect([...start]).toEqual([0, 2, 4, 5, 6]);
  });

  it('sorts indices exactly as the built-in comparison sort, ties by position (common practice)', () => {
    const rng = Xoshiro128StarStar.forReplication(3, 1);
    const z = new NormalSampler(rng);
    const ws = createSortWorkspace(400);
    const kinds = [
      // normal scores with exact ties and near-ties (differences far below the quantisation level)
      () => Math.floor(z.next() * 5) + (rng.nextFloat() < 0.3 ? 1e-12 * rng.nextFloat() : 0),
      // whole numbers (grid cells) over a wide span, with repeats
      () => Math.floor(rng.nextFloat() * 50) * 2 ** 30 + Math.floor(rng.nextFloat() * 3),
      // an extreme outlier squeezes the rest into one level: the comparison-sort fallback
      (i: number) => (i === 0 ? 1e300 : z.next()),
      // all equal
      () => 7.25,
    ];
    for (const kind of kinds) {
      for (let trial = 0; trial < 8; trial++) {
        const n = 1 + Math.floor(rng.nextFloat() * 400);
        const score = Float64Array.from({ length: n }, (_, i) => kind(i));
        const idx = Int32Array.from({ length: n }, (_, i) => i);
        const expected = [...idx].sort((a, b) => (score[a]! < score[b]! ? -1 : score[a]! > score[b]! ? 1 : a - b));
        sortIndicesByScore(score, idx, 0, n, ws);
        expect([...idx]).toEqual(expected);
      }
    }
    // A segment in the middle of a larger array, and a message when the workspace is too small.
    const score = Float64Array.of(5, 4, 3, 2, 1);
    const idx = Int32Array.of(0, 1, 2, 3, 4);
    sortIndicesByScore(score, idx, 1, 4, ws);
    expect([...idx]).toEqual([0, 3, 2, 1, 4]);
    expect(() => sortIndicesByScore(new Float64Array(500), new Int32Array(500), 0, 500, ws)).toThrow('Cannot sort 500 people with a workspace for 400.');
  });
});

describe('matchOnScore equals a brute-force greedy matcher', () => {
  for (const withStrata of [false, true]) {
    for (const c of combos) {
      it(`${c.method}, ${c.replacement ? 'with' : 'without'} replacement, ${c.order}, 1:${c.k}${withStrata ? ', exact strata' : ''}`, () => {
        for (let seed = 1; seed <= 6; seed++) {
          const p = randomPools(seed * 31 + c.k, 15 + seed, 30 + 5 * seed, 1, withStrata);
          const score = p.coords[0]!;
          const settings: MatchSettings = { caliper: 0.15 + 0.05 * seed, method: c.method, replacement: c.replacement, order: c.order };
          const { ids, count } = strataFor(p);
          const ws = createScoreMatchingWorkspace(p.nP, p.nC, c.k);
          const m = matchOnScore(score, ids, count, settings, Xoshiro128StarStar.forReplication(seed, 7), ws);
          const ref = bruteForce(
            p,
            (a, b) => Math.abs(score[a]! - score[b]!),
            // The one-covariate matcher's caliper predicate: x − c ≤ x_c ≤ x + c.
            (a, b) => score[b]! >= score[a]! - settings.caliper && score[b]! <= score[a]! + settings.caliper,
            settings,
            c.k,
            Xoshiro128StarStar.forReplication(seed, 7),
            score,
            'by-score',
            score,
          );
          expect(m).toBe(ref.matched);
          expect(m).toBeGreaterThan(0);
          for (let j = 0; j < p.nP; j++) {
            expect([...ws.partners.subarray(j * c.k, j * c.k + ws.partnerCount[j]!)]).toEqual(ref.partners[j]);
          }
        }
      });
    }
  }
});

describe('matchOnMahalanobis equals a brute-force greedy matcher', () => {
  for (const dims of [1, 2, 3]) {
    for (const withStrata of [false, true]) {
      for (const c of combos) {
        if (dims === 1 && (c.order === 'highest-first' || c.k === 3)) continue; // keep the grid modest
        it(`${dims} coordinate(s), ${c.method}, ${c.replacement ? 'with' : 'without'} replacement, ${c.order}, 1:${c.k}${withStrata ? ', exact strata' : ''}`, () => {
          for (let seed = 1; seed <= 5; seed++) {
            const p = randomPools(seed * 17 + dims, 14 + seed, 35 + 6 * seed, dims, withStrata);
            const d2 = (a: number, b: number): number => {
              let s = 0;
              for (const col of p.coords) s += (col[a]! - col[b]!) ** 2;
              return s;
            };
            const caliper = 0.3 + 0.15 * seed * dims;
            const settings: MatchSettings = { caliper, method: c.method, replacement: c.replacement, order: c.order };
            const { ids, count } = strataFor(p);
            const orderScore = p.coords[dims - 1]!;
            const ws = createMahalanobisMatchingWorkspace(p.nP, p.nC, c.k);
            const m = matchOnMahalanobis(p.coords, ids, count, orderScore, settings, Xoshiro128StarStar.forReplication(seed, 9), ws);
            const ref = bruteForce(
              p,
              d2,
              (a, b) => d2(a, b) <= caliper * caliper,
              settings,
              c.k,
              Xoshiro128StarStar.forReplication(seed, 9),
              orderScore,
              'by-index',
              null,
            );
            expect(m).toBe(ref.matched);
            expect(m).toBeGreaterThan(0);
            for (let j = 0; j < p.nP; j++) {
              expect([...ws.partners.subarray(j * c.k, j * c.k + ws.partnerCount[j]!)]).toEqual(ref.partners[j]);
            }
          }
        });
      }
    }
  }

  it('searches many rings of fine cells correctly when the caliper is wide beside the cells (nearest)', () => {
    // 2,000 comparison members: the nearest search's cells are about 0.1 wide, the caliper 1.0 spans ten rings.
    for (const dims of [2, 3]) {
      for (const replacement of [false, true]) {
        const p = randomPools(60 + dims, 120, 2000, dims, false);
        const d2 = (a: number, b: number): number => p.coords.reduce((s, col) => s + (col[a]! - col[b]!) ** 2, 0);
        const settings: MatchSettings = { caliper: 1, method: 'nearest', replacement, order: 'random' };
        const ws = createMahalanobisMatchingWorkspace(p.nP, p.nC, 2);
        const m = matchOnMahalanobis(p.coords, null, 1, p.coords[0]!, settings, Xoshiro128StarStar.forReplication(1, 1), ws);
        const ref = bruteForce(p, d2, (a, b) => d2(a, b) <= 1, settings, 2, Xoshiro128StarStar.forReplication(1, 1), p.coords[0]!, 'by-index', null);
        expect(m).toBe(ref.matched);
        for (let j = 0; j < p.nP; j++) expect([...ws.partners.subarray(j * 2, j * 2 + ws.partnerCount[j]!)]).toEqual(ref.partners[j]);
      }
    }
  });

  it('finds partners far from the grid origin and rejects a bad caliper with a clear message', () => {
    // A caliper far smaller than the spread (many cells) and programme members outside the comparison range.
    const p = randomPools(5, 20, 200, 2, false);
    for (const col of p.coords) for (let i = p.nC; i < p.nC + p.nP; i += 3) col[i] = col[i]! * 3;
    const ws = createMahalanobisMatchingWorkspace(p.nP, p.nC, 1);
    const settings: MatchSettings = { caliper: 0.05, method: 'nearest', replacement: false, order: 'random' };
    const m = matchOnMahalanobis(p.coords, null, 1, p.coords[0]!, settings, Xoshiro128StarStar.forReplication(1, 1), ws);
    const d2 = (a: number, b: number) => (p.coords[0]![a]! - p.coords[0]![b]!) ** 2 + (p.coords[1]![a]! - p.coords[1]![b]!) ** 2;
    const ref = bruteForce(p, d2, (a, b) => d2(a, b) <= 0.0025, settings, 1, Xoshiro128StarStar.forReplication(1, 1), p.coords[0]!, 'by-index', null);
    expect(m).toBe(ref.matched);
    expect(() => matchOnMahalanobis(p.coords, null, 1, p.coords[0]!, { ...settings, caliper: 0 }, Xoshiro128StarStar.forReplication(1, 1), ws)).toThrow(
      'The Mahalanobis caliper must be a positive number of distance units; got 0.',
    );
  });
});

describe('matchOnMahalanobis: the k-d tree search', () => {
  const d2Of = (p: Pools) => (a: number, b: number): number => {
    let s = 0;
    for (const col of p.coords) s += (col[a]! - col[b]!) ** 2;
    return s;
  };

  it('equals brute force with 4 and 5 coordinates, many tied distances, and coordinates shifted by 1e6', () => {
    // Coordinates rounded to a grid of 0.25 make many distances equal, so the lower-index tie rule
    // is exercised; the shift checks that only differences matter. Exact equality (definition).
    for (const dims of [4, 5]) {
      for (const c of combos) {
        if (c.order === 'highest-first') continue;
        for (const shift of [0, 1e6]) {
          const p = randomPools(900 + dims, 40, 260, dims, dims === 5);
          for (const col of p.coords) for (let i = 0; i < col.length; i++) col[i] = Math.round(col[i]! * 4) / 4 + shift;
          const d2 = d2Of(p);
          const caliper = 1.1;
          const settings: MatchSettings = { caliper, method: c.method, replacement: c.replacement, order: c.order };
          const { ids, count } = strataFor(p);
          const ws = createMahalanobisMatchingWorkspace(p.nP, p.nC, c.k);
          const m = matchOnMahalanobis(p.coords, ids, count, p.coords[0]!, settings, Xoshiro128StarStar.forReplication(3, 9), ws);
          const ref = bruteForce(p, d2, (a, b) => d2(a, b) <= caliper * caliper, settings, c.k, Xoshiro128StarStar.forReplication(3, 9), p.coords[0]!, 'by-index', null);
          expect(m).toBe(ref.matched);
          for (let j = 0; j < p.nP; j++) expect([...ws.partners.subarray(j * c.k, j * c.k + ws.partnerCount[j]!)]).toEqual(ref.partners[j]);
        }
      }
    }
  });

  it('does work that grows like log n per programme member, not with the pool (nearest, no replacement)', () => {
    // Nodes examined is a deterministic count of the search's work (no timing). Doubling both pools
    // of 3-coordinate data 0.4 SD apart with caliper 0.5: a grid or linear scan would double the
    // work per member (quadratic in all); the tree adds about one level. Bound: per-member work
    // grows by at most 1.35× per doubling (common practice for k-d tree search: Friedman, Bentley
    // & Finkel 1977, O(log n) expected per query).
    const perMember: number[] = [];
    for (const n of [2000, 4000, 8000]) {
      const p = randomPools(77, n, n, 3, false);
      const ws = createMahalanobisMatchingWorkspace(p.nP, p.nC, 1);
      const settings: MatchSettings = { caliper: 0.5, method: 'nearest', replacement: false, order: 'random' };
      matchOnMahalanobis(p.coords, null, 1, p.coords[0]!, settings, Xoshiro128StarStar.forReplication(1, 1), ws);
      perMember.push(ws.nodesVisited / n);
    }
    expect(perMember[1]! / perMember[0]!).toBeLessThan(1.35);
    expect(perMember[2]! / perMember[1]!).toBeLessThan(1.35);
  });

  it('does not search further when the pools are 1e19 whitened units apart (the comparison pretest mean at 1e20)', () => {
    // Every comparison member at 1e19 (the rounding at that size leaves them equal): nobody is within
    // the caliper; each programme member's search should stop after about one root-to-leaf path.
    // Bound: 2 × (log2 nC + 2) nodes per member (from the tree's depth; exact, no timing).
    const nP = 3000;
    const nC = 6000;
    const p = randomPools(11, nP, nC, 3, false);
    for (const col of p.coords) for (let i = 0; i < nC; i++) col[i] = col[i]! + 1e19;
    const ws = createMahalanobisMatchingWorkspace(nP, nC, 2);
    for (const method of ['nearest', 'random-within-caliper'] as const) {
      const settings: MatchSettings = { caliper: 0.5, method, replacement: false, order: 'lowest-first' };
      const m = matchOnMahalanobis(p.coords, null, 1, p.coords[0]!, settings, Xoshiro128StarStar.forReplication(1, 1), ws);
      expect(m).toBe(0);
      expect(ws.nodesVisited / nP).toBeLessThanOrEqual(2 * (Math.log2(nC) + 2));
    }
  });
});

describe('the engine with Mahalanobis matching and a comparison pretest mean of 1e20', () => {
  it('finishes (it once searched grid rings for minutes) and says nobody could be matched', async () => {
    const { demoPlan } = await import('../../src/io/demoPlan');
    const { simulatePlan } = await import('../../src/sim/simulatePlan');
    const plan = demoPlan();
    plan.matching = { ...plan.matching, distance: 'mahalanobis', caliper: 0.5 };
    plan.groups.comparison.pretestMean = 1e20;
    const r = simulatePlan(plan, { replications: 2, seed: 1 });
    // Every programme member is about 1e19 whitened units from every comparison member (definition).
    expect(r.matching.discardedProgrammeShare).toBe(1);
    expect(r.analyses.matchedDifference!.feasible).toBe(false);
  });
});
