import { describe, expect, it } from 'vitest';
import quantile from '@stdlib/stats-base-dists-normal-quantile';
import { TWO_GROUP_ANALYSIS_IDS } from '../../src/core/plan';
import { estimatesChartData } from '../../src/charts/estimatesChartData';
import { closedFormInput, simulatedInput, TEST_REPLICATIONS } from './fixtures';

describe('estimatesChartData', () => {
  it('before simulation: intervals are expected estimate +/- 1.96 SE from core', () => {
    // Common practice (normal approximation); z = 1.959964 from the independent @stdlib normal quantile.
    // Tolerance 1e-9: same arithmetic.
    const input = closedFormInput();
    const d = estimatesChartData(input);
    const z = quantile(0.975, 0, 1);
    expect(d.mode).toBe('closed-form');
    for (const r of d.rows) {
      const a = input.analytic.analyses[r.id]!;
      expect(r.expected).toBe(a.expectedEstimate);
      expect(a.se).not.toBeNull();
      expect(r.interval?.lower).toBeCloseTo(a.expectedEstimate - z * a.se!, 9);
      expect(r.interval?.upper).toBeCloseTo(a.expectedEstimate + z * a.se!, 9);
      expect(r.bins).toBeNull();
    }
    // The drawn range shows zero and the hoped-for effect (2.5 in the invented demo plan).
    expect(d.xDomain[0]).toBeLessThan(0);
    expect(d.xDomain[1]).toBeGreaterThan(2.5);
    // Demo plan, ANCOVA: tau + beta (1 - rho) Delta = 2.5 + 0.8 × 0.25 × (-10) = 0.5 (Lord 1960; computed).
    expect(d.rows.find((r) => r.id === 'ancova')!.expected).toBeCloseTo(0.5, 9);
  });

  it('with a simulation: histogram counts sum to the replications and every estimate falls in a bin', () => {
    // Common practice: a histogram partitions the data. Exact integer check.
    const input = simulatedInput();
    const d = estimatesChartData(input);
    expect(d.mode).toBe('simulation');
    for (const id of TWO_GROUP_ANALYSIS_IDS) {
      const r = d.rows.find((row) => row.id === id)!;
      const values = input.simulation.estimates[id]!;
      const total = r.bins!.reduce((s, b) => s + b.count, 0);
      expect(total).toBe(values.filter(Number.isFinite).length);
      expect(total).toBe(TEST_REPLICATIONS);
      const lo = r.bins![0]!.x0;
      const hi = r.bins![r.bins!.length - 1]!.x1;
      for (const v of values) {
        expect(v).toBeGreaterThanOrEqual(lo);
        expect(v).toBeLessThanOrEqual(hi);
      }
      // Shared, contiguous edges across analyses (so the rows compare at a glance).
      for (let i = 1; i < r.bins!.length; i++) expect(r.bins![i]!.x0).toBe(r.bins![i - 1]!.x1);
    }
    const maxInRows = Math.max(...d.rows.flatMap((r) => r.bins!.map((b) => b.count)));
    expect(d.maxCount).toBe(maxInRows);
  });

  it('simulated means of the full-sample analyses agree with the closed form within 4 Monte Carlo SEs', () => {
    // Closed forms: ANCOVA tau + beta (1 - rho) Delta (Lord 1960); gain score tau + (beta - 1) Delta;
    // corrected ANCOVA tau + beta (1 - rho/rho') Delta (Porter 1967). Full samples, no caliper, so the
    // infinite-pool forms apply up to O(1/n) terms. Tolerance 4 MCSE (chance of a false failure ~6e-5 each).
    const d = estimatesChartData(simulatedInput());
    for (const id of ['ancova', 'gainScore', 'correctedAncova'] as const) {
      const r = d.rows.find((row) => row.id === id)!;
      expect(Math.abs(r.simulatedMean! - r.expected)).toBeLessThan(4 * r.simulatedMeanMCSE!);
    }
  });
  it('an analysis the simulation could not summarise has no simulated mean; the others keep theirs', () => {
    // No numbers computed here: the infeasible analysis must not be read as figures (docs/simulation.md).
    const input = simulatedInput();
    const sim = input.simulation;
    const infeasible = { id: 'matchedDifference' as const, sample: 'matched' as const, feasible: false as const, reason: 'nobody matched', replications: 0 };
    const d = estimatesChartData({ ...input, simulation: { ...sim, analyses: { ...sim.analyses, matchedDifference: infeasible }, estimates: { ...sim.estimates, matchedDifference: [] } } });
    const md = d.rows.find((r) => r.id === 'matchedDifference')!;
    expect(md.simulatedMean).toBeNull();
    expect(d.rows.find((r) => r.id === 'ancova')!.simulatedMean).not.toBeNull();
  });
});
