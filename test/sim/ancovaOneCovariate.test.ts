import { describe, expect, it } from 'vitest';
import { ancovaEstimate } from '../../src/sim/ancovaEstimate';
import { ancovaOnCovariates, createGroupMoments, type GroupMoments, type StackedComparison } from '../../src/sim/multivariate/ancovaOnCovariates';
import { MatchingWeights } from '../../src/sim/matchingWeights';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';

// ancovaEstimate works out the one-covariate case in scalars; it must give the general
// several-covariate routine's numbers bit for bit (Object.is), including when it declines.

function reference(m: Float64Array, rho: number, out: Float64Array, stacked: StackedComparison | null): boolean {
  const fill = (G: GroupMoments, at: number): void => {
    G.n = m[at] as number;
    G.means[0] = m[at + 1] as number;
    G.meanY = m[at + 2] as number;
    G.sxx[0] = m[at + 3] as number;
    G.sxy[0] = m[at + 4] as number;
    G.syy = m[at + 5] as number;
  };
  const P = createGroupMoments(1);
  const C = createGroupMoments(1);
  fill(P, 0);
  fill(C, 6);
  return ancovaOnCovariates(P, C, rho === 1 ? null : Float64Array.of(rho), out, stacked);
}

/** Moments of two invented samples (n from 2 to 400), some with degenerate spreads or non-finite entries. */
function randomMoments(rng: Xoshiro128StarStar, shape: number): Float64Array {
  const m = new Float64Array(12);
  for (const at of [0, 6]) {
    const n = shape === 1 ? 2 + Math.floor(rng.nextFloat() * 3) : 3 + Math.floor(rng.nextFloat() * 400);
    const sx = 1 + 20 * rng.nextFloat();
    const sxx = (n - 1) * sx * sx;
    const r = 2 * rng.nextFloat() - 1;
    const sy = 1 + 20 * rng.nextFloat();
    m[at] = n;
    m[at + 1] = 50 + 10 * (rng.nextFloat() - 0.5);
    m[at + 2] = 50 + 10 * (rng.nextFloat() - 0.5);
    m[at + 3] = sxx;
    m[at + 4] = r * Math.sqrt(sxx * (n - 1) * sy * sy);
    m[at + 5] = (n - 1) * sy * sy;
  }
  if (shape === 2) m[3] = 0; // no spread in the programme pretest
  if (shape === 3) { m[3] = 0; m[9] = 0; } // none in either
  if (shape === 4) m[5] = (m[4] as number) ** 2 / (m[3] as number); // a perfect fit in one group
  if (shape === 5) m[4] = -0; // a signed zero cross-product
  if (shape === 6) m[2] = Number.NaN;
  if (shape === 7) m[9] = 1e-300; // almost no spread
  return m;
}

const SENTINEL = -123.25;

function compare(m: Float64Array, rho: number, outLength: number, stacked: StackedComparison | null): void {
  const a = new Float64Array(outLength).fill(SENTINEL);
  const b = new Float64Array(outLength).fill(SENTINEL);
  const okA = ancovaEstimate(m, rho, a, stacked);
  const okB = reference(m, rho, b, stacked);
  expect(okA).toBe(okB);
  for (let t = 0; t < outLength; t++) expect(Object.is(a[t], b[t]), `out[${t}]: ${a[t]} vs ${b[t]}`).toBe(true);
}

describe('ancovaEstimate (one covariate, in scalars)', () => {
  it('gives ancovaOnCovariates’ numbers bit for bit on seeded moments of several shapes, with and without the reliability correction', () => {
    const rng = new Xoshiro128StarStar();
    rng.reseed(16, 1);
    let computed = 0;
    for (let trial = 0; trial < 4000; trial++) {
      const shape = trial % 8;
      const m = randomMoments(rng, shape);
      for (const rho of [1, 0.75, 0.5, 0.999999]) {
        for (const outLength of [3, 5]) compare(m, rho, outLength, null);
      }
      if (ancovaEstimate(m, 1, new Float64Array(3))) computed++;
    }
    // Most draws are ordinary samples, so most estimates are computed (the comparison is not all "declined").
    expect(computed).toBeGreaterThan(2000);
  });

  it('gives the same bits with stacked comparison rows (matched samples with reuse)', () => {
    const rng = new Xoshiro128StarStar();
    rng.reseed(16, 2);
    for (let trial = 0; trial < 500; trial++) {
      const nPool = 5 + Math.floor(rng.nextFloat() * 60);
      const column = new Float64Array(nPool + 3);
      for (let j = 0; j < column.length; j++) column[j] = 50 + 10 * (rng.nextFloat() - 0.5);
      const weights = new MatchingWeights(nPool);
      const rows = 3 + Math.floor(rng.nextFloat() * 80);
      const setSize = 1 + (trial % 3);
      for (let r = 0; r < rows; r++) weights.add(Math.floor(rng.nextFloat() * (trial % 2 ? nPool : 4)), setSize);
      const m = randomMoments(rng, trial % 8);
      m[6] = rows;
      const stacked: StackedComparison = { weights, columns: [column], from: trial % 4, sigma2: 40 * rng.nextFloat() };
      for (const rho of [1, 0.8]) compare(m, rho, 3, stacked);
    }
  });

  it('keeps the hand-worked example: P X̄ 10, Ȳ 12; C X̄ 12, Ȳ 13; Sxx 10 + 10, Sxy 5 + 5 → b = 0.5, estimate 0 (Lord 1960 form; hand-worked)', () => {
    const out = new Float64Array(3);
    expect(ancovaEstimate(Float64Array.of(20, 10, 12, 10, 5, 30, 20, 12, 13, 10, 5, 30), 1, out)).toBe(true);
    expect(out[0]).toBeCloseTo(0, 12);
    // Porter's correction with rho' = 0.5 doubles the slope: −1 − 1·(−2) = 1 (hand-worked).
    expect(ancovaEstimate(Float64Array.of(20, 10, 12, 10, 5, 30, 20, 12, 13, 10, 5, 30), 0.5, out)).toBe(true);
    expect(out[0]).toBeCloseTo(1, 12);
  });
});

describe('MatchingWeights.addUse (the one-pretest engine without replacement)', () => {
  it('records the same use counts and touched list as add, and what the stacked ANCOVA reads gives the same bits', () => {
    const rng = new Xoshiro128StarStar();
    rng.reseed(16, 3);
    for (let trial = 0; trial < 200; trial++) {
      const nPool = 3 + Math.floor(rng.nextFloat() * 50);
      const full = new MatchingWeights(nPool);
      const usesOnly = new MatchingWeights(nPool);
      const rows = 3 + Math.floor(rng.nextFloat() * 60);
      for (let r = 0; r < rows; r++) {
        const j = Math.floor(rng.nextFloat() * nPool);
        full.add(j, 1 + (r % 3));
        usesOnly.addUse(j);
      }
      expect(usesOnly.touchedCount).toBe(full.touchedCount);
      expect(Array.from(usesOnly.touched)).toEqual(Array.from(full.touched));
      expect(Array.from(usesOnly.uses)).toEqual(Array.from(full.uses));
      expect(usesOnly.sumUses2()).toBe(full.sumUses2());
      expect(Array.from(usesOnly.weight).every((w) => w === 0)).toBe(true);
      const column = Float64Array.from({ length: nPool }, () => 40 + 20 * rng.nextFloat());
      const m = randomMoments(rng, 0);
      m[6] = rows;
      const a = new Float64Array(3).fill(SENTINEL);
      const b = new Float64Array(3).fill(SENTINEL);
      expect(ancovaEstimate(m, 1, a, { weights: usesOnly, columns: [column], from: 0, sigma2: 30 })).toBe(
        ancovaEstimate(m, 1, b, { weights: full, columns: [column], from: 0, sigma2: 30 }),
      );
      for (let t = 0; t < 3; t++) expect(Object.is(a[t], b[t])).toBe(true);
      // After reset both are empty again (the engine reuses them every replication).
      usesOnly.reset();
      expect(usesOnly.touchedCount).toBe(0);
      expect(Array.from(usesOnly.uses).every((u) => u === 0)).toBe(true);
    }
  });
});
