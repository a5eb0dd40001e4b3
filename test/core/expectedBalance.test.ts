import { describe, expect, it } from 'vitest';
import { expectedBalance } from '../../src/core/expectedBalance';
import { deriveModelParameters } from '../../src/core/deriveModelParameters';
import { demoPlan } from '../../src/io/demoPlan';

describe('expectedBalance', () => {
  it('demo plan: observed SMD -1 → 0, true SMD -1.155 → -0.289', () => {
    // Computed by hand from classical test theory (Lord & Novick 1968): SD 10, reliability .75 →
    // true SD sqrt(75) = 8.6603; true SMD before = -10 / 8.6603 = -1.1547;
    // after exact matching the true gap is (1 - .75)(-10) = -2.5 (Kelley 1947; Thorndike 1942),
    // SMD -2.5 / 8.6603 = -0.2887. Tolerance 1e-4: hand values are rounded to 4-5 digits.
    const b = expectedBalance(deriveModelParameters(demoPlan()));
    expect(b.observedSMDBefore).toBeCloseTo(-1, 4);
    expect(b.observedSMDAfter).toBe(0);
    expect(b.trueSMDBefore).toBeCloseTo(-1.1547, 4);
    expect(b.trueSMDAfter).toBeCloseTo(-0.2887, 4);
    // "Looks balanced, isn't": beyond the 0.25 SMD threshold (Stuart 2010; common practice).
    expect(Math.abs(b.trueSMDAfter)).toBeGreaterThan(0.25);
  });

  it('no hidden imbalance with a perfectly reliable pretest', () => {
    // Kelley 1947: with reliability 1, E[T | X] = X, so matching on X matches T. Tolerance 1e-12 (exact).
    const p = demoPlan();
    p.pretest = { sem: 0 };
    const b = expectedBalance(deriveModelParameters(p));
    expect(Math.abs(b.trueSMDAfter)).toBeLessThan(1e-12);
    expect(b.trueSMDBefore).toBeCloseTo(b.observedSMDBefore, 12);
  });
});
