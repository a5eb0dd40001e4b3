import { describe, expect, it } from 'vitest';
import normalCdf from '@stdlib/stats-base-dists-normal-cdf';
import normalQuantileRef from '@stdlib/stats-base-dists-normal-quantile';
import { normalQuantile } from '../../src/sim/normalQuantile';
import { normalQuantileFast } from '../../src/sim/normalQuantileTable';

describe('normal quantile Φ⁻¹ by AS 241 (Wichura 1988)', () => {
  it('gives the textbook points: 0.5 → 0, 0.975 → 1.959963984540054, 0.95 → 1.6448536269514722 (common practice)', () => {
    expect(normalQuantile(0.5)).toBe(0);
    expect(normalQuantile(0.975)).toBeCloseTo(1.959963984540054, 14);
    expect(normalQuantile(0.95)).toBeCloseTo(1.6448536269514722, 14);
    expect(normalQuantile(0.025)).toBeCloseTo(-1.959963984540054, 14);
  });

  it('agrees with @stdlib normal quantile within 1e-11 for p from 1e-6 to 1 - 1e-6', () => {
    // Tolerance: AS 241 claims about 16 digits; @stdlib's inverse is accurate to
    // about 1e-12 in this range (both general-purpose; measured gap 1e-12).
    let worst = 0;
    for (let i = 1; i < 20_000; i++) {
      const p = i / 20_000;
      worst = Math.max(worst, Math.abs(normalQuantile(p) - normalQuantileRef(p, 0, 1)));
    }
    for (const p of [1e-6, 1e-5, 1e-4, 1 - 1e-4, 1 - 1e-6]) worst = Math.max(worst, Math.abs(normalQuantile(p) - normalQuantileRef(p, 0, 1)));
    expect(worst).toBeLessThan(1e-11);
  });

  it('inverts @stdlib normal CDF in the far tail: Φ(Φ⁻¹(p)) = p to 1e-12 relative for p = 1e-8 … 1e-200', () => {
    // In the far tail the reference quantile itself loses accuracy, so the
    // check is the round trip through the (erfc-based, accurate) reference CDF.
    for (const k of [8, 10, 12, 15, 20, 50, 100, 200]) {
      const p = 10 ** -k;
      const x = normalQuantile(p);
      expect(Math.abs(normalCdf(x, 0, 1) - p) / p).toBeLessThan(1e-12);
      expect(normalQuantile(1 - p) >= 0).toBe(true);
    }
    expect(normalQuantile(0)).toBe(-Infinity);
    expect(normalQuantile(1)).toBe(Infinity);
  });

  it('the fast table version stays within 1e-9 of AS 241 (centre, tails and far tails) and is monotone', () => {
    // Hermite interpolation error O(h^4); measured 3.3e-10 at worst (near p = 0.063).
    let worst = 0;
    let prev = -Infinity;
    let monotone = true;
    const grid: number[] = [];
    for (let i = 1; i < 1_000_000; i++) grid.push(i / 1_000_000);
    for (let k = 1; k < 700; k++) grid.push(0.075 * 0.97 ** k, 1 - 0.075 * 0.97 ** k);
    grid.push(1e-12, 2 ** -33, 1 - 2 ** -33);
    grid.sort((a, b) => a - b);
    for (const p of grid) {
      const f = normalQuantileFast(p);
      worst = Math.max(worst, Math.abs(f - normalQuantile(p)));
      if (f < prev) monotone = false;
      prev = f;
    }
    expect(worst).toBeLessThan(1e-9);
    expect(monotone).toBe(true);
  });
});
