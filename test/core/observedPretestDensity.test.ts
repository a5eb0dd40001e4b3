import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { observedPretestDensity } from '../../src/core/observedPretestDensity';

describe('observedPretestDensity', () => {
  it('peak of N(44, 10^2) is 1/(10 sqrt(2 pi)) = 0.0398942', () => {
    // Common practice (normal density). Tolerance 1e-7 (value quoted to 7 decimals).
    expect(observedPretestDensity(44, 44, 10)).toBeCloseTo(0.0398942, 7);
  });

  it('agrees with jStat.normal.pdf over a grid', () => {
    // Independent library (jstat 1.9.6). Tolerance 1e-12 relative: same formula, rounding only.
    for (const x of [-30, 0, 12.5, 44, 61, 100]) {
      const ref = jStat.normal.pdf(x, 44, 10) as number;
      expect(Math.abs(observedPretestDensity(x, 44, 10) - ref)).toBeLessThan(1e-12 * Math.max(ref, 1e-300) + 1e-300);
    }
  });

  it('rejects SD 0', () => {
    expect(() => observedPretestDensity(1, 0, 0)).toThrow(/pretest SD must be greater than 0; got 0/);
  });
});
