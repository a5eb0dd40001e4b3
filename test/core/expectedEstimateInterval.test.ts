import { describe, expect, it } from 'vitest';
import quantile from '@stdlib/stats-base-dists-normal-quantile';
import { expectedEstimateInterval } from '../../src/core/expectedEstimateInterval';

describe('expectedEstimateInterval', () => {
  it('95% range is estimate ± 1.96 SE', () => {
    // Common practice: z(0.975) = 1.959964; checked against the independent @stdlib normal quantile.
    // Tolerance 1e-8: both libraries are accurate to near machine precision.
    const r = expectedEstimateInterval(4, 1);
    const z = quantile(0.975, 0, 1);
    expect(r.z).toBeCloseTo(z, 8);
    expect(r.z).toBeCloseTo(1.959964, 5);
    expect(r.lower).toBeCloseTo(4 - z, 8);
    expect(r.upper).toBeCloseTo(4 + z, 8);
  });

  it('other coverage: 90% uses z = 1.645', () => {
    // Common practice: z(0.95) = 1.644854. Tolerance 1e-6.
    const r = expectedEstimateInterval(0, 2, 0.9);
    expect(r.upper).toBeCloseTo(2 * 1.644854, 5);
  });

  it('rejects a negative SE and a coverage of 1 with readable messages', () => {
    expect(() => expectedEstimateInterval(1, -0.5)).toThrow(/standard error must be 0 or more; got -0.5/);
    expect(() => expectedEstimateInterval(1, 1, 1)).toThrow(/coverage must be between 0 and 1/);
  });
});
