import { describe, expect, it } from 'vitest';
import { balanceChartData } from '../../src/charts/balanceChartData';
import { closedFormInput, simulatedInput } from './fixtures';

describe('balanceChartData', () => {
  it('closed form: observed SMD 0 after matching, true SMD (1 - rho) Delta / true SD', () => {
    // Kelley 1947; Thorndike 1942: after exact matching the true-score gap is (1 - rho_C) Delta.
    // Demo: (0.25 × -10) / sqrt(75) = -0.28868; before: -10 / 10 = -1 and -10 / sqrt(75) = -1.1547 (computed).
    // Tolerance 1e-4 (hand values to 4-5 digits).
    const d = balanceChartData(closedFormInput());
    const [obs, tru] = d.rows;
    expect(d.source).toBe('closed-form');
    expect(obs.before).toBeCloseTo(-1, 4);
    expect(obs.after).toBe(0);
    expect(tru.before).toBeCloseTo(-1.1547, 4);
    expect(tru.after).toBeCloseTo(-0.28868, 4);
    // Thresholds 0.1 and 0.25 (Austin 2009; Stuart 2010; common practice).
    expect(d.thresholds).toEqual([0.1, 0.25]);
    expect(d.xMax).toBeGreaterThanOrEqual(Math.abs(tru.before));
  });

  it("with a simulation: uses the engine's matching summary, which agrees with the closed form", () => {
    const input = simulatedInput();
    const d = balanceChartData(input);
    const s = input.simulation.matching;
    expect(d.source).toBe('simulation');
    expect(d.rows[0]).toMatchObject({ before: s.observedSMDBefore, after: s.observedSMDAfter });
    expect(d.rows[1]).toMatchObject({ before: s.trueSMDBefore, after: s.trueSMDAfter });
    // Caliper 0.2 pooled SD removes about 98.7% of the observed bias (Cochran & Rubin 1973; REFERENCES.md),
    // so |observed SMD after| < 0.05 (1.3% of 1.0 plus sampling noise in 300 studies).
    expect(Math.abs(d.rows[0].after)).toBeLessThan(0.05);
    // The hidden true-score SMD stays near the closed form -0.289 (tolerance 0.06: the caliper leaves
    // ~0.013 SD of observed bias, finite pools and discarded members shift it a little).
    expect(d.rows[1].after).toBeLessThan(-0.25 + 0.02);
    expect(Math.abs(d.rows[1].after - -0.28868)).toBeLessThan(0.06);
  });
});
