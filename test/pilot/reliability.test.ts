import stdFQuantile from '@stdlib/stats-base-dists-f-quantile';
import stdNormalQuantile from '@stdlib/stats-base-dists-normal-quantile';
import stdTQuantile from '@stdlib/stats-base-dists-t-quantile';
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { spearmanBrown } from '../../src/core/spearmanBrown';
import { cronbachAlpha } from '../../src/pilot/cronbachAlpha';
import { estimatePilot } from '../../src/pilot/estimatePilot';
import { feldtInterval } from '../../src/pilot/feldtInterval';
import { fisherZInterval } from '../../src/pilot/fisherZInterval';
import { fQuantile } from '../../src/pilot/fQuantile';
import { pilotFixtureMapping, pilotFixtureTable, type PilotFixture } from './pilotFixtures';

describe('fQuantile (jStat) against @stdlib and F tables', () => {
  // Tolerance 1e-6 relative: jStat inverts the incomplete beta iteratively (1e-7 relative seen,
  // 6e-8 at df 1e5/7e5); far below what a two-decimal reliability interval needs.
  it('agrees with @stdlib over a grid of df (1 to 700,000) and p', () => {
    const dfs: Array<[number, number]> = [
      [1, 1], [1, 10], [4, 28], [9, 81], [39, 156], [99, 891], [238, 1666], [1000, 1000], [99_998, 699_986],
    ];
    for (const [d1, d2] of dfs) {
      for (const p of [0.005, 0.025, 0.05, 0.5, 0.95, 0.975, 0.995]) {
        const ref = stdFQuantile(p, d1, d2);
        expect(Math.abs(fQuantile(p, d1, d2) - ref) / ref, `p ${p}, df ${d1}, ${d2}`).toBeLessThan(1e-6);
      }
    }
  });
  it('F(1 − a; 1, ν) = t(1 − a/2; ν)² (common practice), t from @stdlib; tolerance 1e-6 relative', () => {
    for (const nu of [2, 10, 30, 120]) {
      const t = stdTQuantile(0.975, nu);
      expect(Math.abs(fQuantile(0.95, 1, nu) - t * t) / (t * t)).toBeLessThan(1e-6);
    }
  });
  it('F(.95; 4, 30) = 2.69 (published F tables, e.g. Snedecor & Cochran; from memory); tolerance 0.005 (2 decimals)', () => {
    expect(Math.abs(fQuantile(0.95, 4, 30) - 2.69)).toBeLessThan(0.005);
  });
  it('rejects p outside (0, 1) and non-positive df, naming them', () => {
    expect(() => fQuantile(1, 2, 3)).toThrow(/probability must be between 0 and 1/);
    expect(() => fQuantile(0.5, 0, 3)).toThrow(/numerator degrees of freedom must be greater than 0/);
  });
});

describe("cronbachAlpha (Cronbach 1951, eq. 2)", () => {
  it('compound symmetry: alpha = k r / (1 + (k − 1) r) exactly (Cronbach 1951; Spearman–Brown 1910); tolerance 1e-10', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 30 }),
        fc.double({ min: 0, max: 0.99, noNaN: true }),
        fc.double({ min: 0.01, max: 100, noNaN: true }),
        (k, r, variance) => {
          // Build the k × k covariance matrix σ²[(1 − r)I + rJ] and sum it (no shortcut formula).
          let trace = 0;
          let total = 0;
          for (let i = 0; i < k; i++) {
            for (let j = 0; j < k; j++) {
              const c = i === j ? variance : r * variance;
              total += c;
              if (i === j) trace += c;
            }
          }
          const a = cronbachAlpha(k, trace, total);
          expect(Math.abs(a - (k * r) / (1 + (k - 1) * r))).toBeLessThan(1e-10);
          if (r > 0) expect(Math.abs(a - spearmanBrown(r, k))).toBeLessThan(1e-10);
        },
      ),
      { seed: 20260101, numRuns: 300 },
    );
  });
  it('10 items with correlation .4 → .8696 (REFERENCES.md, computed); tolerance 5e-5 (4 decimals)', () => {
    expect(cronbachAlpha(10, 10, 10 + 90 * 0.4)).toBeCloseTo(0.8696, 4);
  });
  it('rejects fewer than 2 items and a zero total variance', () => {
    expect(() => cronbachAlpha(1, 1, 1)).toThrow(/at least 2 items; got 1/);
    expect(() => cronbachAlpha(3, 1, 0)).toThrow(/variance of the item sum must be greater than 0; got 0/);
  });
});

describe('alpha from pilot rows: Hoyt (1941) ANOVA and generated parallel items', () => {
  it("equals Hoyt's 1 − MS_residual / MS_persons from a persons × items ANOVA (Hoyt 1941); tolerance 1e-10", () => {
    const f: PilotFixture = { seed: 11, nProgramme: 37, nComparison: 45, items: 6, interItem: 0.35, gap: -0.8 };
    const table = pilotFixtureTable(f);
    const est = estimatePilot(table, pilotFixtureMapping(f));
    for (const who of ['programme', 'comparison'] as const) {
      const x = table.rows.filter((r) => r[0] === who).map((r) => r.slice(1, 7).map(Number));
      const n = x.length;
      const k = 6;
      const grand = x.flat().reduce((s, v) => s + v, 0) / (n * k);
      const personMeans = x.map((r) => r.reduce((s, v) => s + v, 0) / k);
      const itemMeans = Array.from({ length: k }, (_, j) => x.reduce((s, r) => s + r[j]!, 0) / n);
      const ssPersons = k * personMeans.reduce((s, m) => s + (m - grand) ** 2, 0);
      const ssItems = n * itemMeans.reduce((s, m) => s + (m - grand) ** 2, 0);
      const ssTotal = x.flat().reduce((s, v) => s + (v - grand) ** 2, 0);
      const msPersons = ssPersons / (n - 1);
      const msResidual = (ssTotal - ssPersons - ssItems) / ((n - 1) * (k - 1));
      expect(Math.abs(est.reliability.alphaByGroup![who].value - (1 - msResidual / msPersons))).toBeLessThan(1e-10);
    }
  });

  // Property: k parallel items with within-group correlation r give alpha → Spearman–Brown of r.
  // Tolerance: 4 asymptotic SEs of alpha under compound symmetry, SE² = 2k(1 − α)² / ((k − 1)(n − 2))
  // (van Zyl, Neudecker & Nel 2000, Psychometrika 65, eq. for the equicorrelated case; from memory).
  // A true alpha fails a 4-SE check with probability ≈ 6e-5 per case; runs are seeded (reproducible).
  it('k parallel items with correlation r: alpha is within 4 SEs of k r / (1 + (k − 1) r), large n', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 2, max: 10 }),
        fc.double({ min: 0.1, max: 0.8, noNaN: true }),
        fc.integer({ min: 1, max: 1_000_000 }),
        (k, r, seed) => {
          const f: PilotFixture = { seed, nProgramme: 1500, nComparison: 2500, items: k, interItem: r, gap: -1 };
          const est = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f));
          const target = spearmanBrown(r, k);
          const se = Math.sqrt((2 * k * (1 - target) ** 2) / ((k - 1) * (4000 - 2)));
          expect(Math.abs(est.reliability.alpha!.value - target)).toBeLessThan(4 * se);
        },
      ),
      { seed: 424242, numRuns: 12 },
    );
  });
});

describe('feldtInterval (Feldt 1965; Feldt, Woodruff & Salih 1987)', () => {
  it('matches 1 − (1 − α)F(1 − γ/2) and 1 − (1 − α)F(γ/2) with F quantiles from @stdlib; tolerance 1e-6', () => {
    for (const [a, df, k] of [
      [0.8, 99, 10],
      [0.62, 29, 4],
      [0.91, 211, 8],
      [0.3, 9, 2],
    ] as const) {
      const ci = feldtInterval(a, df, k, 0.95);
      expect(Math.abs(ci.lower - (1 - (1 - a) * stdFQuantile(0.975, df, df * (k - 1))))).toBeLessThan(1e-6);
      expect(Math.abs(ci.upper - (1 - (1 - a) * stdFQuantile(0.025, df, df * (k - 1))))).toBeLessThan(1e-6);
      expect(ci.lower).toBeLessThan(a);
      expect(ci.upper).toBeGreaterThan(a);
      expect(ci.upper).toBeLessThan(1);
      expect(ci.value).toBe(a);
    }
  });
  it('alpha = 1 gives the interval [1, 1]; alpha above 1 and too few people are refused', () => {
    expect(feldtInterval(1, 10, 3)).toMatchObject({ lower: 1, upper: 1 });
    expect(() => feldtInterval(1.01, 10, 3)).toThrow(/cannot exceed 1/);
    expect(() => feldtInterval(0.8, 0, 3)).toThrow(/at least 2 people/);
  });

  // Under normal compound-symmetric items Feldt's distribution is exact (Feldt 1965), so 95%
  // intervals cover the population alpha in 95% of samples. 2,000 seeded samples: Monte Carlo
  // SE √(.95·.05/2000) = .0049; tolerance 3 MC SEs (.0146). These seeds give .958 (programme) and
  // .964 (pooled); a separate run of 10,000 other seeds gave .951 and .954 (MC SE .0022).
  it('covers the population alpha in 95% of samples (per group and pooled within groups), within 3 MC SEs', () => {
    const reps = 2000;
    const k = 5;
    const r = 0.3;
    const target = spearmanBrown(r, k);
    let coveredProgramme = 0;
    let coveredPooled = 0;
    for (let s = 0; s < reps; s++) {
      const f: PilotFixture = { seed: 900_000 + s, nProgramme: 25, nComparison: 35, items: k, interItem: r, gap: -1.5 };
      const est = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f));
      const g = est.reliability.alphaByGroup!.programme;
      if (g.lower <= target && target <= g.upper) coveredProgramme++;
      const p = est.reliability.alpha!;
      if (p.lower <= target && target <= p.upper) coveredPooled++;
    }
    const mcse = Math.sqrt((0.95 * 0.05) / reps);
    expect(Math.abs(coveredProgramme / reps - 0.95)).toBeLessThan(3 * mcse);
    expect(Math.abs(coveredPooled / reps - 0.95)).toBeLessThan(3 * mcse);
  });
});

describe('fisherZInterval (Fisher 1921; partial correlations Fisher 1924)', () => {
  it('is tanh(atanh r ± z(.975)/√(n − 3 − q)) with z from @stdlib; tolerance 1e-8', () => {
    for (const [r, n, q] of [
      [0.5, 103, 0],
      [0.78, 200, 1],
      [-0.2, 30, 1],
    ] as const) {
      const ci = fisherZInterval(r, n, q, 0.95);
      const half = stdNormalQuantile(0.975, 0, 1) / Math.sqrt(n - 3 - q);
      expect(Math.abs(ci.lower - Math.tanh(Math.atanh(r) - half))).toBeLessThan(1e-8);
      expect(Math.abs(ci.upper - Math.tanh(Math.atanh(r) + half))).toBeLessThan(1e-8);
    }
  });
  it('r = .5, n = 103: .339 to .632 (z = .5493 ± .196, computed by hand); tolerance 5e-4', () => {
    const ci = fisherZInterval(0.5, 103);
    expect(ci.lower).toBeCloseTo(0.339, 3);
    expect(ci.upper).toBeCloseTo(0.632, 3);
  });
  it('r = ±1 gives a degenerate interval; too few pairs are refused', () => {
    expect(fisherZInterval(1, 10)).toMatchObject({ lower: 1, upper: 1 });
    expect(() => fisherZInterval(0.5, 4, 1)).toThrow(/at least 5 pairs; got 4/);
  });

  // Pooled within-group test–retest r of two groups: Fisher's z with q = 1 is approximate, close
  // to nominal at these sizes (Fisher 1924). 2,000 seeded samples; tolerance 3 MC SEs (.0146).
  it('test–retest CI covers the population value in about 95% of samples, within 3 MC SEs', () => {
    const reps = 2000;
    const k = 4;
    const r = 0.4;
    const target = spearmanBrown(r, k); // retest = k fresh parallel items: r(sum, sum') = SB(r)
    let covered = 0;
    for (let s = 0; s < reps; s++) {
      const f: PilotFixture = { seed: 700_000 + s, nProgramme: 20, nComparison: 30, items: k, interItem: r, gap: 1, retest: true };
      const t = estimatePilot(pilotFixtureTable(f), pilotFixtureMapping(f)).reliability.testRetest!;
      if (t.lower <= target && target <= t.upper) covered++;
    }
    expect(Math.abs(covered / reps - 0.95)).toBeLessThan(3 * Math.sqrt((0.95 * 0.05) / reps));
  });
});
