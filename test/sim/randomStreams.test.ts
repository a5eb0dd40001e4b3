import { describe, expect, it } from 'vitest';
import { Xoshiro128StarStar } from '../../src/sim/xoshiro128StarStar';
import { foldSeed, mix32, splitmix32, streamState } from '../../src/sim/splitmix32';

describe('xoshiro128** (Blackman & Vigna 2018)', () => {
  it('reproduces the reference code from state {1, 2, 3, 4}', () => {
    // 11520, 0, 5927040: worked by hand from the reference code's update rule
    // (xoshiro128starstar.c: result = rotl(s1 * 5, 7) * 9; t = s1 << 9; ...).
    // 70819200 and 2031721883 as the fourth and fifth outputs: from memory.
    // Exact equality: integer arithmetic.
    const g = new Xoshiro128StarStar(new Uint32Array([1, 2, 3, 4]));
    expect([g.nextUint32(), g.nextUint32(), g.nextUint32(), g.nextUint32(), g.nextUint32()]).toEqual([
      11520, 0, 5927040, 70819200, 2031721883,
    ]);
  });

  it('gives uniforms with mean 1/2 and variance 1/12 (200,000 draws)', () => {
    // U(0, 1): mean 1/2, variance 1/12 (common practice). SE of the mean is
    // sqrt(1/12 / n) = 0.00065; tolerance 4 SE = 0.0026. SE of the sample
    // variance is sqrt((1/80 - 1/144) / n) = 0.00017; tolerance 4 SE.
    const g = Xoshiro128StarStar.forReplication(12345, 0);
    const n = 200_000;
    let s = 0;
    let ss = 0;
    let lo = 1;
    let hi = 0;
    for (let i = 0; i < n; i++) {
      const u = g.nextFloat();
      s += u;
      ss += u * u;
      lo = Math.min(lo, u);
      hi = Math.max(hi, u);
    }
    const mean = s / n;
    const variance = ss / n - mean * mean;
    expect(Math.abs(mean - 0.5)).toBeLessThan(4 * Math.sqrt(1 / 12 / n));
    expect(Math.abs(variance - 1 / 12)).toBeLessThan(4 * Math.sqrt((1 / 80 - 1 / 144) / n));
    expect(lo).toBeGreaterThanOrEqual(0);
    expect(hi).toBeLessThan(1);
  });

  it('refuses the all-zero state (a fixed point of the generator)', () => {
    expect(() => new Xoshiro128StarStar(new Uint32Array(4))).toThrow(/must not be all zero/);
  });
});

describe('per-replication streams from (seed, index)', () => {
  it('mix32 is the MurmurHash3 fmix32 finaliser', () => {
    // fmix32(0) = 0 and fmix32 is a bijection (Appleby 2008, MurmurHash3; common practice).
    // Checked against an independent BigInt implementation of the published three steps (exact).
    const ref = (x: number): number => {
      const M = 0xffffffffn;
      let h = BigInt(x >>> 0);
      h ^= h >> 16n;
      h = (h * 0x85ebca6bn) & M;
      h ^= h >> 13n;
      h = (h * 0xc2b2ae35n) & M;
      h ^= h >> 16n;
      return Number(h);
    };
    expect(mix32(0)).toBe(0);
    for (const x of [1, 2, 0x9e3779b9, 0xffffffff, 123456789]) expect(mix32(x)).toBe(ref(x));
  });

  it('splitmix32 advances a Weyl sequence by the golden gamma', () => {
    const s = new Uint32Array([0]);
    expect(splitmix32(s)).toBe(mix32(0x9e3779b9));
    expect(s[0]).toBe(0x9e3779b9);
  });

  it('gives different streams for different indices and seeds, the same for the same pair', () => {
    const key = (seed: number, i: number) => Array.from(streamState(seed, i, new Uint32Array(4))).join(',');
    const seen = new Set<string>();
    for (let seed = 0; seed < 20; seed++) for (let i = 0; i < 200; i++) seen.add(key(seed, i));
    expect(seen.size).toBe(20 * 200);
    expect(key(7, 3)).toBe(key(7, 3));
    // Seeds beyond 32 bits are folded, not truncated.
    expect(foldSeed(2 ** 32 + 5)).not.toBe(foldSeed(5));
    expect(() => foldSeed(1.5)).toThrow(/whole number/);
  });
});
